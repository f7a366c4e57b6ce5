/**
 * The handler of the `solve-run` queue: one job = one attempt at one run.
 *
 * The run row is the authority, not the pg-boss job. A handler first *claims* the run (status
 * queued|running, its job id, no cancel request), and every later write is conditioned on
 * `job_id`, `worker_id` and `attempts` still being this attempt's: if the heartbeat sweeper has
 * meanwhile handed the run to another job (or pg-boss retried this one), this handler's writes match
 * nothing, it notices, and stops without writing. So no run is worked by two handlers at once,
 * even across machines.
 *
 * Writes, all from this main thread and strictly in order (one promise chain):
 * - every `flushIntervalMs` (~100 ms): the new residual rows (insert … on conflict do nothing), the
 *   run's step / simulated time / wall time / heartbeat, and `pg_notify` — one transaction; the
 *   same update reads `cancel_requested`, so a cancel is seen within one interval;
 * - each snapshot, and each checkpoint together with every residual row up to its step, so a
 *   resumed attempt (starting after the checkpoint's step) leaves no gap, and its rewrites of
 *   later steps are no-ops (the solver is deterministic, so they are the same values);
 * - the end: final snapshot, summary and status, checkpoint removed, then the e-mail.
 *
 * Failures: a solver failure (a `failed` step status, or the solver throwing) is recorded on the
 * run and the handler returns — retrying would fail the same way. Only database faults throw, so
 * pg-boss retries the job, which resumes from the checkpoint. A write the database itself keeps
 * refusing (a full disk, a failing constraint or trigger) would fail every retry the same way: on
 * pg-boss's last try the run is failed instead, with the database's message. A fault that is no
 * answer of the server (it restarted, the network is gone) is left to the heartbeat sweeper, which
 * re-queues the run once the database is back. A failed write is one rolled-back transaction, so
 * nothing half-written is ever read back.
 */
import { and, eq, inArray, sql } from 'drizzle-orm';
import type PgBoss from 'pg-boss';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { checkpoints, residuals, runs, snapshots } from '../../src/lib/server/db/schema.js';
import { withTransaction } from '../../src/lib/server/runs/commands.js';
import { decodeCheckpoint } from '../../src/lib/server/runs/codec.js';
import { RUN_CHANNEL, sendSolveJob, type SolveJobData } from '../../src/lib/server/runs/jobs.js';
import { Control, FINAL_MESSAGES, type ResidualRow, type RunRequest, type ThreadMessage } from './solve-protocol.js';
import type { SolverPool } from './solver-pool.js';
import { sendRunEndedMail } from './mail.js';
import type { CaseDocument } from '../../solver/case.js';

export interface SolveContext {
	handle: DbHandle;
	boss: PgBoss;
	/** host:pid:random of this process, stored on the runs it claims */
	workerId: string;
	flushIntervalMs: number;
	checkpointIntervalS: number;
	/** wall-time pause after each step, ms: 0 except to watch or test a run in slow motion */
	stepPauseMs: number;
	/** the process's solver threads, one per slot */
	pool: SolverPool;
	/** runs in progress in this process, for the graceful stop */
	active: Set<ActiveRun>;
	/** true once the process is stopping: a run claimed now is checkpointed and released at once */
	isStopping: () => boolean;
	/** called once a run this process worked has ended (its final status committed) */
	onRunEnded?: () => void;
	log: (message: string) => void;
}

export interface ActiveRun {
	runId: string;
	/** checkpoint, release the job for another worker, return */
	requestShutdown(): void;
}

type Tx = Parameters<Parameters<typeof withTransaction>[1]>[0];
type StopReason = 'cancel' | 'wall-time' | 'lost' | 'shutdown' | 'fault';

/** The run's job was handed to another job while this one still worked: stop silently. */
class RunLostError extends Error {}

const INSERT_CHUNK = 2000;
let runSeq = 0;

function describeTime(o: { step: number; timeS: number }): string {
	return `simulated time ${o.timeS.toPrecision(4)} s, step ${o.step}`;
}

