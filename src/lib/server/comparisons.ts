/**
 * Comparisons: a saved set of 2–6 finished runs of one column, one of them the baseline.
 * Every query filters by the caller's team; "not found" is `null`.
 */
import { and, desc, eq, inArray } from 'drizzle-orm';
import { z } from 'zod';
import { db } from './db/app.js';
import { isUuid } from './guard.js';
import { comparisons, measurements, runs, snapshots, users } from './db/schema.js';
import { decodeSnapshot } from './runs/codec.js';
import { latestVerdicts } from './cases.js';

export type Comparison = typeof comparisons.$inferSelect;

export const MIN_RUNS = 2;
export const MAX_RUNS = 6;
/** Runs with results: a comparison of a failed or cancelled run would compare nothing. */
export const COMPARABLE_STATUSES = ['converged', 'finished'] as const;

export const comparisonForm = z
	.object({
		name: z.string().trim().min(1, { error: 'Give the comparison a name' }).max(120, { error: 'Keep the name under 120 characters' }),
		runIds: z
			.array(z.uuid())
			.min(MIN_RUNS, { error: `Pick at least ${MIN_RUNS} runs` })
			.max(MAX_RUNS, { error: `Pick at most ${MAX_RUNS} runs` }),
		baselineRunId: z.uuid({ error: 'Pick a baseline run' }),
		/** optional measurement of the same column drawn over the profiles */
		measurementId: z.union([z.uuid(), z.literal('')]).default('')
	})
	.refine((f) => f.runIds.includes(f.baselineRunId), { error: 'The baseline must be one of the picked runs', path: ['baselineRunId'] });
export type ComparisonInput = z.infer<typeof comparisonForm>;

export class ComparisonError extends Error {}

export async function createComparison(options: { teamId: string; columnId: string; userId: string; input: ComparisonInput }): Promise<Comparison> {
	const ids = [...new Set(options.input.runIds)];
	const rows = await db
		.select({ id: runs.id, status: runs.status })
		.from(runs)
		.where(and(eq(runs.teamId, options.teamId), eq(runs.columnId, options.columnId), inArray(runs.id, ids)));
	if (rows.length !== ids.length) throw new ComparisonError('Every run must belong to this column');
	const unfinished = rows.filter((r) => !(COMPARABLE_STATUSES as readonly string[]).includes(r.status));
	if (unfinished.length) throw new ComparisonError('Only converged or finished runs can be compared');
	if (options.input.measurementId) {
		const [m] = await db
			.select({ id: measurements.id })
			.from(measurements)
			.where(and(eq(measurements.id, options.input.measurementId), eq(measurements.teamId, options.teamId), eq(measurements.columnId, options.columnId)));
		if (!m) throw new ComparisonError('The measurement must belong to this column');
	}
	const [row] = await db
		.insert(comparisons)
		.values({
			teamId: options.teamId,
			columnId: options.columnId,
			name: options.input.name,
			runIds: ids,
			baselineRunId: options.input.baselineRunId,
			measurementId: options.input.measurementId || null,
			createdBy: options.userId
		})
		.returning();
	return row;
}

export async function getComparison(options: { teamId: string; id: string }): Promise<Comparison | null> {
	// a malformed id would make PostgreSQL raise instead of matching nothing
	if (!isUuid(options.id)) return null;
	const [row] = await db
		.select()
		.from(comparisons)
		.where(and(eq(comparisons.id, options.id), eq(comparisons.teamId, options.teamId)))
		.limit(1);
	return row ?? null;
}

export interface ComparisonListItem {
	id: string;
	name: string;
	columnId: string;
	runCount: number;
	createdAt: Date;
	verdict: string | null;
}

/** A team's comparisons (optionally of one column), newest first, with their current verdict. */
export async function listComparisons(options: { teamId: string; columnId?: string }): Promise<ComparisonListItem[]> {
	const where = options.columnId
		? and(eq(comparisons.teamId, options.teamId), eq(comparisons.columnId, options.columnId))
		: eq(comparisons.teamId, options.teamId);
	const rows = await db.select().from(comparisons).where(where).orderBy(desc(comparisons.createdAt));
	const verdicts = await latestVerdicts({ teamId: options.teamId, subjectType: 'comparison', subjectIds: rows.map((r) => r.id) });
	return rows.map((r) => ({ id: r.id, name: r.name, columnId: r.columnId, runCount: r.runIds.length, createdAt: r.createdAt, verdict: verdicts.get(r.id) ?? null }));
}

export interface ComparedRun {
	id: string;
	caseId: string | null;
	caseName: string;
	status: string;
	queuedAt: Date;
	queuedBy: string | null;
	queuedByEmail: string | null;
	caseDocument: (typeof runs.$inferSelect)['caseDocument'];
	design: Record<string, { value: number; unit: string; label: string }>;
	profile: { x: number[]; fields: Record<string, number[]> } | null;
}

/** The compared runs in the saved order, each with its design numbers and final profiles. */
export async function loadComparedRuns(options: { teamId: string; runIds: string[] }): Promise<ComparedRun[]> {
	if (options.runIds.length === 0) return [];
	const rows = await db
		.select({ run: runs, email: users.email })
		.from(runs)
		.leftJoin(users, eq(users.id, runs.queuedBy))
		.where(and(eq(runs.teamId, options.teamId), inArray(runs.id, options.runIds)));
	const finals = await db
		.select({ runId: snapshots.runId, data: snapshots.data, step: snapshots.step })
		.from(snapshots)
		.where(and(inArray(snapshots.runId, options.runIds), eq(snapshots.isFinal, true)));
	const out: ComparedRun[] = [];
	for (const id of options.runIds) {
		const r = rows.find((x) => x.run.id === id);
		if (!r) continue;
		const fin = finals.filter((f) => f.runId === id).sort((a, b) => b.step - a.step)[0];
		let profile: ComparedRun['profile'] = null;
		if (fin) {
			const snap = decodeSnapshot(fin.data);
			const fields: Record<string, number[]> = {};
			for (const [k, v] of Object.entries(snap.fields)) fields[k] = Array.from(v);
			profile = { x: Array.from(snap.x), fields };
		}
		const summary = (r.run.summary ?? {}) as { design?: ComparedRun['design'] };
		out.push({
			id,
			caseId: r.run.caseId,
			caseName: r.run.caseDocument.name,
			status: r.run.status,
			queuedAt: r.run.queuedAt,
			queuedBy: r.run.queuedBy,
			queuedByEmail: r.email,
			caseDocument: r.run.caseDocument,
			design: summary.design ?? {},
			profile
		});
	}
	return out;
}

/** Runs of a column that can enter a comparison, newest first. */
export async function listComparableRuns(options: { teamId: string; columnId: string }) {
	return db
		.select({ id: runs.id, caseId: runs.caseId, status: runs.status, queuedAt: runs.queuedAt, caseDocument: runs.caseDocument })
		.from(runs)
		.where(and(eq(runs.teamId, options.teamId), eq(runs.columnId, options.columnId), inArray(runs.status, [...COMPARABLE_STATUSES])))
		.orderBy(desc(runs.queuedAt))
		.limit(100);
}

/** Measurements of a column a comparison may overlay (profiles only; time series do not overlay). */
export async function listOverlayMeasurements(options: { teamId: string; columnId: string }) {
	return db
		.select({ id: measurements.id, name: measurements.name, kind: measurements.kind })
		.from(measurements)
		.where(and(eq(measurements.teamId, options.teamId), eq(measurements.columnId, options.columnId), inArray(measurements.kind, ['holdup-height', 'holdup-radial'])))
		.orderBy(desc(measurements.createdAt));
}
