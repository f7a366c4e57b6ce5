/**
 * Runs as queued jobs, end to end: the built app, real PostgreSQL, real pg-boss and real worker
 * processes (`tsx worker/index.ts`) started and killed by this file.
 *
 * Reference for "identical results": the same case driven in this process by the solver library
 * itself (`solveHere` in tests/helpers/runs.ts), which is what an uninterrupted run computes.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { startApp, type RunningApp } from '../helpers/app.js';
import { openTestDb } from '../helpers/db.js';
import { TestClient, signedInClient } from '../helpers/http.js';
import { waitForMail } from '../helpers/mail.js';
import { startWorker as startWorkerProcess, waitFor, type WorkerProcess } from '../helpers/workers.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import {
	ENDED,
	expectedSteps,
	getRunRow as runRow,
	readSseEvents,
	referenceCase,
	smallCase,
	solveHere,
	storedSteps as stepsStored,
	waitForStatus as waitForRunStatus,
	type SseEvent
} from '../helpers/runs.js';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { cases, checkpoints, columns, memberships, outgoingMail, residuals, runs, snapshots, teams } from '../../src/lib/server/db/schema.js';
import { decodeSnapshot, encodeSnapshot } from '../../src/lib/server/runs/codec.js';
import type { CaseDocument } from '../../solver/index.js';


// ------------------------------------------------------------------ cases used here

const PACE_MS = '6';

/** Superficial gas velocity 1 m/s at CFL 1 in a 1 m column: the holdup leaves [0, 1] within a few steps. */
function divergingCase(): CaseDocument {
	const c = smallCase('diverging');
	c.numerics.cflNumber = 1;
	c.sparging.superficialGasVelocityMS = 1;
	return c;
}

// ------------------------------------------------------------------ worker processes

const workers: WorkerProcess[] = [];

function startWorker(app: RunningApp, env: Record<string, string> = {}): Promise<WorkerProcess> {
	return startWorkerProcess(app, env, workers);
}

// ------------------------------------------------------------------ small helpers

/** Reads an SSE response until `until(event)` is true or the stream is aborted; returns the events read. */
async function readSse(o: { client: TestClient; path: string; lastEventId?: string; until: (e: SseEvent, all: SseEvent[]) => boolean; timeoutMs?: number }): Promise<SseEvent[]> {
	const controller = new AbortController();
	const timer = setTimeout(() => controller.abort(), o.timeoutMs ?? 60_000);
	const headers: Record<string, string> = { accept: 'text/event-stream', cookie: [...o.client.cookies].map(([k, v]) => `${k}=${v}`).join('; ') };
	if (o.lastEventId) headers['last-event-id'] = o.lastEventId;
	const res = await fetch(new URL(o.path, o.client.baseUrl), { headers, signal: controller.signal });
	expect(res.status).toBe(200);
	expect(res.headers.get('content-type')).toContain('text/event-stream');
	const events: SseEvent[] = [];
	try {
		const done = await readSseEvents(res.body!, (e) => {
			events.push(e);
			return o.until(e, events);
		});
		if (done) {
			controller.abort();
			return events;
		}
	} catch (err) {
		if (!controller.signal.aborted) throw err;
		if (!events.length || !o.until(events[events.length - 1], events)) throw new Error(`SSE stream timed out after ${events.length} events`);
	} finally {
		clearTimeout(timer);
	}
	return events;
}

const isFinalStatus = (e: SseEvent) => e.event === 'status' && ENDED.includes(e.data.status);

// ------------------------------------------------------------------ the suite

let app: RunningApp;
let handle: DbHandle;
let teamA: TestTeam;
let teamB: TestTeam;
let columnId: string;
let analyst: TestClient;
let viewer: TestClient;
let otherViewer: TestClient;
let otherAnalyst: TestClient;
let firstWorker: Promise<WorkerProcess>;

