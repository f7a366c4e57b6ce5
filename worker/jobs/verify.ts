/**
 * The handler of the `verify-solver-v<version>` queue: computes the solver's verification cases once for
 * this worker's solver version and stores them in `verification_results` (src/lib/server/verification).
 *
 * The row is the authority. The handler claims it (`queued` → `computing`, its worker id); every later
 * write is conditioned on the row still being this worker's claim, so a row re-queued meanwhile (its
 * claim taken as orphaned) is never overwritten by a late result. The cases run on a thread of their own,
 * started for the job, never on a run slot's solver thread, and the main thread stays free for the run
 * slots' writes and the heartbeat. Progress is written at most every `progressIntervalMs` and whenever a
 * case starts (about once per case).
 *
 * Failures: a case that misses its tolerance is a result (`done`, that case marked failed); the thread
 * throwing or dying is recorded as `failed` with its message and the handler returns — a retry would
 * fail the same way. Only database faults and a stop of the worker throw, so pg-boss retries the job
 * (the row is put back to `queued` first on a stop).
 */
import { Worker } from 'node:worker_threads';
import { and, eq } from 'drizzle-orm';
import type PgBoss from 'pg-boss';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { verificationResults } from '../../src/lib/server/db/schema.js';
import { ensureQueue, verifyQueue } from '../../src/lib/server/runs/jobs.js';
import { queueVerification, type VerifyJobData } from '../../src/lib/server/verification/shared.js';
import type { VerifyThreadMessage } from './verify-thread.js';

export interface VerifyContext {
	handle: DbHandle;
	workerId: string;
	/** the version this worker files results under (`verificationVersion()`) */
	solverVersion: string;
	progressIntervalMs: number;
	/** resolves when the process starts stopping */
	stopping: Promise<void>;
	log: (message: string) => void;
}

/** Start the verification thread. Under tsx the thread must register tsx's loader itself to import .ts files. */
function startThread(): Worker {
	const entry = new URL(import.meta.url.endsWith('.ts') ? './verify-thread.ts' : './verify-thread.js', import.meta.url);
	if (entry.pathname.endsWith('.ts')) {
		const api = import.meta.resolve('tsx/esm/api');
		const code = `import(${JSON.stringify(api)}).then((m) => { m.register(); return import(${JSON.stringify(entry.href)}); })`;
		return new Worker(code, { eval: true });
	}
	return new Worker(entry);
}

class WorkerStoppingError extends Error {}

