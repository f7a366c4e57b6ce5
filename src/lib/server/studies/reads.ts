/**
 * Read side of studies: one study, a team's studies with their progress, the members (the newest
 * run of each position) with their design numbers, and the members' final profiles.
 * Every query filters by the caller's team; "not found" is `null`.
 */
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../db/index.js';
import { columns, snapshots, studies, users } from '../db/schema.js';
import { decodeSnapshot } from '../runs/codec.js';
import { isUuid } from '../runs/history.js';
import type { MemberResult, DesignValue } from '../../studies/results.js';
import type { StudyPoint } from '../../studies/types.js';
import type { Snapshot } from '../../../../solver/types.js';
import type { Study } from './commands.js';

export async function getStudy(o: { db: Db; teamId: string; studyId: string }): Promise<Study | null> {
	if (!isUuid(o.studyId)) return null;
	const [row] = await o.db
		.select()
		.from(studies)
		.where(and(eq(studies.id, o.studyId), eq(studies.teamId, o.teamId)));
	return row ?? null;
}

export interface StudyMember extends MemberResult {
	/** simulated time / end time of a running member, 0–1 */
	fraction: number;
	steps: number;
	workerId: string | null;
	solverVersion: string;
	attempts: number;
}

interface MemberRow extends Record<string, unknown> {
	id: string;
	study_index: number;
	study_point: StudyPoint;
	status: string;
	steps: number;
	simulated_time_s: number;
	end_time_s: number | null;
	wall_time_s: number;
	queued_at: Date;
	started_at: Date | null;
	finished_at: Date | null;
	error_message: string | null;
	worker_id: string | null;
	solver_version: string;
	attempts: number;
	design: Record<string, DesignValue> | null;
}

/** The newest run at each position of the study, in position order. */
export async function listMembers(o: { db: Db; teamId: string; studyId: string }): Promise<StudyMember[]> {
	const result = await o.db.execute<MemberRow>(sql`
		select distinct on (study_index)
			id, study_index, study_point, status, steps, simulated_time_s, wall_time_s, queued_at, started_at, finished_at,
			error_message, worker_id, solver_version, attempts,
			(case_document->'numerics'->>'endTimeS')::float8 as end_time_s,
			summary->'design' as design
		from runs
		where study_id = ${o.studyId} and team_id = ${o.teamId}
		order by study_index, queued_at desc`);
	return result.rows.map((r) => ({
		id: r.id,
		index: r.study_index,
		point: r.study_point,
		status: r.status,
		steps: r.steps,
		wallTimeS: r.wall_time_s,
		queuedAt: r.queued_at,
		startedAt: r.started_at,
		finishedAt: r.finished_at,
		errorMessage: r.error_message,
		workerId: r.worker_id,
		solverVersion: r.solver_version,
		attempts: r.attempts,
		fraction: ['converged', 'finished'].includes(r.status) ? 1 : r.end_time_s ? Math.min(1, r.simulated_time_s / r.end_time_s) : 0,
		design: r.design
	}));
}

export interface StudyListItem {
	id: string;
	name: string;
	kind: Study['kind'];
	columnId: string;
	columnTag: string;
	memberCount: number;
	createdAt: Date;
	createdBy: string | null;
	cancelledAt: Date | null;
	counts: { done: number; running: number; queued: number; failed: number; cancelled: number };
}

/** A team's studies (of one column, or all), newest first, with member counts by status. */
export async function listStudies(o: { db: Db; teamId: string; columnId?: string; caseId?: string; limit?: number }): Promise<StudyListItem[]> {
	const rows = await o.db
		.select({
			id: studies.id,
			name: studies.name,
			kind: studies.kind,
			columnId: studies.columnId,
			columnTag: columns.tag,
			memberCount: studies.memberCount,
			createdAt: studies.createdAt,
			createdBy: users.name,
			cancelledAt: studies.cancelledAt
		})
		.from(studies)
		.innerJoin(columns, eq(columns.id, studies.columnId))
		.leftJoin(users, eq(users.id, studies.createdBy))
		.where(and(eq(studies.teamId, o.teamId), o.columnId ? eq(studies.columnId, o.columnId) : undefined, o.caseId ? eq(studies.caseId, o.caseId) : undefined))
		.orderBy(desc(studies.createdAt))
		.limit(o.limit ?? 100);
	if (!rows.length) return [];
	const counts = await o.db.execute<{ study_id: string; status: string; n: number }>(sql`
		select study_id, status, count(*)::int as n from (
			select distinct on (study_id, study_index) study_id, status from runs
			where team_id = ${o.teamId} and study_id in ${rows.map((r) => r.id)}
			order by study_id, study_index, queued_at desc
		) latest group by study_id, status`);
	return rows.map((r) => {
		const c = { done: 0, running: 0, queued: 0, failed: 0, cancelled: 0 };
		for (const x of counts.rows.filter((x) => x.study_id === r.id)) {
			if (x.status === 'converged' || x.status === 'finished') c.done += x.n;
			else if (x.status in c) c[x.status as keyof typeof c] += x.n;
		}
		return { ...r, counts: c };
	});
}

/** The final profiles of the given (finished) runs, decoded; runs without one are left out. */
export async function finalProfiles(o: { db: Db; runIds: string[] }): Promise<Map<string, Snapshot>> {
	const out = new Map<string, Snapshot>();
	if (!o.runIds.length) return out;
	const rows = await o.db
		.select({ runId: snapshots.runId, data: snapshots.data })
		.from(snapshots)
		.where(and(inArray(snapshots.runId, o.runIds), eq(snapshots.isFinal, true)));
	for (const r of rows) out.set(r.runId, decodeSnapshot(new Uint8Array(r.data)));
	return out;
}
