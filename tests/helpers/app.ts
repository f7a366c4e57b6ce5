/**
 * Serves the built app (`node build`) on a free loopback port for integration tests, against the
 * test database. Builds first when `build/` is stale (a lock keeps concurrent builds apart), and
 * starts an in-process fake SMTP server unless SMTP_PORT is already set by `npm test`.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildIfNeeded } from '../../scripts/twofold.mjs';
import { startMailCatcher, type MailCatcher } from '../../src/lib/server/mail/catcher.js';
import { prepareTestDatabase, testDatabaseUrl } from './env.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

export interface RunningApp {
	baseUrl: string;
	smtpPort: number;
	/** everything the app printed, for diagnosing a failing test */
	output(): string;
	stop(): Promise<void>;
	/** SIGKILL the app process (a crash) and wait for it to exit; `stop()` still closes the rest */
	kill(): Promise<void>;
}

export function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const srv = net.createServer();
		srv.once('error', reject);
		srv.listen(0, '127.0.0.1', () => {
			const address = srv.address();
			const port = typeof address === 'object' && address ? address.port : 0;
			srv.close(() => resolve(port));
		});
	});
}

/** Starts the app; pass extra environment (e.g. for a feature flag) in `env`, `port` to restart one on its old port. */
export async function startApp(options: { env?: Record<string, string>; port?: number } = {}): Promise<RunningApp> {
	await prepareTestDatabase();
	await buildIfNeeded();
	let catcher: MailCatcher | null = null;
	let smtpPort = Number(process.env.SMTP_PORT ?? 0);
	if (!smtpPort) {
		catcher = await startMailCatcher({ port: 0, databaseUrl: testDatabaseUrl() });
		smtpPort = catcher.port;
	}
	const port = options.port ?? (await freePort());
	const baseUrl = `http://127.0.0.1:${port}`;
	let log = '';
	const child: ChildProcess = spawn(process.execPath, ['build'], {
		cwd: ROOT,
		env: {
			...process.env,
			NODE_ENV: 'production',
			TWOFOLD_TEST: '1',
			DATABASE_URL: testDatabaseUrl(),
			AUTH_SECRET: process.env.AUTH_SECRET ?? 'test-secret-not-for-production-0123456789',
			ORIGIN: baseUrl,
			HOST: '127.0.0.1',
			PORT: String(port),
			SMTP_HOST: '127.0.0.1',
			SMTP_PORT: String(smtpPort),
			...options.env
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	// a test process that dies without its afterAll must not leave the app running
	const killOnExit = () => child.kill('SIGKILL');
	process.once('exit', killOnExit);
	child.once('exit', () => process.off('exit', killOnExit));
	child.stdout?.on('data', (d) => (log += d));
	child.stderr?.on('data', (d) => (log += d));
	const deadline = Date.now() + 30_000;
	for (;;) {
		if (child.exitCode !== null) throw new Error(`the app exited (${child.exitCode}):\n${log}`);
		try {
			const res = await fetch(`${baseUrl}/signin`, { redirect: 'manual' });
			if (res.status < 500) break;
		} catch {
			// not listening yet
		}
		if (Date.now() > deadline) {
			child.kill('SIGKILL');
			throw new Error(`the app did not answer within 30 s:\n${log}`);
		}
		await new Promise((r) => setTimeout(r, 100));
	}
	return {
		baseUrl,
		smtpPort,
		output: () => log,
		stop: async () => {
			if (child.exitCode === null && child.signalCode === null) {
				const exited = new Promise((r) => child.once('exit', r));
				child.kill('SIGTERM');
				await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
				if (child.exitCode === null) child.kill('SIGKILL');
			}
			await catcher?.close();
		},
		kill: async () => {
			if (child.exitCode !== null || child.signalCode !== null) return;
			const exited = new Promise((r) => child.once('exit', r));
			child.kill('SIGKILL');
			await exited;
		}
	};
}
