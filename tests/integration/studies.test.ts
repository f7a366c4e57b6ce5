/**
 * Studies end to end: the built app, real PostgreSQL, real pg-boss and real worker processes
 * (two of them with different host ids, as if on two machines), started and killed by this file.
 *
 * Reference for "the same result": the solver library driven in this process (`runToEnd`) on the
 * member's frozen case — what an uninterrupted run computes (the solver is deterministic).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, inArray, sql } from 'drizzle-orm';
import { startApp, type RunningApp } from '../helpers/app.js';
import { openTestDb } from '../helpers/db.js';
import { TestClient, signedInClient } from '../helpers/http.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { startWorker, waitFor, type WorkerProcess } from '../helpers/workers.js';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { cases, columns, runs, studies, teams } from '../../src/lib/server/db/schema.js';
import { listMembers } from '../../src/lib/server/studies/reads.js';
import { createBoss, sendSolveJob, solveQueue } from '../../src/lib/server/runs/jobs.js';
import { testDatabaseUrl } from '../helpers/env.js';
import { designBand, gridConvergence } from '../../src/lib/studies/results.js';
import { cellSize } from '../../src/lib/studies/spec.js';
import { defaultCase, runToEnd, type CaseDocument } from '../../solver/index.js';

/** 1 m column, 40 cells: converges in a few hundred steps (well under a second unpaced). */
function smallCase(name = 'small'): CaseDocument {
	const c = defaultCase('height-profile');
	c.name = name;
	c.geometry.heightM = 1;
	c.geometry.clearLiquidLevelM = 0.7;
	c.numerics.cells = 40;
	c.numerics.endTimeS = 60;
	c.numerics.snapshotIntervalS = 5;
	return c;
}

const ENDED = ['converged', 'finished', 'failed', 'cancelled'];

let app: RunningApp;
let handle: DbHandle;
let teamA: TestTeam;
let teamB: TestTeam;
let columnA: string;
let columnB: string;
let analystA: TestClient;
let analystB: TestClient;
let colleagueB: TestClient;
const started: WorkerProcess[] = [];

async function storeCase(team: TestTeam, columnId: string, doc: CaseDocument): Promise<string> {
	const [row] = await handle.db
		.insert(cases)
		.values({ teamId: team.team.id, columnId, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc })
		.returning({ id: cases.id });
	return row.id;
}

async function postStudy(client: TestClient, body: unknown): Promise<{ status: number; json: any }> {
	const res = await client.postJson('/studies', body);
	return { status: res.status, json: await res.json() };
}

async function createStudy(client: TestClient, body: Record<string, unknown>): Promise<{ id: string; memberIds: string[] }> {
	const r = await postStudy(client, body);
	expect(r.status, JSON.stringify(r.json)).toBe(201);
	return { id: r.json.study.id, memberIds: r.json.members.map((m: { id: string }) => m.id) };
}

async function membersOf(team: TestTeam, studyId: string) {
	return listMembers({ db: handle.db, teamId: team.team.id, studyId });
}

async function waitForStudyEnd(team: TestTeam, studyId: string, timeoutMs = 120_000) {
	return waitFor(
		async () => {
			const m = await membersOf(team, studyId);
			return m.length && m.every((x) => ENDED.includes(x.status)) ? m : null;
		},
		{ timeoutMs, what: `study ${studyId} to end`, everyMs: 200 }
	);
}

/** Cancel whatever another file (or test) left queued or running, jobs included. */
async function endLeftovers() {
	await handle.pool.query(`update pgboss.job set state = 'cancelled', completed_on = now() where name like 'solve-run%' and state < 'completed'`).catch(() => {});
	await handle.db
		.update(runs)
		.set({ status: 'cancelled', finishedAt: new Date(), errorMessage: 'Left over by an earlier test' })
		.where(inArray(runs.status, ['queued', 'running']));
}

async function stopAll() {
	await Promise.all(started.splice(0).map((w) => w.stop()));
}

