/**
 * The worker registry and the admin's Workers page, end to end: two real worker processes posing
 * as two machines (`TWOFOLD_WORKER_HOST`), the built app, real PostgreSQL. Also the team's cap on
 * the runs of one study, set by an admin on the Team page.
 *
 * The app is started with a lost threshold of a few seconds (`TWOFOLD_WORKER_LOST_AFTER_S`, read
 * only under `TWOFOLD_TEST=1`) instead of 15 s, so the killed worker shows as lost quickly.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, inArray } from 'drizzle-orm';
import { startApp, type RunningApp } from '../helpers/app.js';
import { openTestDb } from '../helpers/db.js';
import { testDatabaseUrl } from '../helpers/env.js';
import { TestClient, signedInClient } from '../helpers/http.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { auditLog, cases, columns, runs, teams, workers } from '../../src/lib/server/db/schema.js';
import { SOLVER_VERSION } from '../../solver/version.js';
import { defaultCase } from '../../solver/index.js';
import type { WorkersOverview } from '../../src/lib/server/workers.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const LOST_AFTER_S = 3;

interface WorkerProcess {
	child: ChildProcess;
	output(): string;
	/** the worker's id (host:pid:random), read from its log */
	id: string;
	exited: Promise<number | null>;
}

const started: WorkerProcess[] = [];

