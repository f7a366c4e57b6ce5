/**
 * Verbs that change studies: create (expand and queue every member), cancel (all queued and
 * running members), re-run the failed members. Like the run verbs they take a database handle and
 * a pg-boss instance, so the worker tests and the benchmark can call them outside SvelteKit; every
 * verb filters by `teamId`. All members of a study and their jobs are written in ONE transaction:
 * a study is queued whole or not at all.
 */
import { and, eq, inArray, sql } from 'drizzle-orm';
import { z } from 'zod';
import { cases, measurements, runs, studies, teams } from '../db/schema.js';
import { cancelLocked, insertQueuedRun, withTransaction, type Deps, type Run } from '../runs/commands.js';
import { RUN_CHANNEL } from '../runs/jobs.js';
import { validateCase } from '../../../../solver/case.js';
import { expandStudy, studySpecSchema, type StudySpec } from '../../studies/spec.js';

export type Study = typeof studies.$inferSelect;

export interface StudyIssue {
	path: string;
	message: string;
}

/** A refusal the member can act on, with the fields it concerns. */
export class StudyRequestError extends Error {
	constructor(
		message: string,
		readonly status: 400 | 404 | 409 | 429,
		readonly issues: StudyIssue[] = []
	) {
		super(message);
		this.name = 'StudyRequestError';
	}
}

export const studyInputSchema = z.object({
	caseId: z.uuid({ error: 'caseId must be a case id (a UUID)' }),
	name: z.string({ error: 'name must be text' }).trim().min(1, { error: 'Give the study a name' }).max(120, { error: 'name must be at most 120 characters' }),
	spec: studySpecSchema,
	measurementId: z.union([z.uuid({ error: 'measurementId must be a measurement id (a UUID)' }), z.literal(''), z.null()]).optional()
}, { error: 'The body must be a JSON object with caseId, name and spec' });
export type StudyInput = z.infer<typeof studyInputSchema>;

/** zod issues as `{ path, message }` with dotted paths. */
export function zodIssues(error: z.ZodError): StudyIssue[] {
	return error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(body)', message: i.message }));
}

/**
 * Expand and queue a study of a team's case. Refuses (400, naming the field) an invalid spec or a
 * member case that would not validate, and (400) a study larger than the team's cap.
 */
export async function createStudy(o: Deps & { teamId: string; userId: string | null; input: unknown }): Promise<{ study: Study; members: Run[] }> {
	const parsed = studyInputSchema.safeParse(o.input);
	if (!parsed.success) throw new StudyRequestError('The study settings are not valid', 400, zodIssues(parsed.error));
	const input = parsed.data;
	return withTransaction(o.handle.pool, async (tx) => {
		const [c] = await tx.db
			.select()
			.from(cases)
			.where(and(eq(cases.id, input.caseId), eq(cases.teamId, o.teamId)));
		if (!c) throw new StudyRequestError('Case not found', 404, [{ path: 'caseId', message: 'No case of your team has this id' }]);
		const checked = validateCase(c.document);
		if (!checked.ok) throw new StudyRequestError('The case is not valid; fix it in the editor first', 400, checked.issues.map((i) => ({ path: `case.${i.path}`, message: i.message })));
		const expansion = expandStudy(checked.value, input.spec as StudySpec);
		if (!expansion.ok) throw new StudyRequestError('Some members of this study would not be valid cases', 400, expansion.issues.map((i) => ({ path: `spec.${i.path}`, message: i.message })));
		const [team] = await tx.db.select({ cap: teams.maxStudyRuns }).from(teams).where(eq(teams.id, o.teamId)).for('update');
		if (!team) throw new StudyRequestError('Team not found', 404);
		const count = expansion.members.length;
		if (count > team.cap) {
			throw new StudyRequestError(`This study has ${count} runs; your team's cap is ${team.cap} runs per study (an admin sets it on the Team page)`, 400, [
				{ path: 'spec', message: `${count} runs is more than the cap of ${team.cap}` }
			]);
		}
		let measurementId: string | null = null;
		if (input.measurementId) {
			const [m] = await tx.db
				.select({ id: measurements.id })
				.from(measurements)
				.where(and(eq(measurements.id, input.measurementId), eq(measurements.teamId, o.teamId), eq(measurements.columnId, c.columnId)));
			if (!m) throw new StudyRequestError('The measurement must belong to this column', 400, [{ path: 'measurementId', message: 'No measurement of this column has this id' }]);
			measurementId = m.id;
		}
		const [study] = await tx.db
			.insert(studies)
			.values({
				teamId: o.teamId,
				columnId: c.columnId,
				caseId: c.id,
				name: input.name,
				kind: input.spec.kind,
				spec: input.spec as Record<string, unknown>,
				baseCase: checked.value,
				memberCount: count,
				measurementId,
				createdBy: o.userId
			})
			.returning();
		const members: Run[] = [];
		for (const m of expansion.members) {
			members.push(
				await insertQueuedRun(tx, o, {
					teamId: o.teamId,
					columnId: c.columnId,
					caseId: c.id,
					caseDoc: m.caseDoc,
					userId: o.userId,
					study: { id: study.id, index: m.index, point: { label: m.label, values: m.values } }
				})
			);
		}
		await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, study.id]);
		return { study, members };
	});
}

