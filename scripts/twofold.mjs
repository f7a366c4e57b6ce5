#!/usr/bin/env node
// @ts-nocheck -- plain JavaScript run before any install; svelte-check would demand JSDoc types
/**
 * The two commands (and two more), dependency-free so they run on a fresh clone:
 *
 *   start   install deps if needed → PostgreSQL → migrate → seed once → mail catcher → build if
 *           needed → serve on 127.0.0.1 and run one worker process
 *   test    the same set-up on a clean `twofold_test` database → build → vitest → Playwright,
 *           closing with one line `N passed, N failed`
 *   bench   PostgreSQL + migrate, then `bench/index.ts`
 *   worker  PostgreSQL + migrate, then `worker/index.ts` (with DATABASE_URL set: that database as it
 *           is, for a worker on another machine than the app)
 *
 * Environment: PORT (app, default 5180), TWOFOLD_PG_PORT, TWOFOLD_PG_DATA (see scripts/pg.mjs),
 * SMTP_PORT (mail catcher for `start`, default 54325), TWOFOLD_TEST_DB (default twofold_test).
 */
import { spawn, spawnSync } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import * as pgc from './pg.mjs';

const ROOT = pgc.PROJECT_ROOT;
const LOCAL = path.join(ROOT, '.local');
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
const CHROMIUM = '/usr/lib/chromium/chromium';

function say(message) {
	process.stderr.write(`[twofold] ${message}\n`);
}

function seconds(t0) {
	return `${((Date.now() - t0) / 1000).toFixed(1)} s`;
}

/** Run a command to completion with inherited output; throws on failure unless allowFail. */
function run(cmd, args, { env = process.env, allowFail = false } = {}) {
	const r = spawnSync(cmd, args, { cwd: ROOT, stdio: 'inherit', env });
	if (r.error) throw r.error;
	if (r.status !== 0 && !allowFail) throw new Error(`${cmd} ${args.join(' ')} exited with ${r.status}`);
	return r.status ?? 1;
}

function npxBin(name) {
	return path.join(ROOT, 'node_modules', '.bin', name);
}

// ------------------------------------------------------------------ dependencies

function lockHash() {
	return createHash('sha256').update(fs.readFileSync(path.join(ROOT, 'package-lock.json'))).digest('hex');
}

/**
 * `npm ci` when node_modules is missing or the lock changed since the last install. A lock newer
 * than its stamp but older than npm's own record (`node_modules/.package-lock.json`) means someone
 * already ran `npm install` after changing it: no reinstall then, just a new stamp.
 */
function ensureDependencies() {
	const nm = path.join(ROOT, 'node_modules');
	const stamp = path.join(nm, '.twofold-lock-sha256');
	const hash = lockHash();
	if (fs.existsSync(nm) && fs.existsSync(stamp) && fs.readFileSync(stamp, 'utf8').trim() === hash) return;
	const npmRecord = path.join(nm, '.package-lock.json');
	const installedAfterLock =
		fs.existsSync(npmRecord) && fs.statSync(npmRecord).mtimeMs >= fs.statSync(path.join(ROOT, 'package-lock.json')).mtimeMs;
	if (!fs.existsSync(nm) || !installedAfterLock) {
		const t0 = Date.now();
		say('installing dependencies (npm ci)');
		run('npm', ['ci', '--no-audit', '--no-fund']);
		say(`dependencies installed in ${seconds(t0)}`);
	}
	fs.writeFileSync(stamp, hash);
}

// ------------------------------------------------------------------ configuration

/** A random AUTH_SECRET generated once per checkout into a git-ignored file. */
function authSecret() {
	if (process.env.AUTH_SECRET) return process.env.AUTH_SECRET;
	const file = path.join(LOCAL, 'auth-secret');
	fs.mkdirSync(LOCAL, { recursive: true });
	if (!fs.existsSync(file)) fs.writeFileSync(file, randomBytes(32).toString('base64url'), { mode: 0o600 });
	return fs.readFileSync(file, 'utf8').trim();
}

function freePort() {
	return new Promise((resolve, reject) => {
		const srv = net.createServer();
		srv.once('error', reject);
		srv.listen(0, '127.0.0.1', () => {
			const { port } = srv.address();
			srv.close(() => resolve(port));
		});
	});
}

function portFree(port) {
	return new Promise((resolve) => {
		const srv = net.createServer();
		srv.once('error', () => resolve(false));
		srv.listen(port, '127.0.0.1', () => srv.close(() => resolve(true)));
	});
}

async function setUpDatabase({ database, fresh }) {
	const t0 = Date.now();
	await pgc.start({ databases: [database] });
	if (fresh) pgc.recreateDatabase(database);
	const url = pgc.databaseUrl(database);
	run(process.execPath, [path.join(ROOT, 'scripts', 'migrate.mjs')], { env: { ...process.env, DATABASE_URL: url } });
	say(`database ${database} ready in ${seconds(t0)}`);
	return url;
}

