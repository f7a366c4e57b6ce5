/**
 * What the app and the worker share about the run queue: the pg-boss queue name, the NOTIFY
 * channel, how a pg-boss instance is built, and how a job is sent inside a caller's transaction.
 * No SvelteKit imports: the worker loads this module under tsx.
 */
import PgBoss from 'pg-boss';
import type pg from 'pg';
import type { CaseDocument } from '../../../../solver/case.js';

/** pg-boss queue of solver runs; a job's data is `{ runId }`. */
export const SOLVE_QUEUE = 'solve-run';

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

export async function ensureQueue(boss: PgBoss): Promise<void> {
	// creating a queue is idempotent in pg-boss 10 (insert … on conflict do nothing)
	await boss.createQueue(SOLVE_QUEUE, { name: SOLVE_QUEUE, policy: 'standard', retryLimit: RETRY_LIMIT, retryDelay: 1 });
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
export async function sendSolveJob(options: { boss: PgBoss; client: pg.PoolClient | pg.Client; runId: string; caseDoc: CaseDocument }): Promise<string> {
	const db = { executeSql: (text: string, values: unknown[]) => options.client.query(text, values as unknown[]) };
	const id = await options.boss.send(SOLVE_QUEUE, { runId: options.runId } satisfies SolveJobData, {
		db,
		retryLimit: RETRY_LIMIT,
		retryDelay: 1,
		expireInSeconds: expireInSecondsFor(options.caseDoc)
	});
	if (!id) throw new Error(`pg-boss did not accept the job of run ${options.runId}`);
	// delivered at commit, like the job itself
	await options.client.query('select pg_notify($1, $2)', [JOB_CHANNEL, SOLVE_QUEUE]);
	return id;
}

/** Cancel a pg-boss job on the caller's transaction (a no-op when it already ended). */
export async function cancelSolveJob(options: { boss: PgBoss; client: pg.PoolClient | pg.Client; jobId: string }): Promise<void> {
	const db = { executeSql: (text: string, values: unknown[]) => options.client.query(text, values as unknown[]) };
	await options.boss.cancel(SOLVE_QUEUE, options.jobId, { db });
}
