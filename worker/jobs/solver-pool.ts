/**
 * The worker process's solver threads, one per run slot, started with the process and reused run
 * after run. A thread that dies is replaced.
 */
import { Worker } from 'node:worker_threads';
import { Control, type ThreadData } from './solve-protocol.js';

export interface SolverThread {
	worker: Worker;
	control: Int32Array;
}

/** Start one thread. Under tsx the thread must register tsx's loader itself to import .ts files. */
function startThread(): SolverThread {
	const controlBuffer = new SharedArrayBuffer(4);
	const workerData: ThreadData = { control: controlBuffer };
	const entry = new URL(import.meta.url.endsWith('.ts') ? './solve-thread.ts' : './solve-thread.js', import.meta.url);
	let worker: Worker;
	if (entry.pathname.endsWith('.ts')) {
		const api = import.meta.resolve('tsx/esm/api');
		const code = `import(${JSON.stringify(api)}).then((m) => { m.register(); return import(${JSON.stringify(entry.href)}); })`;
		worker = new Worker(code, { eval: true, workerData });
	} else {
		worker = new Worker(entry, { workerData });
	}
	return { worker, control: new Int32Array(controlBuffer) };
}

export interface SolverPool {
	/** An idle thread (there is one per slot, so a handler always finds one), its control reset. */
	acquire(): SolverThread;
	release(t: SolverThread): void;
	/** Replace a thread that crashed or was terminated. */
	replace(t: SolverThread): void;
	close(): Promise<void>;
}

export function createSolverPool(size: number): SolverPool {
	const idle: SolverThread[] = [];
	const all = new Set<SolverThread>();
	const add = () => {
		const t = startThread();
		// an unexpected death is handled by the handler using it; an idle one is replaced here
		t.worker.on('exit', () => {
			all.delete(t);
			const i = idle.indexOf(t);
			if (i >= 0) {
				idle.splice(i, 1);
				if (!closed) add();
			}
		});
		t.worker.on('error', () => {});
		all.add(t);
		idle.push(t);
	};
	let closed = false;
	for (let i = 0; i < size; i++) add();
	return {
		acquire() {
			if (idle.length === 0) add();
			const t = idle.pop()!;
			Atomics.store(t.control, 0, Control.go);
			return t;
		},
		release(t) {
			if (all.has(t) && !closed) idle.push(t);
		},
		replace(t) {
			all.delete(t);
			void t.worker.terminate();
			if (!closed) add();
		},
		async close() {
			closed = true;
			await Promise.all([...all].map((t) => t.worker.terminate()));
		}
	};
}