/** The demo team (always) and, with `work`, its finished demo work (`npm start` only: tests ask for it themselves). */
function seed(env, { work = false } = {}) {
	run(npxBin('tsx'), ['src/lib/server/seed.ts', ...(work ? ['--with-work'] : [])], { env });
}

// ------------------------------------------------------------------ build

const SOURCE_ENTRIES = ['src', 'solver', 'static', 'package-lock.json', 'svelte.config.js', 'vite.config.ts', 'tailwind.config.ts'];

function newestMtime(entry) {
	const full = path.join(ROOT, entry);
	if (!fs.existsSync(full)) return 0;
	const st = fs.statSync(full);
	if (!st.isDirectory()) return st.mtimeMs;
	let newest = st.mtimeMs;
	for (const e of fs.readdirSync(full)) newest = Math.max(newest, newestMtime(path.join(entry, e)));
	return newest;
}

function buildIsFresh() {
	const marker = path.join(ROOT, 'build', 'handler.js');
	const sourceTime = Math.max(...SOURCE_ENTRIES.map(newestMtime));
	return fs.existsSync(marker) && fs.statSync(marker).mtimeMs > sourceTime;
}

export { authSecret };

/**
 * Runs `fn` holding the lock file `.local/<name>`: one holder per checkout at a time. A lock left
 * by a process that no longer exists is taken over. `onWait(holderPid)` is called once when the
 * lock is busy.
 */
async function withLockFile(name, { pollMs, onWait }, fn) {
	const lock = path.join(LOCAL, name);
	fs.mkdirSync(LOCAL, { recursive: true });
	let told = false;
	for (;;) {
		try {
			fs.writeFileSync(lock, String(process.pid), { flag: 'wx' });
			break;
		} catch (e) {
			if (e.code !== 'EEXIST') throw e;
			const holder = Number(fs.readFileSync(lock, 'utf8'));
			if (!pidAlive(holder)) {
				fs.rmSync(lock, { force: true });
				continue;
			}
			if (!told) onWait?.(holder);
			told = true;
			await new Promise((r) => setTimeout(r, pollMs));
		}
	}
	try {
		return await fn();
	} finally {
		fs.rmSync(lock, { force: true });
	}
}

/**
 * Builds when `build/` is missing or older than any source file. Returns true when it built.
 * The lock keeps two processes of one checkout from building into `build/` at once.
 */
export async function buildIfNeeded() {
	if (buildIsFresh()) return false;
	return withLockFile('build.lock', { pollMs: 500 }, async () => {
		// another process may have built while this one waited
		if (buildIsFresh()) return false;
		const t0 = Date.now();
		say('building the app (vite build)');
		run(npxBin('vite'), ['build', '--logLevel', 'error']);
		say(`built in ${seconds(t0)}`);
		return true;
	});
}

function pidAlive(pid) {
	if (!pid) return false;
	try {
		process.kill(pid, 0);
		return true;
	} catch {
		return false;
	}
}

// ------------------------------------------------------------------ child processes

const children = new Set();

function startChild(name, cmd, args, env) {
	const child = spawn(cmd, args, { cwd: ROOT, env, stdio: ['ignore', 'inherit', 'inherit'] });
	children.add(child);
	child.on('exit', (code, signal) => {
		children.delete(child);
		if (!shuttingDown) say(`${name} stopped (${signal ?? `exit ${code}`})`);
	});
	child.twofoldName = name;
	return child;
}

let shuttingDown = false;
function stopChildren() {
	shuttingDown = true;
	for (const c of children) c.kill('SIGTERM');
}

async function waitForHttp(url, timeoutMs) {
	const deadline = Date.now() + timeoutMs;
	for (;;) {
		try {
			const res = await fetch(url, { redirect: 'manual' });
			if (res.status < 500) return;
		} catch {
			// not up yet
		}
		if (Date.now() > deadline) throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
		await new Promise((r) => setTimeout(r, 150));
	}
}

async function waitForPort(port, timeoutMs) {
	const deadline = Date.now() + timeoutMs;
	while (await portFree(port)) {
		if (Date.now() > deadline) throw new Error(`nothing listens on port ${port} after ${timeoutMs / 1000} s`);
		await new Promise((r) => setTimeout(r, 100));
	}
}

// ------------------------------------------------------------------ commands

