/**
 * Real worker processes for integration tests: `node --import tsx worker/index.ts` against the
 * test database, started and stopped (SIGTERM) or killed (SIGKILL) by the test, plus `waitFor`.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { RunningApp } from './app.js';
import { testDatabaseUrl } from './env.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

export interface WorkerProcess {
	child: ChildProcess;
	output(): string;
	/** SIGTERM and wait for the exit code */
	stop(): Promise<number | null>;
	/** SIGKILL and wait for the exit */
	kill(): Promise<void>;
}

export async function waitFor<T>(probe: () => T | Promise<T>, o: { timeoutMs?: number; what: string; everyMs?: number }): Promise<NonNullable<T>> {
	const deadline = Date.now() + (o.timeoutMs ?? 30_000);
	for (;;) {
		const v = await probe();
		if (v) return v as NonNullable<T>;
		if (Date.now() > deadline) throw new Error(`timed out waiting for ${o.what}`);
		await new Promise((r) => setTimeout(r, o.everyMs ?? 50));
	}
}

/**
 * Starts a worker with one slot (override with `env`); resolves once it works the queue.
 * `prefix` runs it through a command that execs it, e.g. `['ip', 'netns', 'exec', name]`.
 */
export async function startWorker(
	app: RunningApp,
	env: Record<string, string> = {},
	started?: WorkerProcess[],
	options: { prefix?: string[] } = {}
): Promise<WorkerProcess> {
	let log = '';
	// node itself with tsx's loader, not the tsx CLI: a SIGKILL must reach the worker, not a wrapper
	const command = [...(options.prefix ?? []), process.execPath, '--import', 'tsx', 'worker/index.ts'];
	const child = spawn(command[0], command.slice(1), {
		cwd: ROOT,
		env: {
			...process.env,
			DATABASE_URL: testDatabaseUrl(),
			SMTP_HOST: '127.0.0.1',
			SMTP_PORT: String(app.smtpPort),
			ORIGIN: app.baseUrl,
			TWOFOLD_WORKER_SLOTS: '1',
			TWOFOLD_WORKER_POLL_S: '0.5',
			TWOFOLD_CHECKPOINT_INTERVAL_S: '0.5',
			TWOFOLD_STALE_AFTER_S: '4',
			...env
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	child.stdout?.on('data', (d) => (log += d));
	child.stderr?.on('data', (d) => (log += d));
	const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
	const w: WorkerProcess = {
		child,
		output: () => log,
		async stop() {
			if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM');
			return exited;
		},
		async kill() {
			if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
			await exited;
		}
	};
	started?.push(w);
	await waitFor(() => log.includes('working solve-run') || child.exitCode !== null, { timeoutMs: 30_000, what: `worker start:\n${log}` });
	if (child.exitCode !== null) throw new Error(`worker exited at start:\n${log}`);
	return w;
}
