/**
 * The database side of a run failing under it, on a PostgreSQL cluster of this file's own (own
 * port and data folder; the shared cluster of the other tests is never touched):
 *
 * - PostgreSQL restarts mid-run: the app and the worker reconnect by themselves, the run resumes
 *   from its checkpoint, live streams resume after Last-Event-ID, no row lost or doubled;
 * - a worker's machine drops off the network mid-run (a network namespace joined by a veth pair,
 *   the link taken down): another worker takes the run over and finishes it, and when the lost
 *   worker's network comes back it writes nothing more. Needs root and namespaces; skipped with
 *   the reason otherwise.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, inArray, sql } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { cases, checkpoints, columns, residuals, runs, snapshots, teams } from '../../src/lib/server/db/schema.js';
import { encodeSnapshot } from '../../src/lib/server/runs/codec.js';
import type { CaseDocument } from '../../solver/index.js';
import { openTestDb } from '../helpers/db.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { signedInClient, type TestClient } from '../helpers/http.js';
import { startWorker, waitFor, type WorkerProcess } from '../helpers/workers.js';
import { startPrivateCluster, type PrivateCluster } from '../helpers/private-pg.js';
import { createTestNetwork, probeNetns, type TestNetwork } from '../helpers/netns.js';
import { ENDED, SseFollower, expectedSteps, getRunRow, referenceCase, smallCase, solveHere, storedSnapshots, storedSteps, waitForStatus } from '../helpers/runs.js';

// probed at load time, so that the skip can say why
const netnsProblem = probeNetns();

let cluster: PrivateCluster;
let network: TestNetwork | null = null;
let handle: DbHandle;
let app: RunningApp;
let team: TestTeam;
let columnId: string;
let analyst: TestClient;
let viewer: TestClient;
const workers: WorkerProcess[] = [];
const savedUrl = process.env.DATABASE_URL;
const cookieOf = (c: TestClient) => [...c.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
const logs = () => workers.map((w) => w.output()).join('\n');

async function queue(doc: CaseDocument): Promise<string> {
	const [row] = await handle.db
		.insert(cases)
		.values({ teamId: team.team.id, columnId, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc })
		.returning({ id: cases.id });
	const res = await analyst.postJson('/runs', { caseId: row.id });
	expect(res.status, await res.clone().text()).toBe(201);
	return ((await res.json()) as { run: { id: string } }).run.id;
}

async function ended(runId: string, timeoutMs = 90_000) {
	try {
		return await waitForStatus(handle.db, runId, ENDED, timeoutMs);
	} catch (e) {
		throw new Error(`${(e as Error).message}\n--- workers:\n${logs().slice(-8000)}`);
	}
}

async function checkpointPast(runId: string, step: number) {
	return waitFor(
		async () => {
			const [row] = await handle.db.select({ step: checkpoints.step }).from(checkpoints).where(eq(checkpoints.runId, runId));
			return row && row.step > step ? row : null;
		},
		{ what: `a checkpoint of run ${runId} past step ${step}`, timeoutMs: 60_000, everyMs: 20 }
	);
}

/** Residual rows, snapshots and the run row: what a stray write would change. */
async function runFingerprint(runId: string) {
	const [r] = await handle.db.select({ n: sql<number>`count(*)::int`, sum: sql<string>`md5(string_agg(${residuals.values}::text, ',' order by ${residuals.step}))` }).from(residuals).where(eq(residuals.runId, runId));
	const [s] = await handle.db.select({ n: sql<number>`count(*)::int`, sum: sql<string>`md5(string_agg(encode(${snapshots.data}, 'hex'), ',' order by ${snapshots.step}))` }).from(snapshots).where(eq(snapshots.runId, runId));
	const run = await getRunRow(handle.db, runId);
	return { residuals: r, snapshots: s, status: run.status, steps: run.steps, workerId: run.workerId, attempts: run.attempts, finishedAt: run.finishedAt?.toISOString() };
}

/** The checks every interrupted run must pass: the results of an uninterrupted one, every row once. */
async function expectSameAsUninterrupted(runId: string, doc: CaseDocument, reference: ReturnType<typeof solveHere>) {
	const done = await getRunRow(handle.db, runId);
	expect(done.status, logs()).toBe(reference.results.status);
	const { profiles, ...summary } = reference.results;
	expect(done.summary).toEqual(JSON.parse(JSON.stringify(summary)));
	const steps = await storedSteps(handle.db, runId);
	expect(steps).toEqual(expectedSteps(reference.results.step));
	const rows = await handle.db.select().from(residuals).where(eq(residuals.runId, runId));
	for (const row of rows) expect(row.values, `step ${row.step}`).toEqual(reference.residualsByStep.get(row.step));
	const snaps = await storedSnapshots(handle.db, runId);
	expect(new Set(snaps.map((s) => s.step)).size, 'no snapshot stored twice').toBe(snaps.length);
	expect(snaps.length).toBeGreaterThanOrEqual(Math.floor(reference.results.timeS / doc.numerics.snapshotIntervalS));
	expect(snaps.filter((s) => s.isFinal)).toHaveLength(1);
	expect(Buffer.compare(snaps[snaps.length - 1].data, Buffer.from(encodeSnapshot(profiles)))).toBe(0);
	return { done, steps };
}