async function commandStart() {
	const t0 = Date.now();
	ensureDependencies();
	const databaseUrl = await setUpDatabase({ database: 'twofold', fresh: false });
	const port = Number(process.env.PORT ?? 5180);
	const smtpPort = Number(process.env.SMTP_PORT ?? 54325);
	if (!(await portFree(port))) throw new Error(`port ${port} is taken: set PORT to a free port`);
	const origin = process.env.ORIGIN ?? `http://127.0.0.1:${port}`;
	const env = {
		...process.env,
		NODE_ENV: 'production',
		DATABASE_URL: databaseUrl,
		AUTH_SECRET: authSecret(),
		AUTH_URL: `${origin}/auth`,
		ORIGIN: origin,
		HOST: '127.0.0.1',
		PORT: String(port),
		SMTP_HOST: '127.0.0.1',
		SMTP_PORT: String(smtpPort)
	};
	seed(env, { work: true });
	if (await portFree(smtpPort)) {
		startChild('mail catcher', npxBin('tsx'), ['src/lib/server/mail/catcher.ts'], env);
		await waitForPort(smtpPort, 20_000);
	} else {
		say(`port ${smtpPort} already answers: using the mail catcher there`);
	}
	await buildIfNeeded();
	const app = startChild('app', process.execPath, ['build'], env);
	app.on('exit', () => {
		if (!shuttingDown) {
			stopChildren();
			process.exitCode = 1;
		}
	});
	await waitForHttp(`${origin}/signin`, 30_000);
	if (fs.existsSync(path.join(ROOT, 'worker', 'index.ts'))) {
		// the worker queues the solver's verification of its version when none is cached (the Verification page)
		startChild('worker', npxBin('tsx'), ['worker/index.ts'], { ...env, TWOFOLD_VERIFY_AT_START: '1' });
	} else {
		say('no worker/index.ts yet: runs will wait in the queue');
	}
	const { DEMO_USERS, DEMO_PASSWORD } = await demoCredentials();
	console.log(`\nTwofold is running at ${origin}  (ready in ${seconds(t0)}; Ctrl+C stops it)\n`);
	console.log('Demo sign-ins (local only), password for all:', DEMO_PASSWORD);
	for (const u of DEMO_USERS) console.log(`  ${u.role.padEnd(8)} ${u.email}`);
	console.log('');
	for (const sig of ['SIGINT', 'SIGTERM']) {
		process.on(sig, () => {
			say('stopping');
			stopChildren();
			setTimeout(() => process.exit(0), 3000).unref();
		});
	}
}

/** The demo sign-ins, read from the seed module's source (this script imports no TypeScript). */
async function demoCredentials() {
	const src = fs.readFileSync(path.join(ROOT, 'src/lib/server/seed.ts'), 'utf8');
	const DEMO_PASSWORD = /DEMO_PASSWORD = '([^']+)'/.exec(src)?.[1] ?? '?';
	const DEMO_USERS = [...src.matchAll(/\{ role: '(\w+)', email: '([^']+)'/g)].map((m) => ({ role: m[1], email: m[2] }));
	return { DEMO_USERS, DEMO_PASSWORD };
}

/**
 * Concurrent `npm test` runs in one checkout would drop each other's database and build:
 * a lock file makes them take turns.
 */
function withTestLock(fn) {
	return withLockFile('test-run.lock', {
		pollMs: 1000,
		onWait: (holder) => say(`another test run (pid ${holder}) is using this checkout: waiting for it`)
	}, fn);
}

function ensureChromium() {
	if (fs.existsSync(CHROMIUM) && fs.existsSync('/usr/bin/pdftotext')) return true;
	if (!isRoot) {
		say(`Chromium (${CHROMIUM}) or pdftotext is missing: install them with  sudo apt-get install -y chromium poppler-utils`);
		return false;
	}
	const t0 = Date.now();
	say('installing Debian chromium for the browser tests');
	const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
	run('apt-get', ['update', '-qq'], { env });
	// poppler-utils: the printable-report test reads its PDF back with pdftotext
	run('apt-get', ['install', '-y', '-qq', 'chromium', 'poppler-utils'], { env });
	say(`chromium installed in ${seconds(t0)}`);
	return fs.existsSync(CHROMIUM);
}

function readJson(file) {
	try {
		return JSON.parse(fs.readFileSync(file, 'utf8'));
	} catch {
		return null;
	}
}

/** Counts from vitest's JSON report. */
function vitestCounts(file) {
	const r = readJson(file);
	if (!r) return null;
	return { passed: r.numPassedTests ?? 0, failed: (r.numFailedTests ?? 0) + (r.numRuntimeErrorTestSuites ?? 0), skipped: (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0) };
}

/** Counts from Playwright's JSON report. */
function playwrightCounts(file) {
	const r = readJson(file);
	if (!r?.stats) return null;
	const s = r.stats;
	return { passed: (s.expected ?? 0) + (s.flaky ?? 0), failed: s.unexpected ?? 0, skipped: s.skipped ?? 0 };
}

