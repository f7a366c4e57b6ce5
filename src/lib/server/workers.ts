/**
 * What the admin's Workers page shows: the worker processes registered in `workers` (each keeps
 * its row fresh, see worker/registry.ts) and the depth of the run queue. Workers serve every team
 * of the database, so the list is not filtered by team; of other teams' runs only counts appear.
 *
 * All ages are computed by PostgreSQL (`now() - heartbeat_at`), the same clock the workers write
 * with, so a skewed clock on the app's or a worker's machine does not make a worker look lost.
 */
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { db } from './db/app.js';
import { runs, workers } from './db/schema.js';
import { SOLVER_VERSION } from '../../../solver/version.js';

/** A worker silent for longer than this (and not stopped) counts as lost. */
export const WORKER_LOST_AFTER_S = 15;

/** The lost threshold; tests (`TWOFOLD_TEST=1`) may shorten it with `TWOFOLD_WORKER_LOST_AFTER_S`. */
export function workerLostAfterS(): number {
	const raw = process.env.TWOFOLD_TEST === '1' ? Number(process.env.TWOFOLD_WORKER_LOST_AFTER_S) : NaN;
	return Number.isFinite(raw) && raw > 0 ? raw : WORKER_LOST_AFTER_S;
}

export type WorkerState = 'live' | 'lost' | 'stopped';

export interface WorkerRow {
	id: string;
	host: string;
	pid: number;
	slots: number;
	solverVersion: string;
	startedAt: string;
	heartbeatAt: string;
	/** seconds since the last heartbeat */
	heartbeatAgeS: number;
	stoppedAt: string | null;
	activeRuns: number;
	runsDone: number;
	state: WorkerState;
}

export interface VersionQueue {
	solverVersion: string;
	/** queued runs of every team frozen with this version */
	queued: number;
	/** of them, this team's */
	teamQueued: number;
	running: number;
	liveWorkers: number;
	liveSlots: number;
	/** runs wait and no live worker has this version: they wait until one starts */
	stranded: boolean;
}

export interface WorkersOverview {
	workers: WorkerRow[];
	/** this team's queued and running runs */
	team: { queued: number; running: number };
	versions: VersionQueue[];
	/** the solver version this app freezes into new runs */
	appSolverVersion: string;
	lostAfterS: number;
}

const STATE_ORDER: Record<WorkerState, number> = { live: 0, lost: 1, stopped: 2 };

export async function workersOverview(teamId: string): Promise<WorkersOverview> {
	const lostAfterS = workerLostAfterS();
	const [rows, teamCounts, versionCounts] = await Promise.all([
		db
			.select({
				id: workers.id,
				host: workers.host,
				pid: workers.pid,
				slots: workers.slots,
				solverVersion: workers.solverVersion,
				startedAt: workers.startedAt,
				heartbeatAt: workers.heartbeatAt,
				stoppedAt: workers.stoppedAt,
				activeRuns: workers.activeRuns,
				runsDone: workers.runsDone,
				heartbeatAgeS: sql<number>`greatest(0, extract(epoch from now() - ${workers.heartbeatAt}))::float8`
			})
			.from(workers)
			.orderBy(asc(workers.host), asc(workers.startedAt)),
		db
			.select({ status: runs.status, n: sql<number>`count(*)::int` })
			.from(runs)
			.where(and(eq(runs.teamId, teamId), inArray(runs.status, ['queued', 'running'])))
			.groupBy(runs.status),
		db
			.select({
				solverVersion: runs.solverVersion,
				queued: sql<number>`(count(*) filter (where ${runs.status} = 'queued'))::int`,
				teamQueued: sql<number>`(count(*) filter (where ${runs.status} = 'queued' and ${runs.teamId} = ${teamId}))::int`,
				running: sql<number>`(count(*) filter (where ${runs.status} = 'running'))::int`
			})
			.from(runs)
			.where(inArray(runs.status, ['queued', 'running']))
			.groupBy(runs.solverVersion)
	]);

	const list: WorkerRow[] = rows
		.map((r) => {
			const state: WorkerState = r.stoppedAt ? 'stopped' : r.heartbeatAgeS > lostAfterS ? 'lost' : 'live';
			return {
				...r,
				startedAt: r.startedAt.toISOString(),
				heartbeatAt: r.heartbeatAt.toISOString(),
				stoppedAt: r.stoppedAt?.toISOString() ?? null,
				state
			};
		})
		.sort((a, b) => STATE_ORDER[a.state] - STATE_ORDER[b.state]);

	const byVersion = new Map<string, VersionQueue>();
	const entry = (v: string) => {
		let e = byVersion.get(v);
		if (!e) byVersion.set(v, (e = { solverVersion: v, queued: 0, teamQueued: 0, running: 0, liveWorkers: 0, liveSlots: 0, stranded: false }));
		return e;
	};
	entry(SOLVER_VERSION);
	for (const c of versionCounts) Object.assign(entry(c.solverVersion), { queued: c.queued, teamQueued: c.teamQueued, running: c.running });
	for (const w of list) {
		if (w.state !== 'live') continue;
		const e = entry(w.solverVersion);
		e.liveWorkers += 1;
		e.liveSlots += w.slots;
	}
	const versions = [...byVersion.values()]
		.map((v) => ({ ...v, stranded: v.queued > 0 && v.liveWorkers === 0 }))
		.sort((a, b) => b.solverVersion.localeCompare(a.solverVersion, undefined, { numeric: true }));

	const count = (status: string) => teamCounts.find((c) => c.status === status)?.n ?? 0;
	return {
		workers: list,
		team: { queued: count('queued'), running: count('running') },
		versions,
		appSolverVersion: SOLVER_VERSION,
		lostAfterS
	};
}