beforeAll(async () => {
	handle = await openTestDb();
	await endLeftovers();
	app = await startApp();
	teamA = await createTestTeam({ db: handle.db, name: 'Studies team A' });
	teamB = await createTestTeam({ db: handle.db, name: 'Studies team B' });
	const [a] = await handle.db.insert(columns).values({ teamId: teamA.team.id, tag: 'S-201', diameterM: 0.2, heightM: 1 }).returning({ id: columns.id });
	const [b] = await handle.db.insert(columns).values({ teamId: teamB.team.id, tag: 'S-301', diameterM: 0.2, heightM: 1 }).returning({ id: columns.id });
	columnA = a.id;
	columnB = b.id;
	analystA = await signedInClient(app.baseUrl, teamA.members.analyst);
	analystB = await signedInClient(app.baseUrl, teamB.members.analyst);
	colleagueB = await signedInClient(app.baseUrl, teamB.members.lead);
}, 180_000);

afterAll(async () => {
	await stopAll();
	await app?.stop();
	await handle?.close();
});

describe('a study is refused with the field named, and nothing is queued', () => {
	it('answers 400 naming the field for bad JSON bodies and bad specs', async () => {
		const caseId = await storeCase(teamA, columnA, smallCase('refusals'));
		const before = (await handle.pool.query('select count(*)::int as n from runs')).rows[0].n;
		const cases: Array<[unknown, number, string]> = [
			[null, 400, ''],
			[[], 400, ''],
			[{ caseId: '../../etc', name: 'x', spec: { kind: 'grid', cells: [20, 40, 80] } }, 400, 'caseId'],
			[{ caseId, name: '', spec: { kind: 'grid', cells: [20, 40, 80] } }, 400, 'name'],
			[{ caseId, name: 'x', spec: { kind: 'grid', cells: [40, 44, 80] } }, 400, 'spec.cells'],
			[{ caseId, name: 'x', spec: { kind: 'grid', cells: [20, 40] } }, 400, 'spec.cells'],
			[{ caseId, name: 'x', spec: { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'log', from: 0, to: 0.2, count: 5 }] } }, 400, 'spec.axes.0.from'],
			[{ caseId, name: 'x', spec: { kind: 'sweep', axes: [{ input: 'colour', spacing: 'list', values: [1] }] } }, 400, 'spec.axes.0.input'],
			// a member whose clear level would reach the top of the 1 m column
			[{ caseId, name: 'x', spec: { kind: 'sweep', axes: [{ input: 'clearLiquidLevelM', spacing: 'list', values: [0.5, 1.2] }] } }, 400, 'spec.members.1.geometry.clearLiquidLevelM'],
			[{ caseId, name: 'x', spec: { kind: 'closure-matrix', options: { lift: ['none', 'tomiyama'] } } }, 400, 'spec.options.lift'],
			[{ caseId, name: 'x', spec: { kind: 'hunch' } }, 400, 'spec.kind']
		];
		for (const [body, status, path] of cases) {
			const r = await postStudy(analystA, body);
			expect(r.status, JSON.stringify(body)).toBe(status);
			expect(r.json.error.issues.length, JSON.stringify(r.json)).toBeGreaterThan(0);
			if (path) expect(r.json.error.issues.map((i: { path: string }) => i.path), JSON.stringify(r.json)).toContain(path);
		}
		// over the team's cap (an admin sets it): refused before anything is stored
		await handle.db.update(teams).set({ maxStudyRuns: 5 }).where(eq(teams.id, teamA.team.id));
		const over = await postStudy(analystA, { caseId, name: 'too big', spec: { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'linear', from: 0.01, to: 0.1, count: 6 }] } });
		expect(over.status).toBe(400);
		expect(over.json.error.message).toMatch(/6 runs.*cap is 5/);
		await handle.db.update(teams).set({ maxStudyRuns: 100 }).where(eq(teams.id, teamA.team.id));
		// a viewer may not start one; another team's case is not found
		const viewer = await signedInClient(app.baseUrl, teamA.members.viewer);
		expect((await postStudy(viewer, { caseId, name: 'x', spec: { kind: 'grid', cells: [20, 40, 80] } })).status).toBe(403);
		expect((await postStudy(analystB, { caseId, name: 'x', spec: { kind: 'grid', cells: [20, 40, 80] } })).status).toBe(404);
		const after = (await handle.pool.query('select count(*)::int as n from runs')).rows[0].n;
		expect(after).toBe(before);
		expect((await handle.pool.query('select count(*)::int as n from studies where team_id = $1', [teamA.team.id])).rows[0].n).toBe(0);
	});
});

