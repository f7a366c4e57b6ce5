/**
 * Faults of real components around a run: the app process killed while twenty clients follow a
 * run live, and the database refusing to store a snapshot (as when its disk is full), once or for
 * good. The built app, real PostgreSQL and real worker processes; the refusal is a trigger on the
 * test database that raises on inserting a snapshot of the runs of one case name.
 * (PostgreSQL restarting and a worker dropping off the network: fault-postgres.test.ts.)
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, inArray } from 'drizzle-orm';
import { startApp, type RunningApp } from '../helpers/app.js';
import { openTestDb } from '../helpers/db.js';
import { signedInClient, type TestClient } from '../helpers/http.js';
import { startWorker, waitFor, type WorkerProcess } from '../helpers/workers.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import {
	ENDED,
	SseFollower,
	expectedSteps,
	getRunRow,
	referenceCase,
	smallCase,
	solveHere,
	storedSnapshots,
	storedSteps,
	waitForStatus
} from '../helpers/runs.js';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { cases, checkpoints, columns, runs, teams } from '../../src/lib/server/db/schema.js';
import { encodeSnapshot } from '../../src/lib/server/runs/codec.js';
import type { CaseDocument } from '../../solver/index.js';

let handle: DbHandle;
let app: RunningApp;
let team: TestTeam;
let columnId: string;
let analyst: TestClient;
let viewer: TestClient;
const workers: WorkerProcess[] = [];
const workerLogs = () => workers.map((w) => w.output()).join('\n');

/** The run's end, or a failure that shows what the workers said. */
async function ended(runId: string, timeoutMs = 60_000) {
	try {
		return await waitForStatus(handle.db, runId, ENDED, timeoutMs);
	} catch (e) {
		throw new Error(`${(e as Error).message}\n--- workers:\n${workerLogs().slice(-6000)}`);
	}
}

/** One paced worker for the tests of this file (started by the first test that needs it). */
let worker: Promise<WorkerProcess> | null = null;
const ensureWorker = () => (worker ??= startWorker(app, { TWOFOLD_WORKER_STEP_PAUSE_MS: '8' }, workers));

const cookieOf = (c: TestClient) => [...c.cookies].map(([k, v]) => `${k}=${v}`).join('; ');

async function queue(doc: CaseDocument): Promise<string> {
	const [row] = await handle.db
		.insert(cases)
		.values({ teamId: team.team.id, columnId, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc })
		.returning({ id: cases.id });
	const res = await analyst.postJson('/runs', { caseId: row.id });
	expect(res.status, await res.clone().text()).toBe(201);
	return ((await res.json()) as { run: { id: string } }).run.id;
}

/**
 * The snapshot trigger: refuses the snapshot inserts of the runs of a case name, the first
 * `remaining` ones (counted by a sequence, which a rolled-back transaction does not undo) or, with
 * `remaining` null, all of them.
 */
const FAULT_SQL = `
create table if not exists test_snapshot_faults (case_name text primary key, remaining int, counter regclass);
create or replace function test_refuse_snapshot() returns trigger language plpgsql as $$
declare
	fault test_snapshot_faults%rowtype;
begin
	select f.* into fault from test_snapshot_faults f join runs r on r.case_document->>'name' = f.case_name where r.id = new.run_id;
	if found and (fault.remaining is null or nextval(fault.counter) <= fault.remaining) then
		raise exception 'could not extend file "base/16384/16999": No space left on device' using errcode = '53100';
	end if;
	return new;
end $$;
drop trigger if exists test_refuse_snapshot on snapshots;
create trigger test_refuse_snapshot before insert on snapshots for each row execute function test_refuse_snapshot();
drop sequence if exists test_snapshot_fault_once;
create sequence test_snapshot_fault_once;
`;

beforeAll(async () => {
	handle = await openTestDb();
	// runs left queued by earlier test files would be worked by the workers started here
	await handle.pool.query(`update pgboss.job set state = 'cancelled', completed_on = now() where name like 'solve-run%' and state < 'completed'`).catch(() => {});
	await handle.db.update(runs).set({ status: 'cancelled', finishedAt: new Date(), errorMessage: 'Left over by an earlier test file' }).where(inArray(runs.status, ['queued', 'running']));
	await handle.pool.query(FAULT_SQL);
	app = await startApp();
	team = await createTestTeam({ db: handle.db, name: 'Faults team' });
	await handle.db.update(teams).set({ maxActiveRuns: 50 }).where(eq(teams.id, team.team.id));
	const [col] = await handle.db.insert(columns).values({ teamId: team.team.id, tag: 'F-1', diameterM: 0.2, heightM: 2 }).returning({ id: columns.id });
	columnId = col.id;
	analyst = await signedInClient(app.baseUrl, team.members.analyst);
	viewer = await signedInClient(app.baseUrl, team.members.viewer);
}, 180_000);

afterAll(async () => {
	await Promise.all(workers.map((w) => w.kill()));
	await app?.stop();
	await handle?.pool.query('drop trigger if exists test_refuse_snapshot on snapshots; drop function if exists test_refuse_snapshot(); drop table if exists test_snapshot_faults; drop sequence if exists test_snapshot_fault_once;').catch(() => {});
	await handle?.close();
});

