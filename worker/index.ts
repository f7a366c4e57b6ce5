/**
 * The Twofold worker process: works the `solve-run` queue. Start it with `npm run worker`
 * (`npm start` starts one beside the app). Any number of worker processes on any machines may
 * share one database; PostgreSQL is the only coordination point.
 *
 * Environment:
 *   DATABASE_URL                     the app's database (required outside the local default)
 *   TWOFOLD_WORKER_SLOTS             runs worked at once by this process (default: CPU cores − 1,
 *                                    at least 1; the older name TWOFOLD_WORKER_CONCURRENCY is still
 *                                    read); each slot steps its runs on its own thread
 *   TWOFOLD_WORKER_HOST              host name shown on the Workers page and in the worker id
 *                                    (default: the machine's host name)
 *   TWOFOLD_WORKER_POLL_S            how often an idle slot asks for a job (default 0.5 s)
 *   TWOFOLD_CHECKPOINT_INTERVAL_S    wall time between checkpoints of a run (default 3 s)
 *   TWOFOLD_STALE_AFTER_S            heartbeat age after which a run counts as orphaned (default 5 s)
 *   TWOFOLD_WORKER_STEP_PAUSE_MS     pause after every solver step (default 0): slow motion for
 *                                    tests and demos of crash, cancel and wall-time handling; it
 *                                    changes wall time only, never results. Not for production.
 *   SMTP_HOST, SMTP_PORT, ORIGIN     run-ended e-mail and the link in it
 *   TWOFOLD_VERIFY_AT_START          1: queue the solver's verification of this version at start when
 *                                    none is cached yet (`npm start` sets it); the worker computes
 *                                    verifications of its version either way (worker/jobs/verify.ts)
 *
 * The worker works only the queue of its own solver version (`SOLVE_QUEUE`), and keeps its row in
 * the `workers` table up to date (worker/registry.ts).
 *
 * SIGTERM / SIGINT: stop taking jobs, checkpoint every run in progress and hand it back to the
 * queue, mark the worker stopped, then exit.
 */
import os from 'node:os';
import { randomBytes } from 'node:crypto';
import { createDb, DEFAULT_DATABASE_URL } from '../src/lib/server/db/index.js';
import pg from 'pg';
import { createBoss, ensureQueue, JOB_CHANNEL, SOLVE_QUEUE, type SolveJobData } from '../src/lib/server/runs/jobs.js';
import { solveJob, type ActiveRun, type SolveContext } from './jobs/solve.js';
import { startSweeper } from './sweeper.js';
import { createSolverPool } from './jobs/solver-pool.js';
import { startRegistry } from './registry.js';
import { SOLVER_VERSION } from '../solver/version.js';
import { startVerifyWork } from './jobs/verify.js';
import { verificationVersion } from '../src/lib/server/verification/shared.js';

function numberFromEnv(name: string, fallback: number, min: number): number {
	const raw = process.env[name];
	if (raw === undefined || raw === '') return fallback;
	const value = Number(raw);
	if (!Number.isFinite(value) || value < min) throw new Error(`${name} must be a number of at least ${min}, not "${raw}"`);
	return value;
}

/**
 * LISTEN for sent jobs and wake the idle work loops at once (pg-boss otherwise finds a job at its
 * next poll). Best effort: a lost connection is re-opened, and polling covers the gap.
 */
function listenForJobs(o: { url: string; log: (m: string) => void; onJob: () => void }): { close(): Promise<void> } {
	let client: pg.Client | null = null;
	let closed = false;
	const open = async () => {
		const c = new pg.Client({ connectionString: o.url, application_name: 'twofold-worker-listen' });
		c.on('notification', () => o.onJob());
		c.on('error', (e) => {
			o.log(`job LISTEN lost: ${e.message}`);
			c.end().catch(() => {});
			if (client === c) client = null;
			if (!closed) setTimeout(() => void open().catch(() => {}), 1000).unref();
		});
		await c.connect();
		await c.query(`LISTEN ${JOB_CHANNEL}`);
		if (closed) await c.end();
		else client = c;
	};
	open().catch((e) => o.log(`job LISTEN failed, polling only: ${(e as Error).message}`));
	return {
		async close() {
			closed = true;
			await client?.end().catch(() => {});
		}
	};
}