async function storeCase(doc: CaseDocument): Promise<string> {
	const [row] = await handle.db
		.insert(cases)
		.values({ teamId: teamA.team.id, columnId, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc })
		.returning({ id: cases.id });
	return row.id;
}

const getRunRow = (runId: string) => runRow(handle.db, runId);
const waitForStatus = (runId: string, statuses: string[], timeoutMs?: number) => waitForRunStatus(handle.db, runId, statuses, timeoutMs);
const storedSteps = (runId: string) => stepsStored(handle.db, runId);

async function queueOverHttp(doc: CaseDocument): Promise<string> {
	const caseId = await storeCase(doc);
	const res = await analyst.postJson('/runs', { caseId });
	expect(res.status, await res.clone().text()).toBe(201);
	return ((await res.json()) as { run: { id: string } }).run.id;
}

beforeAll(async () => {
	handle = await openTestDb();
	// runs left queued or running by earlier test files (which had no worker) would be worked by
	// the workers started here and skew what is measured: end them first, jobs included
	await handle.pool.query(`update pgboss.job set state = 'cancelled', completed_on = now() where name like 'solve-run%' and state < 'completed'`).catch(() => {});
	await handle.db
		.update(runs)
		.set({ status: 'cancelled', finishedAt: new Date(), errorMessage: 'Left over by an earlier test file' })
		.where(inArray(runs.status, ['queued', 'running']));
	app = await startApp();
	// the first worker boots (seconds under tsx) while the teams and sign-ins are made
	firstWorker = startWorker(app);
	firstWorker.catch(() => {});
	teamA = await createTestTeam({ db: handle.db, name: 'Runs team A' });
	teamB = await createTestTeam({ db: handle.db, name: 'Runs team B' });
	// room for the twenty-run test; the limit itself is tested with a lower value below
	await handle.db.update(teams).set({ maxActiveRuns: 50 }).where(eq(teams.id, teamA.team.id));
	const [col] = await handle.db.insert(columns).values({ teamId: teamA.team.id, tag: 'R-101', diameterM: 0.2, heightM: 1 }).returning({ id: columns.id });
	columnId = col.id;
	analyst = await signedInClient(app.baseUrl, teamA.members.analyst);
	viewer = await signedInClient(app.baseUrl, teamA.members.viewer);
	otherViewer = await signedInClient(app.baseUrl, teamB.members.viewer);
	otherAnalyst = await signedInClient(app.baseUrl, teamB.members.analyst);
}, 180_000);

afterAll(async () => {
	await Promise.all(workers.map((w) => w.kill()));
	await app?.stop();
	await handle?.close();
});