describe('the app process is killed while twenty clients follow a run', () => {
	it('restarts on its port; every client reconnects with Last-Event-ID and has every residual point exactly once', async () => {
		const w = await ensureWorker();
		const doc = referenceCase('app killed');
		const reference = solveHere(doc);
		const runId = await queue(doc);
		const followers = Array.from({ length: 20 }, () => new SseFollower({ baseUrl: app.baseUrl, path: `/runs/${runId}/events`, cookie: cookieOf(viewer), retryMs: 200 }));
		await waitFor(() => followers.every((f) => f.steps().length >= 3), { what: 'twenty followers to see residuals', timeoutMs: 30_000 });
		const port = Number(new URL(app.baseUrl).port);
		await app.kill();
		const killedAt = await getRunRow(handle.db, runId);
		expect(killedAt.status, 'the run must still be going when the app dies').toBe('running');
		// the streams are cut; the clients retry while no app listens
		await new Promise((r) => setTimeout(r, 1000));
		await app.stop();
		app = await startApp({ port });
		await Promise.all(followers.map((f) => f.done));

		const done = await ended(runId);
		expect(done.status, w.output()).toBe(reference.results.status);
		expect(done.attempts).toBe(1);
		const steps = await storedSteps(handle.db, runId);
		expect(steps).toEqual(expectedSteps(reference.results.step));
		for (const [i, f] of followers.entries()) {
			expect(f.connections, `client ${i} reconnected`).toBeGreaterThanOrEqual(2);
			expect(f.steps(), `client ${i}`).toEqual(steps);
			const ids = f.events.map((e) => e.id.split('.').map(Number));
			for (let k = 1; k < ids.length; k++) for (let j = 0; j < 3; j++) expect(ids[k][j]).toBeGreaterThanOrEqual(ids[k - 1][j]);
			const snapshotIds = f.events.filter((e) => e.event === 'snapshot').map((e) => e.data.id as number);
			expect(new Set(snapshotIds).size, `client ${i}: no snapshot announced twice`).toBe(snapshotIds.length);
			expect(f.events[f.events.length - 1].data.status).toBe(reference.results.status);
		}
		// the restarted app serves new work
		expect((await analyst.postJson('/runs', { caseId: done.caseId })).status).toBe(201);
	}, 120_000);
});

describe('a snapshot the database refuses to store', () => {
	it('retries a refused write and ends with the results of an uninterrupted run, nothing stored twice', async () => {
		const doc = smallCase('snapshot refused once');
		await handle.pool.query(`insert into test_snapshot_faults (case_name, remaining, counter) values ($1, 1, 'test_snapshot_fault_once')`, [doc.name]);
		const reference = solveHere(doc);
		await ensureWorker();
		const runId = await queue(doc);
		const done = await ended(runId);
		expect(done.status, workerLogs()).toBe('converged');
		// the first attempt failed at its first snapshot, the retry ran to the end
		expect(done.attempts).toBe(2);
		const { profiles, ...summary } = reference.results;
		expect(done.summary).toEqual(JSON.parse(JSON.stringify(summary)));
		expect(await storedSteps(handle.db, runId)).toEqual(expectedSteps(reference.results.step));
		const snaps = await storedSnapshots(handle.db, runId);
		expect(new Set(snaps.map((s) => s.step)).size).toBe(snaps.length);
		expect(snaps.filter((s) => s.isFinal)).toHaveLength(1);
		expect(Buffer.compare(snaps[snaps.length - 1].data, Buffer.from(encodeSnapshot(profiles)))).toBe(0);
	});

	it('fails a run whose snapshots are refused for good, with the reason, and keeps only complete rows', async () => {
		const doc = smallCase('snapshot refused always');
		await handle.pool.query('insert into test_snapshot_faults (case_name, remaining) values ($1, null)', [doc.name]);
		await ensureWorker();
		const t0 = Date.now();
		const runId = await queue(doc);
		// a follower sees the failure as it happens
		const follower = new SseFollower({ baseUrl: app.baseUrl, path: `/runs/${runId}/events`, cookie: cookieOf(viewer) });
		const done = await ended(runId);
		await follower.done;
		expect(done.status).toBe('failed');
		expect(done.errorMessage).toMatch(/refused to store this run's results 4 times/);
		expect(done.errorMessage).toContain('No space left on device');
		expect(done.errorMessage).toContain('SQLSTATE 53100');
		// within pg-boss's retries, not after the heartbeat sweeper's much later give-up
		expect(Date.now() - t0).toBeLessThan(30_000);
		expect(done.attempts).toBe(4);
		// nothing of the refused transactions: no snapshot, no checkpoint left, residual rows without a gap
		expect(await storedSnapshots(handle.db, runId)).toHaveLength(0);
		const [cp] = await handle.db.select().from(checkpoints).where(eq(checkpoints.runId, runId));
		expect(cp).toBeUndefined();
		const steps = await storedSteps(handle.db, runId);
		expect(steps).toEqual(expectedSteps(steps[steps.length - 1] ?? 0));
		expect(done.steps).toBe(steps[steps.length - 1] ?? 0);
		// what the page and a client read back says the same
		const history = (await (await viewer.get(`/runs/${runId}/history`, { accept: 'application/json' })).json()) as {
			run: { status: string; errorMessage: string };
			residuals: { step: number }[];
			snapshots: unknown[];
		};
		expect(history.run.status).toBe('failed');
		expect(history.run.errorMessage).toBe(done.errorMessage);
		expect(history.residuals.map((r) => r.step)).toEqual(steps);
		expect(history.snapshots).toEqual([]);
		const last = follower.events[follower.events.length - 1];
		expect(last.event).toBe('status');
		expect(last.data.status).toBe('failed');
		expect(follower.steps()).toEqual(steps);

		// the worker keeps serving other runs
		const next = await queue(smallCase('after the refused snapshots'));
		expect((await ended(next)).status).toBe('converged');
		expect(await handle.db.select({ id: runs.id }).from(runs).where(and(eq(runs.id, next), eq(runs.status, 'converged')))).toHaveLength(1);
	});
});