/** A job as pg-boss hands it to the worker (`includeMetadata`: how many tries it had). */
export type SolveJob = PgBoss.Job<SolveJobData> & Partial<Pick<PgBoss.JobWithMetadata<SolveJobData>, 'retryCount' | 'retryLimit'>>;

/** The database server's own error inside `e` (the ORM wraps it as the cause), with its SQLSTATE. */
function serverError(e: unknown): (Error & { code: string }) | null {
	for (let cur = e, depth = 0; cur && depth < 5; cur = (cur as { cause?: unknown }).cause, depth++) {
		const code = (cur as { code?: unknown }).code;
		if (cur instanceof Error && typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code)) return cur as Error & { code: string };
	}
	return null;
}

/** An error the database server answered with (a SQLSTATE), not a lost or refused connection. */
export function refusedByDatabase(e: unknown): boolean {
	const code = serverError(e)?.code;
	if (!code) return false;
	// class 08: connection exception; 57: the server shutting down or starting (operator intervention)
	return !code.startsWith('08') && !code.startsWith('57');
}

/**
 * The fault as pg-boss stores it with the job (as JSON): its message only. The ORM's error carries
 * the failed query's parameters — a snapshot's bytes among them — which are no valid JSON text: the
 * database refused pg-boss's record of the failure, so the retry never came (and the unhandled
 * refusal ended the worker).
 */
function jobFault(e: unknown): Error {
	const server = serverError(e);
	if (server) return new Error(`${server.message} (SQLSTATE ${server.code})`);
	return new Error(e instanceof Error ? e.message.split('\nparams:')[0].slice(0, 2000) : String(e));
}