describe('runs as queued jobs', () => {
	let firstRunId = '';

	it('queues a small case, which converges with its residuals, snapshots, summary, live events and e-mail stored', async () => {
		const worker = await firstWorker;
		const since = new Date();
		const doc = smallCase();
		const runId = await queueOverHttp(doc);
		firstRunId = runId;
		// a viewer follows the run live from the moment it is queued
		const events = await readSse({ client: viewer, path: `/runs/${runId}/events`, until: isFinalStatus });
		const done = await getRunRow(runId);
		expect(done.status, worker.output()).toBe('converged');

		// the stored outcome is exactly what the solver library computes for this case
		const reference = solveHere(doc);
		expect(reference.results.status).toBe('converged');
		const { profiles, ...summary } = reference.results;
		expect(done.summary).toEqual(JSON.parse(JSON.stringify(summary)));
		expect(done.steps).toBe(reference.results.step);
		expect(done.attempts).toBe(1);
		expect(done.solverVersion).toMatch(/\d/);

		// one residual row per stored step, no gap, values as computed
		const steps = await storedSteps(runId);
		expect(steps).toEqual(expectedSteps(reference.results.step));
		const [someRow] = await handle.db
			.select()
			.from(residuals)
			.where(and(eq(residuals.runId, runId), eq(residuals.step, Math.min(100, reference.results.step))));
		expect(someRow.values).toEqual(reference.residualsByStep.get(someRow.step));

		// periodic snapshots (interval 1 s of simulated time) and the final one, bit-identical profiles
		const snaps = await handle.db.select().from(snapshots).where(eq(snapshots.runId, runId)).orderBy(asc(snapshots.step));
		expect(snaps.length).toBeGreaterThanOrEqual(Math.floor(reference.results.timeS / doc.numerics.snapshotIntervalS));
		expect(snaps.filter((s) => s.isFinal)).toHaveLength(1);
		const final = snaps[snaps.length - 1];
		expect(final.isFinal).toBe(true);
		expect(Buffer.compare(final.data, Buffer.from(encodeSnapshot(profiles)))).toBe(0);
		expect(Array.from(decodeSnapshot(final.data).fields.holdup)).toEqual(Array.from(profiles.fields.holdup));
		const [{ checkpointRows }] = await handle.db.select({ checkpointRows: sql<number>`count(*)::int` }).from(checkpoints).where(eq(checkpoints.runId, runId));
		expect(checkpointRows).toBe(0);

		// the stream: residual events before the end, the final status last, every point exactly once
		const lastIndex = events.length - 1;
		expect(events[lastIndex].event).toBe('status');
		expect(events[lastIndex].data.status).toBe('converged');
		const firstResiduals = events.findIndex((e) => e.event === 'residuals');
		expect(firstResiduals).toBeGreaterThanOrEqual(0);
		expect(firstResiduals).toBeLessThan(lastIndex);
		const streamed = events.filter((e) => e.event === 'residuals').flatMap((e) => e.data.points.map((p: { step: number }) => p.step));
		expect(streamed).toEqual(steps);
		expect(events.some((e) => e.event === 'snapshot')).toBe(true);
		expect(events.some((e) => e.event === 'progress')).toBe(true);

		// whoever queued it gets the e-mail
		const mail = await waitForMail({ db: handle.db, to: teamA.members.analyst.email, since });
		expect(mail.subject).toContain('converged');
		expect(mail.text).toContain(`/runs/${runId}`);
		expect(await worker.stop()).toBe(0);
	});

	it('serves the history and a snapshot to a viewer of the team, and 404 to another team', async () => {
		const res = await viewer.get(`/runs/${firstRunId}/history`, { accept: 'application/json' });
		expect(res.status).toBe(200);
		const history = (await res.json()) as { run: { status: string }; residuals: { step: number }[]; snapshots: { id: number; isFinal: boolean }[]; cursor: string };
		expect(history.run.status).toBe('converged');
		expect(history.residuals.map((r) => r.step)).toEqual(await storedSteps(firstRunId));
		const final = history.snapshots.find((s) => s.isFinal)!;
		const snap = await viewer.get(`/runs/${firstRunId}/snapshots/${final.id}`, { accept: 'application/json' });
		expect(snap.status).toBe(200);
		const body = (await snap.json()) as { fields: Record<string, number[]>; x: number[] };
		expect(body.fields.holdup).toHaveLength(40);
		expect(body.x).toHaveLength(40);

		// another team's viewer learns nothing: 404 on every run route
		for (const p of [`/runs/${firstRunId}/events`, `/runs/${firstRunId}/history`, `/runs/${firstRunId}/snapshots/${final.id}`]) {
			expect((await otherViewer.get(p, { accept: 'application/json' })).status, p).toBe(404);
		}
		expect((await otherAnalyst.postJson(`/runs/${firstRunId}/cancel`, {})).status).toBe(404);
		expect((await otherAnalyst.postJson(`/runs/${firstRunId}/rerun`, {})).status).toBe(404);
		// a viewer may watch but not queue; anonymous gets 401
		const caseId = await storeCase(smallCase('not for viewers'));
		expect((await viewer.postJson('/runs', { caseId })).status).toBe(403);
		expect((await viewer.postJson(`/runs/${firstRunId}/rerun`, {})).status).toBe(403);
		expect((await new TestClient(app.baseUrl).get(`/runs/${firstRunId}/events`, { accept: 'text/event-stream' })).status).toBe(401);
		// after the history's cursor, an ended run's stream has nothing more to say
		const after = await readSse({ client: viewer, path: `/runs/${firstRunId}/events?after=${history.cursor}`, until: () => false, timeoutMs: 1500 }).catch((e: Error) => e);
		expect(after).toBeInstanceOf(Error);
		expect((after as Error).message).toContain('after 0 events');
	});

	it('resumes a run from its checkpoint after its worker is killed, with the results of an uninterrupted run and no duplicate steps; the live stream resumes after Last-Event-ID', async () => {
		const doc = referenceCase('crash');
		const reference = solveHere(doc);
		expect(['converged', 'finished']).toContain(reference.results.status);
		const first = await startWorker(app, { TWOFOLD_WORKER_STEP_PAUSE_MS: PACE_MS });
		const runId = await queueOverHttp(doc);

		// a viewer follows, then drops the connection part-way
		const before = await readSse({ client: viewer, path: `/runs/${runId}/events`, until: (_e, all) => all.filter((x) => x.event === 'residuals').length >= 3 });
		const lastEventId = before[before.length - 1].id;
		// the replacement starts now (the run's job is taken, so it idles until the run is re-queued)
		const secondStarting = startWorker(app, { TWOFOLD_WORKER_STEP_PAUSE_MS: PACE_MS });

		// kill the worker once a checkpoint past a third of the run is stored
		const cp = await waitFor(
			async () => {
				const [row] = await handle.db.select({ step: checkpoints.step }).from(checkpoints).where(eq(checkpoints.runId, runId));
				return row && row.step > reference.results.step / 3 ? row : null;
			},
			{ what: 'a checkpoint past a third of the run', timeoutMs: 60_000, everyMs: 20 }
		);
		await first.kill();
		const killedAt = await getRunRow(runId);
		expect(killedAt.status).toBe('running');
		expect(killedAt.steps).toBeLessThan(reference.results.step);

		const second = await secondStarting;
		// the viewer reconnects with the last id it saw and reads to the end
		const afterEvents = await readSse({ client: viewer, path: `/runs/${runId}/events`, lastEventId, until: isFinalStatus, timeoutMs: 90_000 });
		const done = await getRunRow(runId);
		expect(done.status, second.output()).toBe(reference.results.status);
		expect(done.attempts).toBe(2);
		expect(second.output()).toContain(`run ${runId}: attempt 2 resumes from its checkpoint`);
		expect(cp.step).toBeGreaterThan(0);

		// identical to the uninterrupted run
		const { profiles, ...summary } = reference.results;
		expect(done.summary).toEqual(JSON.parse(JSON.stringify(summary)));
		const [final] = await handle.db.select().from(snapshots).where(and(eq(snapshots.runId, runId), eq(snapshots.isFinal, true)));
		expect(Buffer.compare(final.data, Buffer.from(encodeSnapshot(profiles)))).toBe(0);

		// residual rows: each stored step once, none missing, values as uninterrupted
		const steps = await storedSteps(runId);
		expect(steps).toEqual(expectedSteps(reference.results.step));
		const rows = await handle.db.select().from(residuals).where(eq(residuals.runId, runId)).orderBy(asc(residuals.step));
		for (const row of rows) expect(row.values, `step ${row.step}`).toEqual(reference.residualsByStep.get(row.step));
		// snapshots: one per interval crossing plus the final one, none twice
		const snaps = await handle.db.select({ step: snapshots.step }).from(snapshots).where(eq(snapshots.runId, runId));
		expect(new Set(snaps.map((s) => s.step)).size).toBe(snaps.length);
		expect(snaps.length).toBeGreaterThanOrEqual(Math.floor(reference.results.timeS / doc.numerics.snapshotIntervalS));

		// the stream across the reconnect: every point exactly once, ids monotonic
		const streamed = [...before, ...afterEvents].filter((e) => e.event === 'residuals').flatMap((e) => e.data.points.map((p: { step: number }) => p.step));
		expect(streamed).toEqual(steps);
		const statuses = afterEvents.filter((e) => e.event === 'status').map((e) => e.data.status);
		expect(statuses[statuses.length - 1]).toBe(reference.results.status);
		const ids = [...before, ...afterEvents].map((e) => e.id.split('.').map(Number));
		for (let i = 1; i < ids.length; i++) for (let k = 0; k < 3; k++) expect(ids[i][k]).toBeGreaterThanOrEqual(ids[i - 1][k]);
	});

	it('on SIGTERM checkpoints the running run and hands it back, and another worker finishes it', async () => {
		const current = workers[workers.length - 1];
		const doc = referenceCase('graceful');
		const runId = await queueOverHttp(doc);
		await waitForStatus(runId, ['running']);
		// the next worker starts meanwhile; it idles while the run's job is taken
		const nextStarting = startWorker(app, { TWOFOLD_WORKER_STEP_PAUSE_MS: PACE_MS });
		await waitFor(async () => ((await getRunRow(runId)).steps > 50 ? true : null), { what: 'the run to make progress' });
		expect(await current.stop(), current.output()).toBe(0);
		const released = new RegExp(`run ${runId}: checkpointed at simulated time [\\d.]+ s, step (\\d+) and released`).exec(current.output());
		expect(released, current.output()).not.toBe(null);
		expect(Number(released![1])).toBeGreaterThan(50);
		// handed back: queued again, or already claimed by the next worker
		const currentId = /\[worker (\S+)\]/.exec(current.output())![1];
		const row = await getRunRow(runId);
		expect(['queued', 'running']).toContain(row.status);
		expect(row.workerId).not.toBe(currentId);
		const next = await nextStarting;
		const done = await waitForStatus(runId, ENDED, 90_000);
		expect(['converged', 'finished'], next.output()).toContain(done.status);
		expect(done.attempts).toBe(2);
		expect(next.output()).toContain(`run ${runId}: attempt 2 resumes from its checkpoint`);
		expect(await storedSteps(runId)).toEqual(expectedSteps(done.steps));
	});

	it('cancels a running run within two seconds, and the worker takes the next job', async () => {
		const runId = await queueOverHttp(referenceCase('to cancel'));
		await waitFor(async () => ((await getRunRow(runId)).steps > 0 ? true : null), { what: 'the run to make progress' });
		const t0 = Date.now();
		const res = await analyst.postJson(`/runs/${runId}/cancel`, {});
		expect(res.status).toBe(200);
		const done = await waitForStatus(runId, ENDED, 5000);
		const elapsedMs = Date.now() - t0;
		expect(done.status).toBe('cancelled');
		expect(elapsedMs).toBeLessThan(2000);
		expect(done.errorMessage).toMatch(/^Cancelled at simulated time/);
		const next = await queueOverHttp(smallCase('after the cancel'));
		expect((await waitForStatus(next, ENDED)).status).toBe('converged');
	});

	it('fails a diverging run and a run past its wall-time limit with readable reasons, and keeps serving', async () => {
		const diverging = await queueOverHttp(divergingCase());
		const d = await waitForStatus(diverging, ENDED);
		expect(d.status).toBe('failed');
		// the solver's message names the cell and the simulated time
		expect(d.errorMessage).toMatch(/cell \d+/);
		expect(d.errorMessage).toMatch(/t = [\d.]+ s/);
		expect(d.attempts).toBe(1);

		const slow = referenceCase('too slow');
		slow.numerics.wallTimeLimitS = 1;
		const limited = await queueOverHttp(slow);
		const l = await waitForStatus(limited, ENDED);
		expect(l.status).toBe('failed');
		expect(l.errorMessage).toContain('wall-time limit of 1 s');
		// stopped soon after the limit (the status and message above show it did not converge first)
		expect(l.wallTimeS).toBeGreaterThanOrEqual(1);
		expect(l.wallTimeS).toBeLessThan(3);
		expect(l.steps).toBeGreaterThan(0);

		const next = await queueOverHttp(smallCase('after the failures'));
		expect((await waitForStatus(next, ENDED)).status).toBe('converged');
	});

	it('refuses a run past the team limit with a clear message, and sends no mail to a member who muted run mail', async () => {
		await handle.db.update(teams).set({ maxActiveRuns: 1 }).where(eq(teams.id, teamA.team.id));
		await handle.db.update(memberships).set({ muteRunMail: true }).where(and(eq(memberships.teamId, teamA.team.id), eq(memberships.userId, teamA.members.analyst.id)));
		try {
			const first = await queueOverHttp(referenceCase('first of two'));
			const caseId = await storeCase(smallCase('second of two'));
			const res = await analyst.postJson('/runs', { caseId });
			expect(res.status).toBe(429);
			expect(((await res.json()) as { message: string }).message).toMatch(/already has 1 run queued or running, the most it may have at once \(1\)/);
			await analyst.postJson(`/runs/${first}/cancel`, {});
			await waitForStatus(first, ENDED, 5000);
			const again = await analyst.postJson('/runs', { caseId });
			expect(again.status).toBe(201);
			const second = ((await again.json()) as { run: { id: string } }).run.id;
			await waitForStatus(second, ENDED);
			await new Promise((r) => setTimeout(r, 1000));
			const mails = await handle.db
				.select({ id: outgoingMail.id })
				.from(outgoingMail)
				.where(sql`${outgoingMail.text} like ${`%/runs/${first}%`} or ${outgoingMail.text} like ${`%/runs/${second}%`}`);
			expect(mails).toHaveLength(0);
		} finally {
			await handle.db.update(teams).set({ maxActiveRuns: 50 }).where(eq(teams.id, teamA.team.id));
			await handle.db.update(memberships).set({ muteRunMail: false }).where(eq(memberships.teamId, teamA.team.id));
		}
	});

	it('shares twenty queued runs between two workers, each run worked exactly once', async () => {
		await Promise.all(workers.map((w) => w.stop()));
		const [one, two] = await Promise.all([startWorker(app), startWorker(app)]);
		const ids: string[] = [];
		for (let i = 0; i < 20; i++) {
			const doc = smallCase(`batch ${i + 1}`);
			doc.numerics.snapshotIntervalS = 4;
			ids.push(await queueOverHttp(doc));
		}
		await waitFor(
			async () => {
				const rows = await handle.db.select({ status: runs.status }).from(runs).where(inArray(runs.id, ids));
				return rows.every((r) => ENDED.includes(r.status));
			},
			{ what: 'twenty runs to end', timeoutMs: 100_000, everyMs: 200 }
		);
		const rows = await handle.db.select().from(runs).where(inArray(runs.id, ids));
		expect(rows.map((r) => r.status)).toEqual(Array(20).fill('converged'));
		expect(rows.map((r) => r.attempts)).toEqual(Array(20).fill(1));
		const logs = one.output() + two.output();
		for (const id of ids) expect(logs.split(`run ${id}: attempt 1 starts`).length - 1, id).toBe(1);
		// both processes took part
		expect(new Set(rows.map((r) => r.workerId)).size).toBe(2);
		// and all twenty agree (same case, same numbers)
		expect(new Set(rows.map((r) => JSON.stringify(r.summary))).size).toBe(1);
		// pg-boss marks a job completed just after its handler returns
		await waitFor(
			async () => {
				const { rows: r } = await handle.pool.query(
					`select count(*)::int as jobs from pgboss.job where name like 'solve-run%' and data->>'runId' = any($1) and state = 'completed'`,
					[ids]
				);
				return r[0].jobs === 20;
			},
			{ what: 'twenty completed jobs', timeoutMs: 5000 }
		);
	});
});