async function commandTest(extraArgs) {
	const t0 = Date.now();
	ensureDependencies();
	return withTestLock(async () => {
		const database = process.env.TWOFOLD_TEST_DB ?? 'twofold_test';
		const databaseUrl = await setUpDatabase({ database, fresh: true });
		const smtpPort = await freePort();
		// no NODE_ENV here: vitest sets its own; the app processes the tests start get 'production'
		const env = {
			...process.env,
			TWOFOLD_TEST: '1',
			DATABASE_URL: databaseUrl,
			AUTH_SECRET: authSecret(),
			SMTP_HOST: '127.0.0.1',
			SMTP_PORT: String(smtpPort)
		};
		seed(env);
		startChild('mail catcher', npxBin('tsx'), ['src/lib/server/mail/catcher.ts'], env);
		await waitForPort(smtpPort, 20_000);
		// the integration tests serve the built app, so build before them
		await buildIfNeeded();

		const reports = path.join(LOCAL, 'reports');
		fs.mkdirSync(reports, { recursive: true });
		const vitestReport = path.join(reports, 'vitest.json');
		const playwrightReport = path.join(reports, 'playwright.json');
		fs.rmSync(vitestReport, { force: true });
		fs.rmSync(playwrightReport, { force: true });

		say('unit and integration tests (vitest)');
		const vitestStatus = run(
			npxBin('vitest'),
			['run', '--reporter=default', '--reporter=json', `--outputFile.json=${vitestReport}`, ...extraArgs],
			{ env, allowFail: true }
		);
		const totals = { passed: 0, failed: 0, skipped: 0 };
		const v = vitestCounts(vitestReport);
		if (v) for (const k of Object.keys(totals)) totals[k] += v[k];
		if (vitestStatus !== 0 && (!v || v.failed === 0)) totals.failed += 1; // a crash that reported no failing test

		const e2eDir = path.join(ROOT, 'tests', 'e2e');
		const hasE2e = fs.existsSync(e2eDir) && fs.readdirSync(e2eDir).some((f) => /\.(spec|test)\.ts$/.test(f));
		if (hasE2e && extraArgs.length === 0) {
			if (ensureChromium()) {
				say('browser tests (Playwright, Debian chromium)');
				const pwStatus = run(npxBin('playwright'), ['test', '--reporter=list,json'], {
					env: { ...env, PLAYWRIGHT_JSON_OUTPUT_NAME: playwrightReport, TWOFOLD_E2E_PORT: String(await freePort()) },
					allowFail: true
				});
				const p = playwrightCounts(playwrightReport);
				if (p) for (const k of Object.keys(totals)) totals[k] += p[k];
				if (pwStatus !== 0 && (!p || p.failed === 0)) totals.failed += 1;
			} else {
				totals.failed += 1;
			}
		}
		stopChildren();
		say(`test run took ${seconds(t0)}`);
		console.log(`${totals.passed} passed, ${totals.failed} failed${totals.skipped ? `, ${totals.skipped} skipped` : ''}`);
		return totals.failed === 0 && totals.passed > 0 ? 0 : 1;
	});
}

async function commandBench(extraArgs) {
	ensureDependencies();
	const databaseUrl = await setUpDatabase({ database: 'twofold', fresh: false });
	return run(npxBin('tsx'), ['bench/index.ts', ...extraArgs], { env: { ...process.env, DATABASE_URL: databaseUrl }, allowFail: true });
}

/**
 * With DATABASE_URL set (a worker on another machine than the app), the worker uses that database
 * as it is: no local cluster, no migration (the app's `npm start` migrates its own database).
 */
async function commandWorker(extraArgs) {
	ensureDependencies();
	const databaseUrl = process.env.DATABASE_URL || (await setUpDatabase({ database: 'twofold', fresh: false }));
	const smtpPort = process.env.SMTP_PORT ?? '54325';
	const env = { ...process.env, DATABASE_URL: databaseUrl, SMTP_HOST: process.env.SMTP_HOST ?? '127.0.0.1', SMTP_PORT: smtpPort };
	const child = startChild('worker', npxBin('tsx'), ['worker/index.ts', ...extraArgs], env);
	for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => child.kill(sig));
	return new Promise((resolve) => child.on('exit', (code) => resolve(code ?? 1)));
}

async function main() {
	const [command, ...rest] = process.argv.slice(2);
	try {
		switch (command) {
			case 'start':
				await commandStart();
				return;
			case 'test':
				process.exitCode = await commandTest(rest);
				return;
			case 'bench':
				process.exitCode = await commandBench(rest);
				return;
			case 'worker':
				process.exitCode = await commandWorker(rest);
				return;
			default:
				console.error('usage: node scripts/twofold.mjs start | test [vitest args] | bench | worker');
				process.exitCode = 2;
		}
	} catch (e) {
		say(`failed: ${e.message}`);
		stopChildren();
		if (command === 'test') console.log('0 passed, 1 failed');
		process.exitCode = 1;
	}
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) main();
