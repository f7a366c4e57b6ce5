/**
 * The screens' routes over HTTP against the built app: roles on cases, runs and comparisons, team
 * isolation, the CSV download and the stored sign-off. Rows are written directly (no worker):
 * what is under test here is the guard and the pages, not the solver.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { cases, columns, comparisons, runs, signOffs, snapshots } from '../../src/lib/server/db/schema.js';
import { encodeSnapshot } from '../../src/lib/server/runs/codec.js';
import { defaultCase } from '../../solver/case.js';
import { openTestDb } from '../helpers/db.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { signedInClient, type TestClient } from '../helpers/http.js';

let handle: DbHandle;
let app: RunningApp;
let t: TestTeam;
let other: TestTeam;
let viewer: TestClient;
let lead: TestClient;
let stranger: TestClient;
const ids = { column: '', case: '', runA: '', runB: '', comparison: '' };
const CELLS = 5;

beforeAll(async () => {
	handle = await openTestDb();
	t = await createTestTeam({ db: handle.db });
	other = await createTestTeam({ db: handle.db });
	const db = handle.db;
	const [col] = await db.insert(columns).values({ teamId: t.team.id, tag: 'S-1', diameterM: 0.2, heightM: 2, createdBy: t.members.analyst.id }).returning();
	ids.column = col.id;
	const doc = defaultCase();
	const [c] = await db
		.insert(cases)
		.values({ teamId: t.team.id, columnId: col.id, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc, createdBy: t.members.analyst.id })
		.returning();
	ids.case = c.id;
	for (const [key, holdup] of [['runA', 0.15], ['runB', 0.18]] as const) {
		const [r] = await db
			.insert(runs)
			.values({
				teamId: t.team.id,
				columnId: col.id,
				caseId: c.id,
				caseDocument: doc,
				solverVersion: 'test',
				status: 'converged',
				queuedBy: t.members.analyst.id,
				summary: { design: { overallHoldup: { value: holdup, unit: '1', label: 'Overall gas holdup' } } }
			})
			.returning();
		ids[key] = r.id;
		const x = Float64Array.from({ length: CELLS }, (_, i) => (i + 0.5) * 0.4);
		await db.insert(snapshots).values({
			runId: r.id,
			step: 10,
			simulatedTimeS: 1,
			isFinal: true,
			data: Buffer.from(encodeSnapshot({ step: 10, timeS: 1, x, fields: { holdup: x.map(() => holdup), pressure: x.map((z) => 101325 + 9790 * (2 - z)) } }))
		});
	}
	const [cmp] = await db
		.insert(comparisons)
		.values({ teamId: t.team.id, columnId: col.id, name: 'Drag check', runIds: [ids.runA, ids.runB], baselineRunId: ids.runA, createdBy: t.members.lead.id })
		.returning();
	ids.comparison = cmp.id;
	app = await startApp();
	viewer = await signedInClient(app.baseUrl, t.members.viewer);
	lead = await signedInClient(app.baseUrl, t.members.lead);
	stranger = await signedInClient(app.baseUrl, other.members.lead);
});

afterAll(async () => {
	await app?.stop();
	await handle?.close();
});

describe('screens: cases, runs and comparisons over HTTP', () => {
	it('lets a viewer read the case, the run and the comparison', async () => {
		for (const path of [`/cases/${ids.case}`, `/runs/${ids.runA}`, `/compare/${ids.comparison}`, `/columns/${ids.column}`, '/compare']) {
			expect((await viewer.get(path)).status, path).toBe(200);
		}
	});

	it('refuses a viewer who posts a save, a queue, a clone, a comparison or a verdict by hand', async () => {
		for (const action of ['save', 'queue', 'clone']) {
			const res = await viewer.post(`/cases/${ids.case}?/${action}`, {});
			expect(res.status, action).toBe(403);
		}
		expect((await viewer.post(`/compare/${ids.comparison}?/signOff`, { verdict: 'approved-basis' })).status).toBe(403);
		expect((await viewer.get(`/compare/new?column=${ids.column}`)).status).toBe(403);
		expect((await viewer.post(`/runs/${ids.runA}?/rerun`, {})).status).toBe(403);
		const rows = await handle.db.select().from(signOffs).where(eq(signOffs.subjectId, ids.comparison));
		expect(rows).toHaveLength(0);
	});

	it('answers not found to a member of another team, never a leak', async () => {
		for (const path of [`/cases/${ids.case}`, `/runs/${ids.runA}`, `/runs/${ids.runA}/profiles.csv`, `/runs/${ids.runA}/residuals.csv`, `/compare/${ids.comparison}`, `/compare/new?column=${ids.column}`]) {
			expect((await stranger.get(path)).status, path).toBe(404);
		}
		expect((await stranger.post(`/compare/${ids.comparison}?/signOff`, { verdict: 'approved-basis', comment: '' })).status).toBe(404);
	});

	it('writes the profiles CSV with the SI unit of every column and one row per cell', async () => {
		const res = await viewer.get(`/runs/${ids.runA}/profiles.csv`, { accept: 'text/csv' });
		expect(res.status).toBe(200);
		const lines = (await res.text()).trimEnd().split('\r\n');
		expect(lines[0]).toBe('height above sparger [m],gas holdup [-],pressure [Pa]');
		expect(lines).toHaveLength(CELLS + 1);
		// the stored values come back at full precision, position first
		expect(lines[1].split(',').map(Number)).toEqual([0.2, 0.15, 101325 + 9790 * 1.8]);
	});

	it('asks for a comment when the lead requests changes, then stores the verdict', async () => {
		const refused = await lead.post(`/compare/${ids.comparison}?/signOff`, { verdict: 'changes-requested', comment: '' });
		expect(refused.status).toBe(400);
		expect(await refused.text()).toContain('Say what should change');
		const ok = await lead.post(`/compare/${ids.comparison}?/signOff`, { verdict: 'changes-requested', comment: 'Add a Tomiyama run.' });
		expect(ok.status).toBe(200);
		const rows = await handle.db
			.select()
			.from(signOffs)
			.where(and(eq(signOffs.subjectId, ids.comparison), eq(signOffs.teamId, t.team.id)));
		expect(rows.map((r) => [r.verdict, r.comment])).toEqual([['changes-requested', 'Add a Tomiyama run.']]);
		const page = await (await viewer.get(`/compare/${ids.comparison}`)).text();
		expect(page).toContain('changes requested');
		expect(page).toContain('Add a Tomiyama run.');
	});
});