describe('studies on two workers (two host ids, one slot each)', () => {
	it('works a 24-member sweep exactly once, spread over both machines', async () => {
		await endLeftovers();
		const [a, b] = await Promise.all([
			startWorker(app, { TWOFOLD_WORKER_HOST: 'machine-a', TWOFOLD_WORKER_STEP_PAUSE_MS: '1' }, started),
			startWorker(app, { TWOFOLD_WORKER_HOST: 'machine-b', TWOFOLD_WORKER_STEP_PAUSE_MS: '1' }, started)
		]);
		const caseId = await storeCase(teamA, columnA, smallCase('sweep base'));
		const { id, memberIds } = await createStudy(analystA, {
			caseId,
			name: 'U_g sweep',
			spec: { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'linear', from: 0.005, to: 0.12, count: 24 }] }
		});
		expect(memberIds).toHaveLength(24);
		const members = await waitForStudyEnd(teamA, id);
		expect(members.map((m) => m.status)).toEqual(Array(24).fill('converged'));
		// exactly once: one claim per member, one pg-boss job per member
		expect(members.map((m) => m.attempts)).toEqual(Array(24).fill(1));
		const jobs = await handle.pool.query(`select data->>'runId' as run_id, count(*)::int as n from pgboss.job where data->>'runId' = any($1) group by 1`, [memberIds]);
		expect(jobs.rows.length).toBe(24);
		expect(jobs.rows.every((r) => r.n === 1)).toBe(true);
		// spread over both machines (the worker id on each run is host:pid:random)
		const rows = await handle.db.select({ workerId: runs.workerId }).from(runs).where(inArray(runs.id, memberIds));
		const hosts = new Set(rows.map((r) => (r.workerId ?? '').split(':')[0]));
		expect([...hosts].sort()).toEqual(['machine-a', 'machine-b']);
		// each member ran its own gas rate, and holdup rises with it
		const holdups = members.map((m) => m.design!.overallHoldup.value);
		for (let i = 1; i < holdups.length; i++) expect(holdups[i]).toBeGreaterThan(holdups[i - 1]);
		const [first] = await handle.db.select({ doc: runs.caseDocument }).from(runs).where(eq(runs.id, members[0].id));
		expect(first.doc.sparging.superficialGasVelocityMS).toBe(0.005);
		expect(a.output() + b.output()).not.toMatch(/failed to start/);
		await stopAll();
	}, 240_000);

	it('loses no member when one worker is killed mid-sweep: the other resumes it from its checkpoint', async () => {
		await endLeftovers();
		const env = { TWOFOLD_WORKER_STEP_PAUSE_MS: '8', TWOFOLD_CHECKPOINT_INTERVAL_S: '0.3', TWOFOLD_STALE_AFTER_S: '3' };
		const [a] = await Promise.all([startWorker(app, { ...env, TWOFOLD_WORKER_HOST: 'machine-a' }, started), startWorker(app, { ...env, TWOFOLD_WORKER_HOST: 'machine-b' }, started)]);
		const caseId = await storeCase(teamA, columnA, smallCase('kill base'));
		const { id, memberIds } = await createStudy(analystA, {
			caseId,
			name: 'Kill sweep',
			spec: { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'list', values: [0.02, 0.03, 0.04, 0.05, 0.06, 0.07] }] }
		});
		// wait until machine-a works a member that has a checkpoint, then kill it outright
		const victim = await waitFor(
			async () => {
				const r = await handle.pool.query(
					`select r.id from runs r join checkpoints c on c.run_id = r.id where r.study_id = $1 and r.status = 'running' and r.worker_id like 'machine-a:%' and c.step > 20 limit 1`,
					[id]
				);
				return r.rows[0]?.id as string | undefined;
			},
			{ timeoutMs: 60_000, what: 'a checkpointed member on machine-a' }
		);
		await a.kill();
		const members = await waitForStudyEnd(teamA, id, 180_000);
		expect(members.map((m) => m.status)).toEqual(Array(6).fill('converged'));
		const resumed = members.find((m) => m.id === victim)!;
		expect(resumed.attempts).toBe(2);
		expect(resumed.workerId?.startsWith('machine-b:')).toBe(true);
		// resumed from its checkpoint, it ends exactly where an uninterrupted run ends
		const [row] = await handle.db.select({ doc: runs.caseDocument }).from(runs).where(eq(runs.id, victim));
		const reference = runToEnd(row.doc);
		expect(resumed.design!.overallHoldup.value).toBe(reference.design.overallHoldup.value);
		expect(resumed.steps).toBe(reference.step);
		expect(memberIds).toContain(victim);
		await stopAll();
	}, 300_000);
});

