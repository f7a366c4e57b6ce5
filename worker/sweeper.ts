/**
 * Liveness of runs, which pg-boss 10 lacks (no job heartbeat: a job whose worker died stays
 * active until its expiry). Every worker process sweeps: a `running` run whose heartbeat is older
 * than `staleAfterS` lost its worker, so its job is cancelled and a new job is sent for it, in one
 * transaction; the new attempt resumes from the run's checkpoint. Rows are taken with
 * `for update skip locked`, so two sweeping processes never hand the same run out twice.
 *
 * A run that lost its worker `maxAttempts` times is failed instead: something in it kills workers.
 */
import { and, eq, lt, sql } from 'drizzle-orm';
import type PgBoss from 'pg-boss';
import type { DbHandle } from '../src/lib/server/db/index.js';
import { checkpoints, runs } from '../src/lib/server/db/schema.js';
import { withTransaction } from '../src/lib/server/runs/commands.js';
import { cancelSolveJob, RUN_CHANNEL, sendSolveJob } from '../src/lib/server/runs/jobs.js';

export interface SweeperOptions {
	handle: DbHandle;
	boss: PgBoss;
	staleAfterS: number;
	intervalMs: number;
	maxAttempts: number;
	log: (message: string) => void;
}

/** One sweep; returns the ids of the runs it re-queued or ended. */
export async function sweepStaleRuns(o: Omit<SweeperOptions, 'intervalMs'>): Promise<string[]> {
	return withTransaction(o.handle.pool, async (tx) => {
		const stale = await tx.db
			.select({
				id: runs.id,
				jobId: runs.jobId,
				attempts: runs.attempts,
				cancelRequested: runs.cancelRequested,
				caseDocument: runs.caseDocument,
				solverVersion: runs.solverVersion,
				studyIndex: runs.studyIndex
			})
			.from(runs)
			.where(and(eq(runs.status, 'running'), lt(runs.heartbeatAt, sql`now() - make_interval(secs => ${o.staleAfterS})`)))
			.limit(20)
			.for('update', { skipLocked: true });
		for (const run of stale) {
			if (run.jobId) await cancelSolveJob({ boss: o.boss, client: tx.client, jobId: run.jobId, solverVersion: run.solverVersion });
			if (run.cancelRequested || run.attempts >= o.maxAttempts) {
				const cancelled = run.cancelRequested;
				await tx.db
					.update(runs)
					.set({
						status: cancelled ? 'cancelled' : 'failed',
						finishedAt: new Date(),
						workerId: null,
						errorMessage: cancelled
							? 'Cancelled (its worker had stopped answering)'
							: `Failed: the worker running it stopped answering ${run.attempts} times; it is not retried again`
					})
					.where(eq(runs.id, run.id));
				await tx.db.delete(checkpoints).where(eq(checkpoints.runId, run.id));
				o.log(`run ${run.id}: worker lost; ${cancelled ? 'cancelled as requested' : 'failed after ' + run.attempts + ' attempts'}`);
			} else {
				const jobId = await sendSolveJob({
					boss: o.boss,
					client: tx.client,
					runId: run.id,
					caseDoc: run.caseDocument,
					solverVersion: run.solverVersion,
					studyIndex: run.studyIndex
				});
				await tx.db.update(runs).set({ status: 'queued', jobId, workerId: null, heartbeatAt: null }).where(eq(runs.id, run.id));
				o.log(`run ${run.id}: heartbeat stale for over ${o.staleAfterS} s; re-queued as job ${jobId}`);
			}
			await tx.client.query('select pg_notify($1, $2)', [RUN_CHANNEL, run.id]);
		}
		return stale.map((r) => r.id);
	});
}

export function startSweeper(o: SweeperOptions): { stop(): Promise<void> } {
	let running: Promise<unknown> = Promise.resolve();
	let stopped = false;
	const timer = setInterval(() => {
		running = running
			.then(() => (stopped ? undefined : sweepStaleRuns(o)))
			.catch((e) => o.log(`sweep failed: ${(e as Error).message}`));
	}, o.intervalMs);
	return {
		async stop() {
			stopped = true;
			clearInterval(timer);
			await running;
		}
	};
}