async function startWorker(app: RunningApp, host: string): Promise<WorkerProcess> {
	let log = '';
	// node itself with tsx's loader, not the tsx CLI: a SIGKILL must reach the worker, not a wrapper
	const child = spawn(process.execPath, ['--import', 'tsx', 'worker/index.ts'], {
		cwd: ROOT,
		env: {
			...process.env,
			DATABASE_URL: testDatabaseUrl(),
			SMTP_HOST: '127.0.0.1',
			SMTP_PORT: String(app.smtpPort),
			ORIGIN: app.baseUrl,
			TWOFOLD_WORKER_HOST: host,
			TWOFOLD_WORKER_SLOTS: '1',
			TWOFOLD_WORKER_POLL_S: '0.5'
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	child.stdout?.on('data', (d) => (log += d));
	child.stderr?.on('data', (d) => (log += d));
	const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
	const w: WorkerProcess = { child, output: () => log, id: '', exited };
	started.push(w);
	await waitFor(() => log.includes('working solve-run'), { timeoutMs: 60_000, what: `worker on ${host} to start:\n${log}` });
	const m = /\[worker ([^\]]+)\]/.exec(log);
	if (!m) throw new Error(`no worker id in the log:\n${log}`);
	w.id = m[1];
	return w;
}

async function waitFor<T>(probe: () => T | Promise<T>, o: { timeoutMs?: number; what: string; everyMs?: number }): Promise<NonNullable<T>> {
	const deadline = Date.now() + (o.timeoutMs ?? 30_000);
	for (;;) {
		const v = await probe();
		if (v) return v as NonNullable<T>;
		if (Date.now() > deadline) throw new Error(`timed out waiting for ${o.what}`);
		await new Promise((r) => setTimeout(r, o.everyMs ?? 100));
	}
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

let app: RunningApp;
let handle: DbHandle;
let t: TestTeam;
let admin: TestClient;
let lead: TestClient;
let analyst: TestClient;
let machineA: WorkerProcess;
let machineB: WorkerProcess;

async function workerRow(id: string) {
	const [row] = await handle.db.select().from(workers).where(eq(workers.id, id));
	return row;
}

async function overview(): Promise<WorkersOverview> {
	const res = await admin.get('/team/workers/status', { accept: 'application/json' });
	expect(res.status).toBe(200);
	return (await res.json()) as WorkersOverview;
}

/** The state the Workers page (server-rendered HTML) shows for one worker. */
async function stateOnPage(id: string): Promise<string | null> {
	const res = await admin.get('/team/workers');
	expect(res.status).toBe(200);
	const html = await res.text();
	const tag = new RegExp(`<span[^>]*data-worker="${id.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}"[^>]*>`).exec(html);
	return tag ? (/data-state="(\w+)"/.exec(tag[0])?.[1] ?? null) : null;
}

beforeAll(async () => {
	handle = await openTestDb();
	app = await startApp({ env: { TWOFOLD_WORKER_LOST_AFTER_S: String(LOST_AFTER_S) } });
	// both workers boot (seconds under tsx) while the team and the sign-ins are made
	const a = startWorker(app, 'machine-a');
	const b = startWorker(app, 'machine-b');
	a.catch(() => {});
	b.catch(() => {});
	t = await createTestTeam({ db: handle.db, name: 'Workers team' });
	admin = await signedInClient(app.baseUrl, t.members.admin);
	lead = await signedInClient(app.baseUrl, t.members.lead);
	analyst = await signedInClient(app.baseUrl, t.members.analyst);
	[machineA, machineB] = await Promise.all([a, b]);
}, 240_000);

afterAll(async () => {
	for (const w of started) if (w.child.exitCode === null && w.child.signalCode === null) w.child.kill('SIGKILL');
	await Promise.all(started.map((w) => w.exited));
	const ids = started.map((w) => w.id).filter(Boolean);
	if (ids.length && handle) await handle.db.delete(workers).where(inArray(workers.id, ids));
	await app?.stop();
	await handle?.close();
});

describe('worker registry', () => {
	it('registers each worker with its host, slots and solver version, and keeps its heartbeat fresh', async () => {
		for (const [w, host] of [
			[machineA, 'machine-a'],
			[machineB, 'machine-b']
		] as const) {
			expect(w.id.startsWith(`${host}:${w.child.pid}:`), w.id).toBe(true);
			const row = await workerRow(w.id);
			expect(row, w.output()).toBeDefined();
			expect(row).toMatchObject({ host, pid: w.child.pid, slots: 1, solverVersion: SOLVER_VERSION, stoppedAt: null });
			// runs left queued by other test files may keep a slot busy
			expect(row.activeRuns).toBeGreaterThanOrEqual(0);
			expect(row.activeRuns).toBeLessThanOrEqual(1);
		}
		const before = await Promise.all([workerRow(machineA.id), workerRow(machineB.id)]);
		await sleep(2600);
		const after = await Promise.all([workerRow(machineA.id), workerRow(machineB.id)]);
		for (let i = 0; i < 2; i++) expect(after[i].heartbeatAt.getTime()).toBeGreaterThan(before[i].heartbeatAt.getTime());

		// the admin's page lists both as live, with the queue by solver version
		expect(await stateOnPage(machineA.id)).toBe('live');
		expect(await stateOnPage(machineB.id)).toBe('live');
		const o = await overview();
		const mine = o.workers.filter((w) => w.id === machineA.id || w.id === machineB.id);
		expect(mine.map((w) => w.state)).toEqual(['live', 'live']);
		expect(mine.every((w) => w.heartbeatAgeS >= 0 && w.heartbeatAgeS < LOST_AFTER_S)).toBe(true);
		const version = o.versions.find((v) => v.solverVersion === SOLVER_VERSION);
		expect(version?.liveWorkers).toBeGreaterThanOrEqual(2);
		expect(version?.stranded).toBe(false);
		expect(o.team).toEqual({ queued: 0, running: 0 });
	});

	it('counts a run a worker worked in its runs done once the run ends', async () => {
		const doneBefore = new Map([machineA, machineB].map((w) => [w.id, 0]));
		for (const w of [machineA, machineB]) doneBefore.set(w.id, (await workerRow(w.id)).runsDone);
		const [col] = await handle.db.insert(columns).values({ teamId: t.team.id, tag: 'W-1', diameterM: 0.2, heightM: 1 }).returning({ id: columns.id });
		const doc = defaultCase('height-profile');
		doc.name = 'small';
		doc.geometry.heightM = 1;
		doc.geometry.clearLiquidLevelM = 0.7;
		doc.numerics.cells = 40;
		doc.numerics.endTimeS = 60;
		const [c] = await handle.db
			.insert(cases)
			.values({ teamId: t.team.id, columnId: col.id, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc })
			.returning({ id: cases.id });
		const res = await analyst.postJson('/runs', { caseId: c.id });
		expect(res.status, await res.clone().text()).toBe(201);
		const runId = ((await res.json()) as { run: { id: string } }).run.id;
		const ended = await waitFor(
			async () => {
				const [r] = await handle.db.select().from(runs).where(eq(runs.id, runId));
				return ['converged', 'finished', 'failed', 'cancelled'].includes(r.status) ? r : null;
			},
			{ timeoutMs: 90_000, what: `run ${runId} to end:\n${machineA.output()}\n${machineB.output()}` }
		);
		expect(ended.status).toBe('converged');
		expect(ended.solverVersion).toBe(SOLVER_VERSION);
		// the worker that ran it (normally one of the two here) counts it within a heartbeat
		const by = ended.workerId as string;
		await waitFor(async () => (await workerRow(by)).runsDone > (doneBefore.get(by) ?? 0), { timeoutMs: 10_000, what: `runs_done of ${by}` });
		const o = await overview();
		expect(o.workers.find((w) => w.id === by)?.runsDone).toBeGreaterThanOrEqual(1);
	}, 120_000);

	it('marks a worker stopped on SIGTERM, and shows a killed one as lost once it has been silent too long', async () => {
		machineA.child.kill('SIGTERM');
		expect(await machineA.exited, machineA.output()).toBe(0);
		const stopped = await workerRow(machineA.id);
		expect(stopped.stoppedAt).toBeInstanceOf(Date);
		expect(stopped.activeRuns).toBe(0);
		expect(await stateOnPage(machineA.id)).toBe('stopped');

		machineB.child.kill('SIGKILL');
		await machineB.exited;
		const last = (await workerRow(machineB.id)).heartbeatAt.getTime();
		// not stopped cleanly: live until the threshold passes, then lost
		await waitFor(async () => (await stateOnPage(machineB.id)) === 'lost', { timeoutMs: 30_000, what: 'the killed worker to show as lost' });
		const killed = await workerRow(machineB.id);
		expect(killed.stoppedAt).toBeNull();
		expect(killed.heartbeatAt.getTime()).toBe(last);
		const o = await overview();
		const row = o.workers.find((w) => w.id === machineB.id);
		expect(row?.state).toBe('lost');
		expect(row?.heartbeatAgeS).toBeGreaterThan(LOST_AFTER_S);
		expect(o.workers.find((w) => w.id === machineA.id)?.state).toBe('stopped');
	}, 60_000);

	it('keeps the page and its data to admins', async () => {
		expect((await lead.get('/team/workers')).status).toBe(403);
		expect((await lead.get('/team/workers/status', { accept: 'application/json' })).status).toBe(403);
		expect((await analyst.get('/team/workers')).status).toBe(403);
		const anonymous = await new TestClient(app.baseUrl).get('/team/workers');
		expect(anonymous.status).toBe(303);
		expect(anonymous.headers.get('location')).toContain('/signin');
		expect((await new TestClient(app.baseUrl).get('/team/workers/status', { accept: 'application/json' })).status).toBe(401);
		// the team page links it for admins only
		expect(await (await admin.get('/team')).text()).toContain('href="/team/workers"');
		expect(await (await lead.get('/team')).text()).not.toContain('href="/team/workers"');
	});
});

describe('runs per study, at most', () => {
	const cap = async () => (await handle.db.select({ n: teams.maxStudyRuns }).from(teams).where(eq(teams.id, t.team.id)))[0].n;

	it('refuses 0 and 1001 beside the field, accepts 250, and audits the change', async () => {
		const start = await cap();
		for (const [value, message] of [
			['0', 'At least 1 run.'],
			['1001', 'At most 1000 runs.'],
			['12.5', 'Enter a whole number of runs.']
		]) {
			const res = await admin.post('/team?/studyRuns', { maxStudyRuns: value });
			expect(res.status, value).toBe(400);
			const html = await res.text();
			expect(html).toContain('id="field-maxStudyRuns-error"');
			expect(html).toContain(message);
			expect(html).toContain(`value="${value}"`);
			expect(await cap()).toBe(start);
		}
		const ok = await admin.post('/team?/studyRuns', { maxStudyRuns: '250' });
		expect(ok.status).toBe(200);
		expect(await ok.text()).toContain('at most 250 runs per study');
		expect(await cap()).toBe(250);
		const lines = await handle.db
			.select()
			.from(auditLog)
			.where(and(eq(auditLog.teamId, t.team.id), eq(auditLog.action, 'team.maxStudyRuns')));
		expect(lines).toHaveLength(1);
		expect(lines[0]).toMatchObject({ userId: t.members.admin.id, detail: { from: start, to: 250 } });
		// the team page shows the stored value
		expect(await (await admin.get('/team')).text()).toContain('value="250"');
	});

	it('lets only admins change it', async () => {
		expect((await lead.post('/team?/studyRuns', { maxStudyRuns: '5' })).status).toBe(403);
		expect(await cap()).toBe(250);
	});
});