describe('cancelling, re-running and fair share', () => {
	it('cancelling a study ends all of its queued and running members', async () => {
		await endLeftovers();
		await startWorker(app, { TWOFOLD_WORKER_HOST: 'machine-a', TWOFOLD_WORKER_STEP_PAUSE_MS: '40' }, started);
		const caseId = await storeCase(teamA, columnA, smallCase('cancel base'));
		const { id } = await createStudy(analystA, { caseId, name: 'Cancel me', spec: { kind: 'grid', cells: [20, 30, 40, 60, 80] } });
		await waitFor(async () => (await membersOf(teamA, id)).some((m) => m.status === 'running'), { timeoutMs: 30_000, what: 'a running member' });
		const res = await analystA.post(`/studies/${id}?/cancel`);
		expect(res.status).toBeLessThan(400);
		const members = await waitForStudyEnd(teamA, id, 20_000);
		expect(members.map((m) => m.status)).toEqual(Array(5).fill('cancelled'));
		const [s] = await handle.db.select().from(studies).where(eq(studies.id, id));
		expect(s.cancelledAt).not.toBeNull();
		// the running member's job completes once its handler has recorded the cancel
		await waitFor(
			async () => {
				const live = await handle.pool.query(`select count(*)::int as n from pgboss.job where data->>'runId' in (select id::text from runs where study_id = $1) and state < 'completed'`, [id]);
				return live.rows[0].n === 0;
			},
			{ timeoutMs: 10_000, what: 'no live job of the cancelled study' }
		);
		// re-run the cancelled members on an unpaced worker: five new runs take their places in the study
		await stopAll();
		await startWorker(app, { TWOFOLD_WORKER_HOST: 'machine-b' }, started);
		const again = await analystA.post(`/studies/${id}?/rerunFailed`);
		expect(again.status).toBeLessThan(400);
		const rerun = await waitForStudyEnd(teamA, id, 120_000);
		expect(rerun.map((m) => m.status)).toEqual(Array(5).fill('converged'));
		expect((await handle.pool.query('select count(*)::int as n from runs where study_id = $1', [id])).rows[0].n).toBe(10);
		await stopAll();
	}, 240_000);

	it("a 30-run study does not starve another team's run or a colleague's run queued after it", async () => {
		await endLeftovers();
		await startWorker(app, { TWOFOLD_WORKER_HOST: 'machine-a', TWOFOLD_WORKER_STEP_PAUSE_MS: '1' }, started);
		const caseB = await storeCase(teamB, columnB, smallCase('fair base'));
		const { id } = await createStudy(analystB, {
			caseId: caseB,
			name: 'Big sweep',
			spec: { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'linear', from: 0.01, to: 0.1, count: 30 }] }
		});
		await waitFor(async () => (await membersOf(teamB, id)).some((m) => m.status !== 'queued'), { timeoutMs: 30_000, what: 'the study to start' });
		const other = await analystA.postJson('/runs', { caseId: await storeCase(teamA, columnA, smallCase('other team')) });
		const colleague = await colleagueB.postJson('/runs', { caseId: await storeCase(teamB, columnB, smallCase('colleague')) });
		expect(other.status).toBe(201);
		expect(colleague.status).toBe(201);
		const singleIds = [((await other.json()) as any).run.id, ((await colleague.json()) as any).run.id];
		const singles = await waitFor(
			async () => {
				const r = await handle.db.select().from(runs).where(inArray(runs.id, singleIds));
				return r.every((x) => x.startedAt) ? r : null;
			},
			{ timeoutMs: 60_000, what: 'both single runs to start' }
		);
		const queuedAt = Math.max(...singles.map((s) => s.queuedAt.getTime()));
		const lastStart = Math.max(...singles.map((s) => s.startedAt!.getTime()));
		const members = await membersOf(teamB, id);
		// members started after both single runs were queued and before the second of them started
		const jumped = members.filter((m) => m.startedAt && new Date(m.startedAt).getTime() > queuedAt && new Date(m.startedAt).getTime() < lastStart);
		expect(jumped.length).toBeLessThanOrEqual(1);
		expect(members.filter((m) => m.status === 'queued').length).toBeGreaterThan(10);
		await handle.pool.query(`update teams set max_study_runs = max_study_runs where id = $1`, [teamB.team.id]);
		await stopAll();
		await endLeftovers();
	}, 180_000);
});