export async function solveJob(ctx: SolveContext, job: SolveJob): Promise<void> {
	const { runId } = job.data;
	const { pool } = ctx.handle;
	// ownership is per attempt: a retry of the same job in the same process is a different owner
	let attempt = 0;
	const mine = () => and(eq(runs.id, runId), eq(runs.jobId, job.id), eq(runs.workerId, ctx.workerId), eq(runs.attempts, attempt));

	// ---- claim
	const claimed = await withTransaction(pool, async (tx) => {
		const [run] = await tx.db
			.update(runs)
			.set({
				status: 'running',
				attempts: sql`${runs.attempts} + 1`,
				workerId: ctx.workerId,
				heartbeatAt: sql`now()`,
				startedAt: sql`coalesce(${runs.startedAt}, now())`
			})
			.where(and(eq(runs.id, runId), eq(runs.jobId, job.id), inArray(runs.status, ['queued', 'running']), eq(runs.cancelRequested, false)))
			.returning();
		if (run) {
			await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, runId]);
			return run;
		}
		// a cancel that arrived while no worker held the run (e.g. after a crash) ends it here
		const [cancelled] = await tx.db
			.update(runs)
			.set({ status: 'cancelled', finishedAt: new Date(), errorMessage: 'Cancelled', heartbeatAt: null, workerId: null })
			.where(and(eq(runs.id, runId), eq(runs.jobId, job.id), inArray(runs.status, ['queued', 'running']), eq(runs.cancelRequested, true)))
			.returning({ id: runs.id });
		if (cancelled) {
			await tx.db.delete(checkpoints).where(eq(checkpoints.runId, runId));
			await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, runId]);
		}
		return null;
	});
	if (!claimed) return;
	attempt = claimed.attempts;
	const requeue = { solverVersion: claimed.solverVersion, studyIndex: claimed.studyIndex };
	const caseDoc: CaseDocument = claimed.caseDocument;

	const [cpRow] = await ctx.handle.db.select({ data: checkpoints.data }).from(checkpoints).where(eq(checkpoints.runId, runId));
	const checkpointBytes = cpRow ? new Uint8Array(cpRow.data) : null;
	const baseWallTimeS = checkpointBytes ? decodeCheckpoint(checkpointBytes).wallTimeS : 0;
	const attemptStartMs = performance.now();
	const wallTimeS = () => baseWallTimeS + (performance.now() - attemptStartMs) / 1000;
	const wallTimeLimitS = caseDoc.numerics.wallTimeLimitS;
	ctx.log(`run ${runId}: attempt ${claimed.attempts} ${checkpointBytes ? 'resumes from its checkpoint' : 'starts'}`);

	// ---- the solver thread and the ordered write chain
	const thread = ctx.pool.acquire();
	const control = thread.control;
	const seq = ++runSeq;
	let pending: ResidualRow[] = [];
	let latest = { step: claimed.steps, timeS: claimed.simulatedTimeS };
	let stopReason: StopReason | null = null;
	let fault: unknown = null;
	let chain: Promise<void> = Promise.resolve();
	let progressQueued = false;
	let threadDone = false;
	let threadLost = false;

	const stop = (reason: StopReason, how: number = Control.stop) => {
		if (stopReason) return;
		stopReason = reason;
		Atomics.store(control, 0, how);
	};
	const enqueue = (write: () => Promise<void>) => {
		chain = chain
			.then(() => (fault || stopReason === 'lost' ? undefined : write()))
			.catch((e) => {
				if (e instanceof RunLostError) {
					ctx.log(`run ${runId}: taken over by another job; this attempt stops`);
					stop('lost');
					stopReason = 'lost';
					return;
				}
				fault ??= e;
				stop('fault');
			});
	};

	/** Residual rows so far + heartbeat + progress + NOTIFY; returns whether a cancel was requested. */
	const writeProgress = async (tx: Tx): Promise<boolean> => {
		const rows = pending;
		pending = [];
		for (let i = 0; i < rows.length; i += INSERT_CHUNK) {
			await tx.db
				.insert(residuals)
				.values(rows.slice(i, i + INSERT_CHUNK).map((r) => ({ runId, step: r.step, simulatedTimeS: r.timeS, values: r.values })))
				.onConflictDoNothing();
		}
		const [r] = await tx.db
			.update(runs)
			.set({ heartbeatAt: sql`now()`, steps: latest.step, simulatedTimeS: latest.timeS, wallTimeS: wallTimeS() })
			.where(mine())
			.returning({ cancelRequested: runs.cancelRequested });
		if (!r) throw new RunLostError();
		await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, runId]);
		return r.cancelRequested;
	};

	let lastProgressMs = 0;
	const queueProgress = () => {
		if (progressQueued) return;
		progressQueued = true;
		enqueue(async () => {
			progressQueued = false;
			lastProgressMs = performance.now();
			const cancelRequested = await withTransaction(pool, writeProgress);
			if (cancelRequested) stop('cancel');
		});
	};

	/** After the final status committed: count the run for the worker registry, then the e-mail. */
	const afterEnd = async () => {
		ctx.onRunEnded?.();
		await mailQuietly(ctx, runId);
	};

	const active: ActiveRun = { runId, requestShutdown: () => stop('shutdown', Control.checkpointAndStop) };
	ctx.active.add(active);
	if (ctx.isStopping()) active.requestShutdown();

	// heartbeat, progress, cancel and wall-time checks run on the clock, whatever the thread does
	const timer = setInterval(() => {
		if (threadDone) return;
		if (wallTimeS() > wallTimeLimitS) stop('wall-time');
		// the heartbeat, also when the thread has nothing to say (rows are written as they come)
		if (performance.now() - lastProgressMs >= ctx.flushIntervalMs) queueProgress();
	}, ctx.flushIntervalMs);

	const finished = new Promise<void>((resolve) => {
		const end = () => {
			threadDone = true;
			// not through `enqueue`: this must run even after a fault or a lost run
			chain = chain.then(() => resolve());
		};

		const onMessage = (m: ThreadMessage) => {
			if (m.seq !== seq) return;
			if ((FINAL_MESSAGES as readonly string[]).includes(m.type)) detach();
			switch (m.type) {
				case 'residuals':
					for (const r of m.rows) pending.push(r);
					latest = { step: m.step, timeS: m.timeS };
					// the thread posts every ~flushIntervalMs: write at once rather than at the next tick
					queueProgress();
					break;
				case 'snapshot':
					enqueue(() =>
						withTransaction(pool, async (tx) => {
							await writeProgress(tx);
							await tx.db
								.insert(snapshots)
								.values({ runId, step: m.step, simulatedTimeS: m.timeS, isFinal: false, data: Buffer.from(m.bytes) })
								.onConflictDoNothing();
						})
					);
					break;
				case 'checkpoint':
					enqueue(() =>
						withTransaction(pool, async (tx) => {
							await writeProgress(tx);
							const data = Buffer.from(m.bytes);
							await tx.db
								.insert(checkpoints)
								.values({ runId, step: m.step, simulatedTimeS: m.timeS, data })
								.onConflictDoUpdate({ target: checkpoints.runId, set: { step: m.step, simulatedTimeS: m.timeS, data, updatedAt: sql`now()` } });
						})
					);
					break;
				case 'ended':
					latest = { step: m.step, timeS: m.timeS };
					enqueue(async () => {
						await withTransaction(pool, async (tx) => {
							await writeProgress(tx);
							await tx.db
								.insert(snapshots)
								.values({ runId, step: m.step, simulatedTimeS: m.timeS, isFinal: true, data: Buffer.from(m.finalSnapshot) })
								.onConflictDoUpdate({ target: [snapshots.runId, snapshots.step], set: { isFinal: true, data: sql`excluded.data` } });
							await endRun(tx, m.status === 'running' ? 'finished' : m.status, {
								summary: m.summary,
								errorMessage: m.status === 'failed' ? (m.message ?? 'The solver reported a failure without a message') : null
							});
						});
						await afterEnd();
					});
					end();
					break;
				case 'stopped':
					latest = { step: m.step, timeS: m.timeS };
					enqueue(() => afterStop(m));
					end();
					break;
				case 'error':
					// the solver threw: deterministic, so record it instead of retrying
					ctx.log(`run ${runId}: solver error: ${m.message}`);
					latest = { step: m.step, timeS: m.timeS };
					enqueue(async () => {
						await withTransaction(pool, async (tx) => {
							await writeProgress(tx);
							await endRun(tx, 'failed', { errorMessage: `The solver stopped with an error at ${describeTime(m)}: ${m.message}` });
						});
						await afterEnd();
					});
					end();
					break;
			}
		};
		const onExit = (code: number) => {
			detach();
			threadLost = true;
			// the thread vanished without a word (out of memory, killed): a fault, so pg-boss retries
			fault ??= new Error(`The solver thread of run ${runId} exited with code ${code}`);
			end();
		};
		const detach = () => {
			thread.worker.off('message', onMessage);
			thread.worker.off('exit', onExit);
		};
		thread.worker.on('message', onMessage);
		thread.worker.on('exit', onExit);
		const request: RunRequest = {
			type: 'run',
			seq,
			caseDoc,
			checkpoint: checkpointBytes,
			flushIntervalMs: ctx.flushIntervalMs,
			checkpointIntervalS: ctx.checkpointIntervalS,
			stepPauseMs: ctx.stepPauseMs
		};
		thread.worker.postMessage(request);
	});

	/** Final status on the run row (only if still ours), checkpoint removed, NOTIFY. */
	async function endRun(tx: Tx, status: 'converged' | 'finished' | 'failed' | 'cancelled', o: { summary?: Record<string, unknown>; errorMessage: string | null }) {
		const [r] = await tx.db
			.update(runs)
			.set({
				status,
				finishedAt: new Date(),
				summary: o.summary ?? null,
				errorMessage: o.errorMessage,
				steps: latest.step,
				simulatedTimeS: latest.timeS,
				wallTimeS: wallTimeS(),
				heartbeatAt: sql`now()`
			})
			.where(mine())
			.returning({ id: runs.id });
		if (!r) throw new RunLostError();
		await tx.db.delete(checkpoints).where(eq(checkpoints.runId, runId));
		await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, runId]);
	}

	async function afterStop(m: Extract<ThreadMessage, { type: 'stopped' }>) {
		switch (stopReason) {
			case 'cancel':
				await withTransaction(pool, async (tx) => {
					await writeProgress(tx);
					await endRun(tx, 'cancelled', { errorMessage: `Cancelled at ${describeTime(m)}` });
				});
				await afterEnd();
				return;
			case 'wall-time':
				await withTransaction(pool, async (tx) => {
					await writeProgress(tx);
					await endRun(tx, 'failed', {
						errorMessage:
							`Stopped: the run reached its wall-time limit of ${wallTimeLimitS} s at ${describeTime(m)} ` +
							`(end time ${caseDoc.numerics.endTimeS} s). Raise the limit, coarsen the grid or shorten the end time.`
					});
				});
				await afterEnd();
				return;
			case 'shutdown':
				// the thread posted its checkpoint just before `stopped`; hand the run to a new job
				await withTransaction(pool, async (tx) => {
					await writeProgress(tx);
					const jobId = await sendSolveJob({ boss: ctx.boss, client: tx.client, runId, caseDoc, ...requeue });
					const [r] = await tx.db
						.update(runs)
						.set({ status: 'queued', jobId, workerId: null, heartbeatAt: null })
						.where(mine())
						.returning({ id: runs.id });
					if (!r) throw new RunLostError();
					await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, runId]);
				});
				ctx.log(`run ${runId}: checkpointed at ${describeTime(m)} and released`);
				return;
			default:
				return;
		}
	}

	try {
		await finished;
		await chain;
		ctx.log(`run ${runId}: attempt ${claimed.attempts} done (${stopReason ?? 'ended'}) at ${describeTime(latest)} after ${((performance.now() - attemptStartMs) / 1000).toFixed(2)} s`);
	} finally {
		clearInterval(timer);
		ctx.active.delete(active);
		if (threadLost) ctx.pool.replace(thread);
		else ctx.pool.release(thread);
	}
	if (fault) {
		const lastTry = job.retryLimit !== undefined && (job.retryCount ?? 0) >= job.retryLimit;
		const server = serverError(fault);
		if (lastTry && server && refusedByDatabase(server) && (await failAfterRefusedWrites(server))) return;
		throw jobFault(fault);
	}

	/** Ends the run as failed with the database's refusal; false when even that cannot be written. */
	async function failAfterRefusedWrites(e: Error & { code: string }): Promise<boolean> {
		const tries = (job.retryCount ?? 0) + 1;
		try {
			await withTransaction(pool, async (tx) => {
				// the run's progress as stored: the refused transaction's rows were rolled back
				const { rows } = await tx.client.query<{ step: number; time_s: number }>(
					'select step, simulated_time_s as time_s from residuals where run_id = $1 order by step desc limit 1',
					[runId]
				);
				latest = rows[0] ? { step: rows[0].step, timeS: rows[0].time_s } : { step: 0, timeS: 0 };
				await endRun(tx, 'failed', {
					errorMessage:
						`Failed: the database refused to store this run's results ${tries} times in a row, at ${describeTime(latest)} ` +
						`(${e.message}; SQLSTATE ${e.code}). What was stored before is complete; fix the database (for example its free disk space) and re-run.`
				});
			});
		} catch (again) {
			ctx.log(`run ${runId}: could not record the failure either: ${(again as Error).message}`);
			return false;
		}
		ctx.log(`run ${runId}: failed after ${tries} refused writes: ${e.message}`);
		await afterEnd();
		return true;
	}
}

async function mailQuietly(ctx: SolveContext, runId: string): Promise<void> {
	try {
		await sendRunEndedMail({ db: ctx.handle.db, runId });
	} catch (e) {
		// the run's outcome is stored; a mail fault must not turn it into a retry
		ctx.log(`run ${runId}: could not send the run-ended e-mail: ${(e as Error).message}`);
	}
}