export async function verifyJob(ctx: VerifyContext, job: PgBoss.Job<VerifyJobData>): Promise<void> {
	const version = job.data.solverVersion;
	const { db } = ctx.handle;
	if (version !== ctx.solverVersion) {
		// the queue is per version, so this is a misrouted job: leave the row to a worker of that version
		ctx.log(`verification job ${job.id} is for solver ${version}, this worker is ${ctx.solverVersion}: skipped`);
		return;
	}
	const mine = and(eq(verificationResults.solverVersion, version), eq(verificationResults.status, 'computing'), eq(verificationResults.workerId, ctx.workerId));
	const claimed = await db
		.update(verificationResults)
		.set({ status: 'computing', progress: 0, workerId: ctx.workerId, startedAt: new Date(), finishedAt: null })
		.where(and(eq(verificationResults.solverVersion, version), eq(verificationResults.status, 'queued')))
		.returning({ solverVersion: verificationResults.solverVersion });
	if (claimed.length === 0) {
		ctx.log(`verification of solver ${version}: nothing to do (done, being computed, or no row)`);
		return;
	}
	ctx.log(`verifying solver ${version}`);

	const thread = startThread();
	let lastWriteMs = 0;
	let lastCase = -1;
	// writes in order, one at a time; a progress write that would overtake the end is dropped
	let writes: Promise<unknown> = Promise.resolve();
	const write = (fn: () => Promise<unknown>) => (writes = writes.then(fn).catch((e) => ctx.log(`verification progress not written: ${(e as Error).message}`)));

	const outcome = await new Promise<VerifyThreadMessage | { type: 'stopped' } | { type: 'died'; message: string }>((resolve) => {
		let settled = false;
		const settle = (v: VerifyThreadMessage | { type: 'stopped' } | { type: 'died'; message: string }) => {
			if (settled) return;
			settled = true;
			resolve(v);
		};
		thread.on('message', (m: VerifyThreadMessage) => {
			if (m.type === 'progress') {
				const now = Date.now();
				if (m.progress.caseIndex !== lastCase || now - lastWriteMs >= ctx.progressIntervalMs) {
					lastCase = m.progress.caseIndex;
					lastWriteMs = now;
					const fraction = Math.min(0.999, m.progress.fraction);
					write(() => db.update(verificationResults).set({ progress: fraction }).where(mine));
				}
			} else settle(m);
		});
		thread.on('error', (e) => settle({ type: 'died', message: e.message }));
		thread.on('exit', (code) => settle({ type: 'died', message: `the verification thread exited with code ${code}` }));
		void ctx.stopping.then(() => settle({ type: 'stopped' }));
		thread.postMessage({ type: 'run' });
	});
	await thread.terminate().catch(() => {});
	await writes;

	if (outcome.type === 'stopped') {
		// hand it back: another worker (or this one after a restart) takes the retried job
		await db.update(verificationResults).set({ status: 'queued', progress: 0, workerId: null, startedAt: null }).where(mine);
		throw new WorkerStoppingError('the worker stopped during the verification; it goes back to the queue');
	}
	if (outcome.type === 'done') {
		const failed = outcome.results.filter((r) => !r.passed).map((r) => r.id);
		await db
			.update(verificationResults)
			.set({ status: 'done', progress: 1, results: outcome.results, errorMessage: null, finishedAt: new Date() })
			.where(mine);
		ctx.log(`verified solver ${version} in ${outcome.wallTimeS.toFixed(1)} s: ${outcome.results.length - failed.length} of ${outcome.results.length} cases pass${failed.length ? ` (failing: ${failed.join(', ')})` : ''}`);
		return;
	}
	const message = outcome.type === 'error' || outcome.type === 'died' ? outcome.message : 'unexpected message from the verification thread';
	await db.update(verificationResults).set({ status: 'failed', errorMessage: message, finishedAt: new Date() }).where(mine);
	ctx.log(`verification of solver ${version} failed: ${message}`);
}

export interface VerifyWork {
	/** wake the verification loop (a job was sent) */
	wake(): void;
	/** the process is stopping: a verification under way is handed back to the queue */
	stop(): void;
}

/**
 * Work this worker's verification queue: one verification at a time, on its own thread. With `atStart`
 * (`npm start` sets TWOFOLD_VERIFY_AT_START=1) the worker also queues the verification of its version
 * when there is none yet, so the verification page has results by the time someone opens it. A database
 * role that may not create the queue (a restricted worker role, see the README) only logs: that worker
 * then computes no verification, the app's first page view creates the queue for workers started later.
 */
export async function startVerifyWork(o: {
	boss: PgBoss;
	handle: DbHandle;
	workerId: string;
	solverVersion: string;
	pollingIntervalSeconds: number;
	atStart: boolean;
	log: (message: string) => void;
}): Promise<VerifyWork> {
	let markStopping: () => void = () => {};
	const stopping = new Promise<void>((resolve) => (markStopping = resolve));
	const queue = verifyQueue(o.solverVersion);
	let workId: string | null = null;
	try {
		await ensureQueue(o.boss, queue);
		const ctx: VerifyContext = { handle: o.handle, workerId: o.workerId, solverVersion: o.solverVersion, progressIntervalMs: 1000, stopping, log: o.log };
		workId = await o.boss.work<VerifyJobData>(queue, { batchSize: 1, pollingIntervalSeconds: o.pollingIntervalSeconds }, async ([job]) => verifyJob(ctx, job));
		if (o.atStart && (await queueVerification({ pool: o.handle.pool, boss: o.boss, solverVersion: o.solverVersion }))) o.log(`queued the verification of solver ${o.solverVersion}`);
	} catch (e) {
		o.log(`verification queue ${queue} unavailable, this worker computes no verification: ${(e as Error).message}`);
	}
	return {
		wake: () => {
			if (workId) o.boss.notifyWorker(workId);
		},
		stop: () => markStopping()
	};
}