async function lockStudy(tx: Parameters<Parameters<typeof withTransaction>[1]>[0], teamId: string, studyId: string): Promise<Study> {
	const [study] = await tx.db
		.select()
		.from(studies)
		.where(and(eq(studies.id, studyId), eq(studies.teamId, teamId)))
		.for('update');
	if (!study) throw new StudyRequestError('Study not found', 404);
	return study;
}

/** Cancel a whole study: queued members end at once, running ones stop within about a second. */
export async function cancelStudy(o: Deps & { teamId: string; studyId: string }): Promise<{ cancelled: number; stopping: number }> {
	return withTransaction(o.handle.pool, async (tx) => {
		await lockStudy(tx, o.teamId, o.studyId);
		const active = await tx.db
			.select()
			.from(runs)
			.where(and(eq(runs.studyId, o.studyId), eq(runs.teamId, o.teamId), inArray(runs.status, ['queued', 'running'])))
			.orderBy(runs.studyIndex)
			.for('update');
		let cancelled = 0;
		let stopping = 0;
		for (const run of active) {
			const r = await cancelLocked(tx, o, run, 'Cancelled with its study');
			if (r.status === 'cancelled') cancelled++;
			else stopping++;
		}
		await tx.db.update(studies).set({ cancelledAt: sql`now()` }).where(eq(studies.id, o.studyId));
		await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, o.studyId]);
		return { cancelled, stopping };
	});
}

/** Queue a new run for every member whose newest run failed or was cancelled. */
export async function rerunFailedMembers(o: Deps & { teamId: string; studyId: string; userId: string | null }): Promise<Run[]> {
	return withTransaction(o.handle.pool, async (tx) => {
		const study = await lockStudy(tx, o.teamId, o.studyId);
		const latest = await tx.db.execute(sql`
			select distinct on (study_index) id, status from runs
			where study_id = ${o.studyId} and team_id = ${o.teamId}
			order by study_index, queued_at desc`);
		const failedIds = (latest.rows as Array<{ id: string; status: string }>).filter((r) => r.status === 'failed' || r.status === 'cancelled').map((r) => r.id);
		if (!failedIds.length) throw new StudyRequestError('No member of this study failed or was cancelled', 409);
		const old = await tx.db.select().from(runs).where(inArray(runs.id, failedIds)).orderBy(runs.studyIndex);
		const out: Run[] = [];
		for (const r of old) {
			const checked = validateCase(r.caseDocument);
			if (!checked.ok) throw new StudyRequestError(`Member ${r.studyIndex} no longer validates`, 400);
			out.push(
				await insertQueuedRun(tx, o, {
					teamId: o.teamId,
					columnId: study.columnId,
					caseId: study.caseId,
					caseDoc: checked.value,
					userId: o.userId,
					study: { id: study.id, index: r.studyIndex!, point: r.studyPoint! }
				})
			);
		}
		await tx.db.update(studies).set({ cancelledAt: null }).where(eq(studies.id, o.studyId));
		await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, o.studyId]);
		return out;
	});
}
