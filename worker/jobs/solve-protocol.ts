/** Messages and controls between a run's main-thread handler (solve.ts) and a solver thread (solve-thread.ts). */
import type { CaseDocument } from '../../solver/case.js';
import type { Residuals, Results } from '../../solver/types.js';

/** Values of a thread's control word, read by the thread between two steps. */
export const Control = {
	/** keep stepping */
	go: 0,
	/** graceful stop: post a checkpoint, then `stopped` */
	checkpointAndStop: 1,
	/** stop now (cancel, wall-time limit, run lost): post what is pending, then `stopped` */
	stop: 2
} as const;

/** Given once, when the thread starts. */
export interface ThreadData {
	/** one Int32 control word (see `Control`), shared with the main thread */
	control: SharedArrayBuffer;
}

/** One run, posted to an idle thread. */
export interface RunRequest {
	type: 'run';
	/** echoed in every message of this run, so nothing of an earlier run is taken for this one */
	seq: number;
	caseDoc: CaseDocument;
	/** the stored checkpoint to resume from, or null for a fresh start */
	checkpoint: Uint8Array | null;
	flushIntervalMs: number;
	checkpointIntervalS: number;
	/** wall-time pause after each step, ms (0 in production; see TWOFOLD_WORKER_STEP_PAUSE_MS) */
	stepPauseMs: number;
}

export interface ResidualRow {
	step: number;
	timeS: number;
	values: Residuals;
	/** wall clock when the step was computed, ms since the epoch (not stored; for latency figures) */
	atMs: number;
}

export type ThreadMessage = { seq: number } & (
	| { type: 'residuals'; rows: ResidualRow[]; step: number; timeS: number }
	| { type: 'snapshot'; step: number; timeS: number; bytes: Uint8Array }
	| { type: 'checkpoint'; step: number; timeS: number; bytes: Uint8Array; wallTimeS: number }
	| { type: 'stopped'; step: number; timeS: number; wallTimeS: number }
	| { type: 'ended'; status: Results['status']; message?: string; step: number; timeS: number; summary: Record<string, unknown>; finalSnapshot: Uint8Array; wallTimeS: number }
	/** the solver threw: deterministic, recorded as a failure */
	| { type: 'error'; message: string; step: number; timeS: number }
);

/** The messages that end a run on a thread (the thread is idle again after one of them). */
export const FINAL_MESSAGES = ['stopped', 'ended', 'error'] as const;

/**
 * Which steps get a stored residual row: every step up to 999, then every 10th up to 9 999, every
 * 100th up to 99 999, and so on (about 900 rows per decade), plus the last step of the run. A fast
 * solver makes thousands of steps a second; the history stays small and still shows the whole run.
 * It depends on the step number alone, so a resumed attempt stores exactly the rows the
 * uninterrupted run would have.
 */
export function storesResidualStep(step: number): boolean {
	if (step < 1000) return true;
	const stride = 10 ** (Math.floor(Math.log10(step)) - 2);
	return step % stride === 0;
}
