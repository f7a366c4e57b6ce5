/**
 * A solver thread: one per run slot of the worker process, kept for the life of the process so a
 * run starts stepping at once (loading the solver costs seconds under tsx). Several slots use
 * several cores while the process's main thread stays free for database writes and heartbeats.
 *
 * For each run request it drives the simulation and posts, in this order whenever due: residual
 * rows (every ~`flushIntervalMs` of wall time), a snapshot (each time simulated time passes the
 * next multiple of the case's snapshot interval), a checkpoint (every `checkpointIntervalS` of wall
 * time) and, last, `ended`, `stopped` or `error`. Residuals are always posted before the snapshot,
 * checkpoint or end that follows them, so the main thread can store a checkpoint together with
 * every residual row up to its step.
 *
 * The main thread steers through the shared control word, read between two steps (a thread busy
 * stepping does not read its message queue).
 */
import { parentPort, workerData } from 'node:worker_threads';
import { createSimulation } from '../../solver/index.js';
import { encodeCheckpoint, encodeSnapshot, decodeCheckpoint } from '../../src/lib/server/runs/codec.js';
import { Control, storesResidualStep, type ResidualRow, type RunRequest, type ThreadData, type ThreadMessage } from './solve-protocol.js';

const port = parentPort!;
const control = new Int32Array((workerData as ThreadData).control);

type Body = ThreadMessage extends infer M ? (M extends unknown ? Omit<M, 'seq'> : never) : never;

function run(req: RunRequest) {
	const post = (m: Body) => port.postMessage({ ...m, seq: req.seq });
	let step = 0;
	let timeS = 0;
	try {
		const sim = createSimulation(req.caseDoc);
		const intervalS = req.caseDoc.numerics.snapshotIntervalS;
		let nextSnapshotIndex = 1;
		let baseWallTimeS = 0;
		if (req.checkpoint) {
			const stored = decodeCheckpoint(req.checkpoint);
			sim.restore(stored.solver);
			nextSnapshotIndex = stored.nextSnapshotIndex;
			baseWallTimeS = stored.wallTimeS;
		}
		step = sim.state.step;
		timeS = sim.state.timeS;
		const startedMs = performance.now();
		const wallTimeS = () => baseWallTimeS + (performance.now() - startedMs) / 1000;

		let rows: ResidualRow[] = [];
		let lastFlushMs = startedMs;
		let lastCheckpointMs = startedMs;
		// posted even without rows: the main thread learns the step and time for the progress display
		const flush = () => {
			post({ type: 'residuals', rows, step: sim.state.step, timeS: sim.state.timeS });
			rows = [];
			lastFlushMs = performance.now();
		};
		const checkpoint = () => {
			flush();
			const wall = wallTimeS();
			const bytes = encodeCheckpoint({ solver: sim.checkpoint(), nextSnapshotIndex, wallTimeS: wall });
			post({ type: 'checkpoint', step: sim.state.step, timeS: sim.state.timeS, bytes, wallTimeS: wall });
			lastCheckpointMs = performance.now();
		};

		for (;;) {
			const c = Atomics.load(control, 0);
			if (c === Control.checkpointAndStop) {
				checkpoint();
				post({ type: 'stopped', step: sim.state.step, timeS: sim.state.timeS, wallTimeS: wallTimeS() });
				return;
			}
			if (c === Control.stop) {
				flush();
				post({ type: 'stopped', step: sim.state.step, timeS: sim.state.timeS, wallTimeS: wallTimeS() });
				return;
			}

			const status = sim.step();
			step = sim.state.step;
			timeS = sim.state.timeS;
			const ended = status.status !== 'running';
			if (ended || storesResidualStep(step)) rows.push({ step, timeS, values: { ...sim.residuals() }, atMs: Date.now() });

			if (ended) {
				flush();
				const { profiles, ...summary } = sim.results();
				post({
					type: 'ended',
					status: summary.status,
					message: summary.message ?? status.message,
					step,
					timeS,
					summary: JSON.parse(JSON.stringify(summary)) as Record<string, unknown>,
					finalSnapshot: encodeSnapshot(profiles ?? sim.snapshot(), { precision: 'float64' }),
					wallTimeS: wallTimeS()
				});
				return;
			}

			// one snapshot when simulated time passes the next multiple of the interval (a long
			// step may pass several: they are not repeated)
			if (timeS >= nextSnapshotIndex * intervalS * (1 - 1e-12)) {
				flush();
				post({ type: 'snapshot', step, timeS, bytes: encodeSnapshot(sim.snapshot(), { precision: 'float32' }) });
				nextSnapshotIndex = Math.floor((timeS / intervalS) * (1 + 1e-12)) + 1;
			}

			// a paced run (tests, demos) waits on the control word, so a stop request still ends the pause at once
			if (req.stepPauseMs > 0) Atomics.wait(control, 0, Control.go, req.stepPauseMs);

			const now = performance.now();
			if (now - lastCheckpointMs >= req.checkpointIntervalS * 1000) checkpoint();
			else if (now - lastFlushMs >= req.flushIntervalMs) flush();
		}
	} catch (e) {
		const err = e as Error;
		post({ type: 'error', message: err?.message ?? String(e), step, timeS });
	}
}

port.on('message', (req: RunRequest) => {
	if (req?.type === 'run') run(req);
});