beforeAll(async () => {
	if (!netnsProblem) network = createTestNetwork();
	cluster = await startPrivateCluster({
		databases: ['twofold_fault'],
		listen: network ? [network.hostIp] : [],
		hba: network ? [`host all all ${network.subnet} scram-sha-256`] : []
	});
	// everything in this file (helpers, app, workers) uses the private cluster
	process.env.DATABASE_URL = cluster.url('twofold_fault');
	handle = await openTestDb();
	app = await startApp();
	team = await createTestTeam({ db: handle.db, name: 'Database faults team' });
	await handle.db.update(teams).set({ maxActiveRuns: 50 }).where(eq(teams.id, team.team.id));
	const [col] = await handle.db.insert(columns).values({ teamId: team.team.id, tag: 'PG-1', diameterM: 0.2, heightM: 2 }).returning({ id: columns.id });
	columnId = col.id;
	analyst = await signedInClient(app.baseUrl, team.members.analyst);
	viewer = await signedInClient(app.baseUrl, team.members.viewer);
}, 180_000);

afterAll(async () => {
	await Promise.all(workers.map((w) => w.kill()));
	await app?.stop();
	await handle?.close().catch(() => {});
	cluster?.destroy();
	network?.destroy();
	if (savedUrl === undefined) delete process.env.DATABASE_URL;
	else process.env.DATABASE_URL = savedUrl;
});

describe('PostgreSQL restarts mid-run', () => {
	it('the worker and the app reconnect, the run resumes from its checkpoint, streams resume after Last-Event-ID, nothing lost or doubled', async () => {
		const worker = await startWorker(app, { TWOFOLD_WORKER_STEP_PAUSE_MS: '10' }, workers);
		const doc = referenceCase('postgres restart');
		const reference = solveHere(doc);
		const runId = await queue(doc);
		const follow = () => new SseFollower({ baseUrl: app.baseUrl, path: `/runs/${runId}/events`, cookie: cookieOf(viewer), retryMs: 300 });
		const staying = [follow(), follow(), follow()];
		const dropping = follow();
		await checkpointPast(runId, reference.results.step / 4);

		// the stream of one client drops just as the server goes away; it retries (refused while the
		// database is down) until it is served again, sending the last id it saw
		dropping.drop();
		cluster.stop();
		await new Promise((r) => setTimeout(r, 3000));
		expect(worker.child.exitCode, worker.output()).toBe(null);
		cluster.start();

		await ended(runId);
		await Promise.all([...staying, dropping].map((f) => f.done));
		const { done, steps } = await expectSameAsUninterrupted(runId, doc, reference);
		expect(done.attempts, worker.output()).toBeGreaterThanOrEqual(2);
		expect(worker.output()).toContain(`run ${runId}: attempt ${done.attempts} resumes from its checkpoint`);
		for (const f of [...staying, dropping]) {
			expect(f.steps(), 'every residual point once, in order').toEqual(steps);
			expect(f.events[f.events.length - 1].data.status).toBe(reference.results.status);
		}
		expect(dropping.connections).toBeGreaterThanOrEqual(2);
		// the same processes carry on: the app queues (its pg-boss reconnected), the worker works it
		expect(worker.child.exitCode).toBe(null);
		const next = await queue(smallCase('after the restart'));
		expect((await ended(next)).status).toBe('converged');
	}, 150_000);
});

describe('a worker host drops off the network mid-run', () => {
	it.skipIf(netnsProblem !== null)(`another worker takes the run over and finishes it; the lost one writes nothing when it is back${netnsProblem ? ` (skipped: ${netnsProblem})` : ''}`, async () => {
		const net = network!;
		// only the worker in the namespace runs when the run is queued, so it is the one that claims it
		await Promise.all(workers.map((w) => w.stop()));
		const remote = await startWorker(
			app,
			{ DATABASE_URL: cluster.url('twofold_fault', net.hostIp), TWOFOLD_WORKER_HOST: 'netns-host', TWOFOLD_WORKER_STEP_PAUSE_MS: '12', SMTP_HOST: net.hostIp },
			workers,
			{ prefix: net.prefix }
		);
		const doc = referenceCase('network drop');
		const reference = solveHere(doc);
		const runId = await queue(doc);
		await waitFor(async () => ((await getRunRow(handle.db, runId)).workerId ?? '').startsWith('netns-host:'), { what: 'the remote worker to claim the run' });
		const local = await startWorker(app, { TWOFOLD_WORKER_HOST: 'local-host', TWOFOLD_WORKER_STEP_PAUSE_MS: '12' }, workers);
		const follower = new SseFollower({ baseUrl: app.baseUrl, path: `/runs/${runId}/events`, cookie: cookieOf(viewer) });
		await checkpointPast(runId, reference.results.step / 4);

		net.down();
		const before = await getRunRow(handle.db, runId);
		expect(before.status).toBe('running');
		expect(before.steps).toBeLessThan(reference.results.step);

		await ended(runId);
		await follower.done;
		const { done, steps } = await expectSameAsUninterrupted(runId, doc, reference);
		expect(done.workerId).toMatch(/^local-host:/);
		expect(done.attempts).toBeGreaterThanOrEqual(2);
		expect(local.output()).toContain(`run ${runId}: attempt ${done.attempts} resumes from its checkpoint`);
		expect(local.output()).toMatch(new RegExp(`run ${runId}: heartbeat stale for over \\d+ s; re-queued`));
		expect(follower.steps()).toEqual(steps);

		// the network comes back: the lost worker's late writes match nothing (the run is no longer
		// its attempt), so not a row changes
		const settled = await runFingerprint(runId);
		net.up();
		await waitFor(() => /taken over by another job|attempt 1 done/.test(remote.output()) || remote.child.exitCode !== null, {
			what: `the remote worker to notice it lost the run:\n${remote.output()}`,
			timeoutMs: 60_000,
			everyMs: 200
		});
		await new Promise((r) => setTimeout(r, 500));
		expect(await runFingerprint(runId)).toEqual(settled);
		const [{ n }] = await handle.db.select({ n: sql<number>`count(*)::int` }).from(runs).where(inArray(runs.status, ['queued', 'running']));
		expect(n).toBe(0);
	}, 150_000);
});
