/**
 * Read side of runs: one run, a column's runs, the residual history and the snapshots.
 * Every query filters by the caller's team; "not found" is `null`.
 */
import { and, asc, desc, eq, getTableColumns, gt, sql } from 'drizzle-orm';
import type { Db } from '../db/index.js';
import { residuals, runs, snapshots } from '../db/schema.js';
import { decodeSnapshot } from './codec.js';
import type { Snapshot } from '../../../../solver/types.js';

export type Run = typeof runs.$inferSelect;

export interface ResidualPoint {
	step: number;
	timeS: number;
	values: Record<string, number>;
}

export interface SnapshotInfo {
	id: number;
	step: number;
	timeS: number;
	isFinal: boolean;
	bytes: number;
}

export async function getRun(o: { db: Db; teamId: string; runId: string }): Promise<Run | null> {
	if (!isUuid(o.runId)) return null;
	const [run] = await o.db
		.select()
		.from(runs)
		.where(and(eq(runs.id, o.runId), eq(runs.teamId, o.teamId)));
	return run ?? null;
}

export type RunListItem = Omit<Run, 'caseDocument'>;

/** A column's runs, newest first, without the (large) frozen case documents. */
export async function listRunsForColumn(o: { db: Db; teamId: string; columnId: string; limit?: number }): Promise<RunListItem[]> {
	const { caseDocument: _frozenCase, ...columns } = getTableColumns(runs);
	return o.db
		.select(columns)
		.from(runs)
		.where(and(eq(runs.teamId, o.teamId), eq(runs.columnId, o.columnId)))
		.orderBy(desc(runs.queuedAt))
		.limit(o.limit ?? 200);
}

/** Residual points after `afterStep`, oldest first (the run must already be team-checked). */
export async function listResiduals(o: { db: Db; runId: string; afterStep?: number; limit?: number }): Promise<ResidualPoint[]> {
	const rows = await o.db
		.select({ step: residuals.step, timeS: residuals.simulatedTimeS, values: residuals.values })
		.from(residuals)
		.where(and(eq(residuals.runId, o.runId), gt(residuals.step, o.afterStep ?? 0)))
		.orderBy(asc(residuals.step))
		.limit(o.limit ?? 100_000);
	return rows;
}

export async function listSnapshots(o: { db: Db; runId: string }): Promise<SnapshotInfo[]> {
	return o.db
		.select({
			id: snapshots.id,
			step: snapshots.step,
			timeS: snapshots.simulatedTimeS,
			isFinal: snapshots.isFinal,
			bytes: sql<number>`octet_length(${snapshots.data})::int`
		})
		.from(snapshots)
		.where(eq(snapshots.runId, o.runId))
		.orderBy(asc(snapshots.step));
}

/** One snapshot of a team's run, decoded; `null` when the run or the snapshot is not theirs. */
export async function getSnapshot(o: { db: Db; teamId: string; runId: string; snapshotId: number }): Promise<(Snapshot & { id: number; isFinal: boolean }) | null> {
	if (!isUuid(o.runId) || !Number.isSafeInteger(o.snapshotId)) return null;
	const [row] = await o.db
		.select({ id: snapshots.id, isFinal: snapshots.isFinal, data: snapshots.data })
		.from(snapshots)
		.innerJoin(runs, eq(runs.id, snapshots.runId))
		.where(and(eq(snapshots.id, o.snapshotId), eq(snapshots.runId, o.runId), eq(runs.teamId, o.teamId)));
	if (!row) return null;
	return { ...decodeSnapshot(row.data), id: row.id, isFinal: row.isFinal };
}

/** The raw stored bytes of a snapshot (for clients that decode msgpack themselves). */
export async function getSnapshotBytes(o: { db: Db; teamId: string; runId: string; snapshotId: number }): Promise<Buffer | null> {
	if (!isUuid(o.runId) || !Number.isSafeInteger(o.snapshotId)) return null;
	const [row] = await o.db
		.select({ data: snapshots.data })
		.from(snapshots)
		.innerJoin(runs, eq(runs.id, snapshots.runId))
		.where(and(eq(snapshots.id, o.snapshotId), eq(snapshots.runId, o.runId), eq(runs.teamId, o.teamId)));
	return row?.data ?? null;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
/** A malformed id would make PostgreSQL raise instead of matching nothing: treat it as not found. */
export function isUuid(value: string): boolean {
	return UUID.test(value);
}
