/**
 * The worker registry: each worker process keeps one row in `workers` (id = its workerId), so an
 * admin sees on the Workers page which machines work the queue, with how many slots and which
 * solver version, and whether each is still alive.
 *
 * - register: upsert the row (started now, not stopped) and delete the rows of workers stopped or
 *   silent for more than `FORGET_AFTER_DAYS` days;
 * - every `HEARTBEAT_INTERVAL_MS`: `heartbeat_at = now()` (the database's clock, so machines with
 *   skewed clocks compare fairly), the runs in progress and the runs ended so far;
 * - stop (graceful exit): one last write with `stopped_at = now()`.
 *
 * The row is written as a whole on every beat (an upsert), so a lost write or a deleted row is
 * repaired by the next beat. A failed beat is logged and retried at the next interval: the
 * registry is for people to read and never stops the worker from working.
 */
import { lt, or, sql } from 'drizzle-orm';
import type { DbHandle } from '../src/lib/server/db/index.js';
import { workers } from '../src/lib/server/db/schema.js';

export const HEARTBEAT_INTERVAL_MS = 2000;
export const FORGET_AFTER_DAYS = 7;

export interface WorkerIdentity {
	/** host:pid:random, as stored on the runs it claims */
	id: string;
	host: string;
	pid: number;
	slots: number;
	solverVersion: string;
}

export interface WorkerRegistry {
	/** a run this worker worked has ended (converged, finished, failed or cancelled) */
	runEnded(): void;
	/** stop beating and mark the row stopped */
	stop(): Promise<void>;
}

export async function startRegistry(o: {
	handle: DbHandle;
	worker: WorkerIdentity;
	/** runs in progress in this process right now */
	activeRuns: () => number;
	intervalMs?: number;
	log: (message: string) => void;
}): Promise<WorkerRegistry> {
	const { db } = o.handle;
	const w = o.worker;
	let runsDone = 0;
	let stopped = false;

	const write = async (stoppedAt: boolean) => {
		const values = { activeRuns: stoppedAt ? 0 : o.activeRuns(), runsDone, heartbeatAt: sql`now()`, stoppedAt: stoppedAt ? sql`now()` : null };
		await db
			.insert(workers)
			.values({ id: w.id, host: w.host, pid: w.pid, slots: w.slots, solverVersion: w.solverVersion, ...values })
			.onConflictDoUpdate({ target: workers.id, set: values });
	};

	await db
		.delete(workers)
		.where(
			or(
				lt(workers.stoppedAt, sql`now() - make_interval(days => ${FORGET_AFTER_DAYS})`),
				lt(workers.heartbeatAt, sql`now() - make_interval(days => ${FORGET_AFTER_DAYS})`)
			)
		);
	await write(false);

	// one write at a time, in order; a beat asked for while one is in flight is merged into the next
	let chain: Promise<void> = Promise.resolve();
	let beatQueued = false;
	const beat = () => {
		if (stopped || beatQueued) return;
		beatQueued = true;
		chain = chain
			.then(() => {
				beatQueued = false;
				return stopped ? undefined : write(false);
			})
			.catch((e) => o.log(`registry heartbeat failed: ${(e as Error).message}`));
	};
	const timer = setInterval(beat, o.intervalMs ?? HEARTBEAT_INTERVAL_MS);
	timer.unref();

	return {
		runEnded() {
			runsDone += 1;
			beat();
		},
		async stop() {
			if (stopped) return;
			stopped = true;
			clearInterval(timer);
			await chain;
			try {
				await write(true);
			} catch (e) {
				o.log(`registry: could not mark this worker stopped: ${(e as Error).message}`);
			}
		}
	};
}
