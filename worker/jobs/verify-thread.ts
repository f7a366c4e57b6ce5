/**
 * The verification thread: runs the solver's verification cases once (`runVerification`) and posts
 * `progress` messages as it goes, then `done` with the results or `error`. Started per verification job
 * (worker/jobs/verify.ts), so a verification never takes a run slot's solver thread; it ends with its job.
 */
import { parentPort } from 'node:worker_threads';
import { runVerification } from '../../solver/index.js';
import type { VerificationProgress, VerificationResult } from '../../solver/index.js';

export type VerifyThreadMessage =
	| { type: 'progress'; progress: VerificationProgress }
	| { type: 'done'; results: VerificationResult[]; wallTimeS: number }
	| { type: 'error'; message: string };

const port = parentPort!;
const post = (m: VerifyThreadMessage) => port.postMessage(m);

port.once('message', () => {
	const started = performance.now();
	try {
		// one message per progress call is cheap (a few hundred in all); the main thread throttles the writes
		const results = runVerification({ onProgress: (progress) => post({ type: 'progress', progress }) });
		// NaN and Infinity become null in the stored JSON: send what will be stored
		post({ type: 'done', results: JSON.parse(JSON.stringify(results)) as VerificationResult[], wallTimeS: (performance.now() - started) / 1000 });
	} catch (e) {
		post({ type: 'error', message: e instanceof Error ? e.message : String(e) });
	}
});
