/**
 * What the app and the worker share about the run queue: the pg-boss queue name, the NOTIFY
 * channel, how a pg-boss instance is built, and how a job is sent inside a caller's transaction.
 * No SvelteKit imports: the worker loads this module under tsx.
 */
import PgBoss from 'pg-boss';
import type pg from 'pg';
import type { CaseDocument } from '../../../../solver/case.js';
import { SOLVER_VERSION } from '../../../../solver/version.js';

/**
 * pg-boss queue of the solver runs frozen with one solver version; a job's data is `{ runId }`.
 * A worker works only the queue of its own solver version, so a run is always computed by the
 * version recorded on it (`runs.solver_version`): a worker of another version never takes it, and
 * the run waits until a worker of its version is online (the admin's Workers page says so).
 */
export function solveQueue(solverVersion: string): string {
	return `solve-run-v${solverVersion.replace(/[^\w]/g, '-')}`;
}

/** The queue of this process's solver version. */
export const SOLVE_QUEUE = solveQueue(SOLVER_VERSION);

/**
 * pg-boss queue of the verification of one solver version (src/lib/server/verification); a job's data
 * is `{ solverVersion }`. Per version for the same reason as `solveQueue`: the results must come from
 * the solver version they are filed under.
 */
export function verifyQueue(solverVersion: string): string {
	return `verify-solver-v${solverVersion.replace(/[^\w]/g, '-')}`;
}

/** PostgreSQL NOTIFY channel of run news (progress, snapshot, status); the payload is the run id. */
export const RUN_CHANNEL = 'twofold_run';

/**
 * NOTIFY channel that wakes idle workers when a job is sent, so a run starts within milliseconds
 * instead of at the next poll; polling stays as the fallback.
 */
export const JOB_CHANNEL = 'twofold_job';

export interface SolveJobData {
	runId: string;
}

/** Retries are for infrastructure faults only (a solver failure is recorded and the job completes). */
const RETRY_LIMIT = 3;

/**
 * A pg-boss instance. The app sends only (no maintenance, no cron); workers supervise.
 * pg-boss keeps its tables in its own `pgboss` schema of the same database.
 */
export function createBoss(options: { url: string; role: 'app' | 'worker'; max?: number }): PgBoss {
	const boss = new PgBoss({
		connectionString: options.url,
		application_name: `twofold-${options.role}-boss`,
		max: options.max ?? (options.role === 'app' ? 3 : 4),
		supervise: options.role === 'worker',
		schedule: false,
		migrate: true
	});
	return boss;
}

export async function ensureQueue(boss: PgBoss, name: string = SOLVE_QUEUE): Promise<void> {
	// creating a queue is idempotent in pg-boss 10 (insert … on conflict do nothing)
	await boss.createQueue(name, { name, policy: 'standard', retryLimit: RETRY_LIMIT, retryDelay: 1 });
}

/**
 * Queue priority of a run (pg-boss fetches the highest first, then the oldest). A run queued on
 * its own has 0; member i of a study has −i. So a study's first member goes ahead as soon as the
 * study is queued, and its later members queue behind every single run queued after them and
 * interleave with the members of other studies: one team's 200-run study cannot starve another
 * team's (or a colleague's) single run.
 */
export function runPriority(studyIndex: number | null | undefined): number {
	return studyIndex == null ? 0 : -studyIndex;
}

/**
 * pg-boss 10 has no job heartbeat, so the job's expiry is only a last resort far beyond the run's own
 * wall-time limit; a dead worker is found sooner by the heartbeat sweeper (worker/sweeper.ts).
 */
export function expireInSecondsFor(caseDoc: CaseDocument): number {
	const maxS = 23 * 3600; // pg-boss refuses 24 h or more
	return Math.min(maxS, Math.ceil(caseDoc.numerics.wallTimeLimitS * 2 + 600));
}

/**
 * Send the solve job on the caller's open transaction (`client` has run BEGIN), so the run row and
 * its job commit or roll back together: no run without a job, no job without a run.
 */
export async function sendSolveJob(options: {
	boss: PgBoss;
	client: pg.PoolClient | pg.Client;
	runId: string;
	caseDoc: CaseDocument;
	/** the run's recorded solver version (default: this process's) */
	solverVersion?: string;
	studyIndex?: number | null;
}): Promise<string> {
	const db = { executeSql: (text: string, values: unknown[]) => options.client.query(text, values as unknown[]) };
	const queue = solveQueue(options.solverVersion ?? SOLVER_VERSION);
	if (queue !== SOLVE_QUEUE) await ensureQueue(options.boss, queue);
	const id = await options.boss.send(queue, { runId: options.runId } satisfies SolveJobData, {
		db,
		retryLimit: RETRY_LIMIT,
		retryDelay: 1,
		priority: runPriority(options.studyIndex),
		expireInSeconds: expireInSecondsFor(options.caseDoc)
	});
	if (!id) throw new Error(`pg-boss did not accept the job of run ${options.runId}`);
	// delivered at commit, like the job itself
	await options.client.query('select pg_notify($1, $2)', [JOB_CHANNEL, queue]);
	return id;
}

/** Cancel a pg-boss job on the caller's transaction (a no-op when it already ended). */
export async function cancelSolveJob(options: { boss: PgBoss; client: pg.PoolClient | pg.Client; jobId: string; solverVersion?: string }): Promise<void> {
	const db = { executeSql: (text: string, values: unknown[]) => options.client.query(text, values as unknown[]) };
	await options.boss.cancel(solveQueue(options.solverVersion ?? SOLVER_VERSION), options.jobId, { db });
}