async function main() {
	const url = process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL;
	// one core is left to the machine's other work (the app, PostgreSQL) unless told otherwise
	const defaultSlots = Math.max(1, os.availableParallelism() - 1);
	const slotsVar = process.env.TWOFOLD_WORKER_SLOTS ? 'TWOFOLD_WORKER_SLOTS' : 'TWOFOLD_WORKER_CONCURRENCY';
	const concurrency = Math.floor(numberFromEnv(slotsVar, defaultSlots, 1));
	const pollS = numberFromEnv('TWOFOLD_WORKER_POLL_S', 0.5, 0.5);
	const checkpointIntervalS = numberFromEnv('TWOFOLD_CHECKPOINT_INTERVAL_S', 3, 0.1);
	const staleAfterS = numberFromEnv('TWOFOLD_STALE_AFTER_S', 5, 1);
	const stepPauseMs = numberFromEnv('TWOFOLD_WORKER_STEP_PAUSE_MS', 0, 0);
	const host = process.env.TWOFOLD_WORKER_HOST || os.hostname();
	const workerId = `${host}:${process.pid}:${randomBytes(3).toString('hex')}`;
	const log = (message: string) => console.log(`[worker ${workerId}] ${message}`);
	// pg-boss records a job's outcome (complete / fail) without awaiting it: while the database is
	// away (a restart, a dropped network) that write rejects with nobody to catch it, which would end
	// the process. The run row is the authority and the heartbeat sweeper re-queues a run whose
	// worker stopped writing, so such a lost job update is logged and the worker carries on; any
	// other unhandled rejection still ends the process, as it would by default.
	process.on('unhandledRejection', (reason) => {
		const e = reason instanceof Error ? reason : new Error(String(reason));
		if (/pg-boss|pg-pool|node_modules[\\/]pg[\\/]/.test(e.stack ?? '')) {
			log(`database write of pg-boss failed (${e.message}); the run row stays the authority`);
			return;
		}
		console.error('[worker] unhandled rejection:', e);
		process.exit(1);
	});

	// one connection per run slot for its writes, plus a few for claims, sweeps and mail
	const handle = createDb({ url, max: concurrency + 3, applicationName: 'twofold-worker' });
	const boss = createBoss({ url, role: 'worker', max: 2 + Math.ceil(concurrency / 2) });
	boss.on('error', (e) => log(`pg-boss: ${e.message}`));
	await boss.start();
	await ensureQueue(boss);

	const pool = createSolverPool(concurrency);
	const active = new Set<ActiveRun>();
	let stopping = false;
	const registry = await startRegistry({
		handle,
		worker: { id: workerId, host, pid: process.pid, slots: concurrency, solverVersion: SOLVER_VERSION },
		activeRuns: () => active.size,
		log
	});
	const ctx: SolveContext = {
		handle,
		boss,
		workerId,
		flushIntervalMs: 100,
		checkpointIntervalS,
		stepPauseMs,
		pool,
		active,
		isStopping: () => stopping,
		onRunEnded: () => registry.runEnded(),
		log
	};

	// pg-boss 10 works one batch per `work` call: `concurrency` calls of batch size 1 = that many runs at once
	const workIds: string[] = [];
	for (let i = 0; i < concurrency; i++) {
		const slot = i;
		// with its retry count, so that the last try of a run whose writes keep failing ends it (solve.ts)
		const id = await boss.work<SolveJobData>(SOLVE_QUEUE, { batchSize: 1, pollingIntervalSeconds: pollS, includeMetadata: true }, async ([job]) => {
			await solveJob(ctx, job);
			// pg-boss otherwise waits out the rest of the poll interval before the next fetch; a slot
			// that just finished a job asks again at once (an empty queue then waits the interval)
			if (!stopping) boss.notifyWorker(workIds[slot]);
		});
		workIds.push(id);
	}
	// the verification page's results of this solver version: one at a time, on a thread of its own, never on a run slot
	const verify = await startVerifyWork({ boss, handle, workerId, solverVersion: verificationVersion(), pollingIntervalSeconds: Math.max(pollS, 2), atStart: process.env.TWOFOLD_VERIFY_AT_START === '1', log });
	const wake = listenForJobs({ url, log, onJob: () => (workIds.forEach((id) => boss.notifyWorker(id)), verify.wake()) });
	const sweeper = startSweeper({ handle, boss, staleAfterS, intervalMs: 1000, maxAttempts: 5, log });
	log(`working ${SOLVE_QUEUE} with ${concurrency} slot(s), solver ${SOLVER_VERSION}`);

	const shutdown = async (signal: string) => {
		if (stopping) return;
		stopping = true;
		log(`${signal}: checkpointing ${active.size} run(s) and stopping`);
		const timeoutMs = 20_000;
		const force = setTimeout(() => process.exit(1), timeoutMs + 5_000);
		force.unref();
		try {
			for (const run of active) run.requestShutdown();
			verify.stop();
			await wake.close();
			await sweeper.stop();
			// waits for the handlers, which now checkpoint and release their runs
			await boss.stop({ graceful: true, wait: true, timeout: timeoutMs });
			await pool.close();
			await registry.stop();
			await handle.close();
			log('stopped');
			process.exit(0);
		} catch (e) {
			log(`unclean stop: ${(e as Error).message}`);
			process.exit(1);
		}
	};
	process.on('SIGTERM', () => void shutdown('SIGTERM'));
	process.on('SIGINT', () => void shutdown('SIGINT'));
}

main().catch((e) => {
	console.error('[worker] failed to start:', e);
	process.exit(1);
});