describe('solver versions', () => {
	it('a worker never takes a run frozen with another solver version; the run waits in that version\'s queue', async () => {
		await endLeftovers();
		await startWorker(app, { TWOFOLD_WORKER_HOST: 'machine-a' }, started);
		const boss = createBoss({ url: testDatabaseUrl(), role: 'app' });
		await boss.start();
		try {
			const caseDoc = smallCase('other version');
			const caseId = await storeCase(teamA, columnA, caseDoc);
			const [run] = await handle.db
				.insert(runs)
				.values({ teamId: teamA.team.id, columnId: columnA, caseId, caseDocument: caseDoc, solverVersion: '0.9.0', status: 'queued' })
				.returning();
			const client = await handle.pool.connect();
			try {
				await client.query('BEGIN');
				const jobId = await sendSolveJob({ boss, client, runId: run.id, caseDoc, solverVersion: '0.9.0' });
				await client.query('update runs set job_id = $1 where id = $2', [jobId, run.id]);
				await client.query('COMMIT');
			} finally {
				client.release();
			}
			// a run of this version queued after it is worked at once; the 0.9.0 run is not touched
			const r = await analystA.postJson('/runs', { caseId: await storeCase(teamA, columnA, smallCase('this version')) });
			const mine = ((await r.json()) as any).run.id as string;
			await waitFor(async () => ENDED.includes((await handle.db.select().from(runs).where(eq(runs.id, mine)))[0].status), { timeoutMs: 30_000, what: 'the current-version run' });
			const [other] = await handle.db.select().from(runs).where(eq(runs.id, run.id));
			expect(other.status).toBe('queued');
			expect(other.attempts).toBe(0);
			const job = await handle.pool.query(`select name, state from pgboss.job where id = $1`, [other.jobId]);
			expect(job.rows[0]).toEqual({ name: solveQueue('0.9.0'), state: 'created' });
		} finally {
			await boss.stop({ graceful: false, wait: false }).catch(() => {});
			await stopAll();
			await endLeftovers();
		}
	}, 120_000);
});

