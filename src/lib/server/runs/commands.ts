/**
 * Verbs that change runs: queue, cancel, re-run. Callers (form actions, endpoints) have already
 * checked the member's role; every verb still filters by `teamId`, so a row of another team is
 * "not found" (`null`), never touched.
 *
 * Transaction consistency: the run row and its pg-boss job are written on ONE PostgreSQL
 * transaction — pg-boss `send` runs its insert through our transaction's client (its `db` option).
 * There is no outbox; a rollback removes both.
 */
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import { and, eq, inArray, isNull, sql } from 'drizzle-orm';
import type pg from 'pg';
import type PgBoss from 'pg-boss';
import * as schema from '../db/schema.js';
import type { DbHandle } from '../db/index.js';
import { validateCase, type CaseDocument } from '../../../../solver/case.js';
import { SOLVER_VERSION } from '../../../../solver/index.js';
import { cancelSolveJob, sendSolveJob, RUN_CHANNEL } from './jobs.js';
import type { StudyPoint } from '../../studies/types.js';

const { cases, runs, teams } = schema;
export type Run = typeof runs.$inferSelect;

export const ACTIVE_STATUSES = ['queued', 'running'] as const;
export const TERMINAL_STATUSES = ['converged', 'finished', 'failed', 'cancelled'] as const;

/** A refusal the member can act on (shown as the form's message); anything else is a fault. */
export class RunRequestError extends Error {
	constructor(
		message: string,
		readonly status: 400 | 404 | 409 | 429
	) {
		super(message);
		this.name = 'RunRequestError';
	}
}

export type TxDb = NodePgDatabase<typeof schema>;

/** Run `fn` in a transaction on one pooled client, with a Drizzle view of that same client. */
export async function withTransaction<T>(pool: pg.Pool, fn: (tx: { client: pg.PoolClient; db: TxDb }) => Promise<T>): Promise<T> {
	const client = await pool.connect();
	try {
		await client.query('BEGIN');
		const result = await fn({ client, db: drizzle(client, { schema }) });
		await client.query('COMMIT');
		return result;
	} catch (e) {
		await client.query('ROLLBACK').catch(() => {});
		throw e;
	} finally {
		client.release();
	}
}

export interface Deps {
	handle: DbHandle;
	boss: PgBoss;
}

/**
 * Insert a run with its frozen case copy and send its job, within the team's limit of runs
 * queued or running at once (`teams.max_active_runs`). The team row is locked for the count, so
 * two simultaneous requests cannot both take the last place. Study members do not count against
 * that limit (a study has its own cap, `teams.max_study_runs`, checked by the study verbs) and queue
 * behind single runs (`runPriority`).
 */
export async function insertQueuedRun(
	tx: { client: pg.PoolClient; db: TxDb },
	deps: Deps,
	o: {
		teamId: string;
		columnId: string;
		caseId: string | null;
		caseDoc: CaseDocument;
		userId: string | null;
		study?: { id: string; index: number; point: StudyPoint };
	}
): Promise<Run> {
	if (!o.study) {
		const [team] = await tx.db.select({ maxActiveRuns: teams.maxActiveRuns }).from(teams).where(eq(teams.id, o.teamId)).for('update');
		if (!team) throw new RunRequestError('Team not found', 404);
		const [{ active }] = await tx.db
			.select({ active: sql<number>`count(*)::int` })
			.from(runs)
			.where(and(eq(runs.teamId, o.teamId), inArray(runs.status, [...ACTIVE_STATUSES]), isNull(runs.studyId)));
		if (active >= team.maxActiveRuns) {
			throw new RunRequestError(
				`Your team already has ${active} ${active === 1 ? 'run' : 'runs'} queued or running, the most it may have at once (${team.maxActiveRuns}). ` +
					'Wait for one to end or cancel one, then queue again.',
				429
			);
		}
	}
	const [run] = await tx.db
		.insert(runs)
		.values({
			teamId: o.teamId,
			columnId: o.columnId,
			caseId: o.caseId,
			caseDocument: o.caseDoc,
			solverVersion: SOLVER_VERSION,
			status: 'queued',
			queuedBy: o.userId,
			studyId: o.study?.id ?? null,
			studyIndex: o.study?.index ?? null,
			studyPoint: o.study?.point ?? null
		})
		.returning();
	const jobId = await sendSolveJob({ boss: deps.boss, client: tx.client, runId: run.id, caseDoc: o.caseDoc, studyIndex: o.study?.index });
	const [withJob] = await tx.db.update(runs).set({ jobId }).where(eq(runs.id, run.id)).returning();
	await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, run.id]);
	return withJob;
}