describe('closure matrix and grid study on real runs', () => {
	it('3 drag laws × 2 virtual-mass options give 6 runs and a band that contains each of them', async () => {
		await endLeftovers();
		await Promise.all([startWorker(app, { TWOFOLD_WORKER_HOST: 'machine-a' }, started), startWorker(app, { TWOFOLD_WORKER_HOST: 'machine-b' }, started)]);
		const base = smallCase('matrix base');
		base.bubbles.classes = 'single';
		const caseId = await storeCase(teamA, columnA, base);
		const { id } = await createStudy(analystA, {
			caseId,
			name: 'Drag × VM',
			spec: { kind: 'closure-matrix', options: { drag: ['schiller-naumann', 'ishii-zuber', 'tomiyama-contaminated'], virtualMass: ['constant', 'zuber'] } }
		});
		const members = await waitForStudyEnd(teamA, id);
		expect(members).toHaveLength(6);
		expect(members.every((m) => m.status === 'converged')).toBe(true);
		const docs = await handle.db.select({ id: runs.id, doc: runs.caseDocument }).from(runs).where(eq(runs.studyId, id));
		const combos = new Set(docs.map((d) => `${d.doc.closures.drag}/${d.doc.closures.virtualMass}`));
		expect(combos.size).toBe(6);
		const band = designBand(members);
		for (const key of ['overallHoldup', 'levelSwellM', 'meanSlipMS']) {
			for (const m of members) {
				expect(m.design![key].value).toBeGreaterThanOrEqual(band[key].min);
				expect(m.design![key].value).toBeLessThanOrEqual(band[key].max);
			}
		}
		// drag laws differ for 5 mm bubbles: the model-form spread of the holdup is real, not zero
		expect(band.overallHoldup.max).toBeGreaterThan(band.overallHoldup.min * 1.02);
		// the page shows the band
		const page = await analystA.get(`/studies/${id}`);
		expect(page.status).toBe(200);
		expect(await page.text()).toContain('data-testid="band-overallHoldup-min"');
		// signed off like a comparison: a lead may, an analyst may not
		expect((await analystA.post(`/studies/${id}?/signOff`, { verdict: 'approved-basis', comment: '' }, { accept: 'application/json' })).status).toBe(403);
		const lead = await signedInClient(app.baseUrl, teamA.members.lead);
		const signed = await lead.post(`/studies/${id}?/signOff`, { verdict: 'approved-basis', comment: 'Spread acceptable for the basis' }, { accept: 'application/json' });
		expect(signed.status).toBe(200);
		const verdicts = await handle.pool.query(`select verdict, comment from sign_offs where subject_type = 'study' and subject_id = $1`, [id]);
		expect(verdicts.rows).toEqual([{ verdict: 'approved-basis', comment: 'Spread acceptable for the basis' }]);
		await stopAll();
	}, 240_000);

	it('a grid study of a real case gives a GCI where convergence is monotone and flags the rest', async () => {
		await endLeftovers();
		await Promise.all([startWorker(app, { TWOFOLD_WORKER_HOST: 'machine-a' }, started), startWorker(app, { TWOFOLD_WORKER_HOST: 'machine-b' }, started)]);
		const base = smallCase('grid base');
		const caseId = await storeCase(teamA, columnA, base);
		const { id } = await createStudy(analystA, { caseId, name: 'Grids', spec: { kind: 'grid', cells: [20, 40, 80] } });
		const members = await waitForStudyEnd(teamA, id);
		expect(members.every((m) => m.status === 'converged')).toBe(true);
		const [s] = await handle.db.select().from(studies).where(eq(studies.id, id));
		const conv = gridConvergence(members, (n) => cellSize(s.baseCase, n));
		expect(conv.find((c) => c.id === 'overallHoldup')!.cells).toEqual([80, 40, 20]);
		// a number only for monotone convergence; oscillatory or divergent sequences are flagged instead
		for (const c of conv) expect(c.gci !== null, c.id).toBe(c.type === 'monotone');
		// the pressure at the sparger is the weight of a liquid inventory every grid holds exactly:
		// p_top + ρ_L g H₀ (hydrostatics, common practice) plus the few pascals of gas above — grid-independent
		const p = conv.find((c) => c.id === 'spargerPressurePa')!;
		expect(p.type).toBe('monotone');
		expect(p.gci!.gciFine).toBeLessThan(1e-6);
		const hydrostatic = base.fluids.topPressurePa + base.fluids.liquid.densityKgM3 * 9.81 * base.geometry.clearLiquidLevelM;
		expect(Math.abs(p.gci!.extrapolated - hydrostatic)).toBeLessThan(10);
		const page = await analystA.get(`/cases/${caseId}`);
		expect(await page.text()).toContain('data-testid="case-gci"');
		await stopAll();
	}, 240_000);
});