/** Queue a run of a stored case: the case document is validated and frozen into the run. */
export async function queue(o: Deps & { teamId: string; caseId: string; userId: string | null }): Promise<Run> {
	return withTransaction(o.handle.pool, async (tx) => {
		const [c] = await tx.db
			.select()
			.from(cases)
			.where(and(eq(cases.id, o.caseId), eq(cases.teamId, o.teamId)));
		if (!c) throw new RunRequestError('Case not found', 404);
		const checked = validateCase(c.document);
		if (!checked.ok) {
			throw new RunRequestError(`The case is not valid: ${checked.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`, 400);
		}
		return insertQueuedRun(tx, o, { teamId: o.teamId, columnId: c.columnId, caseId: c.id, caseDoc: checked.value, userId: o.userId });
	});
}

/** Queue a new run of the same frozen case as an earlier run (with today's solver). */
export async function rerun(o: Deps & { teamId: string; runId: string; userId: string | null }): Promise<Run> {
	return withTransaction(o.handle.pool, async (tx) => {
		const [old] = await tx.db
			.select()
			.from(runs)
			.where(and(eq(runs.id, o.runId), eq(runs.teamId, o.teamId)));
		if (!old) throw new RunRequestError('Run not found', 404);
		const checked = validateCase(old.caseDocument);
		if (!checked.ok) throw new RunRequestError(`The frozen case no longer validates: ${checked.issues.map((i) => i.message).join('; ')}`, 400);
		// a re-run of a study member takes its place in the study (the study shows the newest run of each position)
		const study = old.studyId != null && old.studyIndex != null && old.studyPoint ? { id: old.studyId, index: old.studyIndex, point: old.studyPoint } : undefined;
		return insertQueuedRun(tx, o, { teamId: o.teamId, columnId: old.columnId, caseId: old.caseId, caseDoc: checked.value, userId: o.userId, study });
	});
}

/**
 * Cancel a run. A queued run is cancelled at once (its job too). A running run gets
 * `cancel_requested`; its worker sees the flag with its next progress write (every ~100 ms),
 * stops between two steps and records `cancelled`. An ended run is left as it is.
 */
export async function cancel(o: Deps & { teamId: string; runId: string }): Promise<Run> {
	return withTransaction(o.handle.pool, async (tx) => {
		const [run] = await tx.db
			.select()
			.from(runs)
			.where(and(eq(runs.id, o.runId), eq(runs.teamId, o.teamId)))
			.for('update');
		if (!run) throw new RunRequestError('Run not found', 404);
		return cancelLocked(tx, o, run);
	});
}

/** Cancel one run whose row the caller's transaction has locked (`for update`). */
export async function cancelLocked(tx: { client: pg.PoolClient; db: TxDb }, deps: Deps, run: Run, reason = 'Cancelled before it started'): Promise<Run> {
	if (run.status === 'queued') {
		if (run.jobId) await cancelSolveJob({ boss: deps.boss, client: tx.client, jobId: run.jobId, solverVersion: run.solverVersion });
		const [updated] = await tx.db
			.update(runs)
			.set({ status: 'cancelled', cancelRequested: true, finishedAt: new Date(), errorMessage: reason })
			.where(eq(runs.id, run.id))
			.returning();
		await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, run.id]);
		return updated;
	}
	if (run.status === 'running') {
		const [updated] = await tx.db.update(runs).set({ cancelRequested: true }).where(eq(runs.id, run.id)).returning();
		return updated;
	}
	return run;
}
