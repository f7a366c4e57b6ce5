import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { cases, columns, comparisons, measurements, runs, snapshots } from '../../src/lib/server/db/schema.js';
import { encodeSnapshot as encodeStoredSnapshot } from '../../src/lib/server/runs/codec.js';
import { defaultCase } from '../../solver/case.js';
import { openTestDb } from '../helpers/db.js';
import { testDatabaseUrl } from '../helpers/env.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { signedInClient } from '../helpers/http.js';

// the app's database module reads DATABASE_URL when first imported: point it at the test database
process.env.DATABASE_URL ??= testDatabaseUrl();
const server = await import('../../src/lib/server/measurements.js');

let handle: DbHandle;
let t: TestTeam;
let columnId: string;
const runIds: string[] = [];
let measurementId: string;

beforeAll(async () => {
	handle = await openTestDb();
	t = await createTestTeam({ db: handle.db });
	const [c] = await handle.db.insert(columns).values({ teamId: t.team.id, tag: 'C-703', diameterM: 0.2, heightM: 3 }).returning();
	columnId = c.id;
	// two runs at U_G 0.05 m/s, one at 0.08 m/s (outside ±10 %); invented final holdup profiles
	for (const [ug, holdup] of [
		[0.05, [0.1, 0.2, 0.3]],
		[0.05, [0.15, 0.17, 0.19]],
		[0.08, [0.2, 0.2, 0.2]]
	] as const) {
		const doc = defaultCase();
		doc.sparging.superficialGasVelocityMS = ug;
		const [k] = await handle.db.insert(cases).values({ teamId: t.team.id, columnId, name: `U_G ${ug}, ${holdup[0]}`, kind: doc.kind, schemaVersion: 1, document: doc }).returning();
		const [r] = await handle.db
			.insert(runs)
			.values({ teamId: t.team.id, columnId, caseId: k.id, caseDocument: doc, solverVersion: 'test', status: 'converged' })
			.returning();
		const data = encodeStoredSnapshot({ step: 10, timeS: 1, x: [0.5, 1.5, 2.5], fields: { holdup: [...holdup], pressure: [1.2e5, 1.1e5, 1.0e5] } });
		await handle.db.insert(snapshots).values({ runId: r.id, step: 10, simulatedTimeS: 1, isFinal: true, data: Buffer.from(data) });
		runIds.push(r.id);
	}
	const [m] = await handle.db
		.insert(measurements)
		.values({
			teamId: t.team.id,
			columnId,
			kind: 'holdup-height',
			name: 'probe traverse',
			superficialGasVelocityMS: 0.052,
			temperatureK: 293.15,
			pressurePa: 101325,
			units: { x: 'm', y: '1' },
			data: { x: [1.0, 2.0], y: [0.16, 0.22] }
		})
		.returning();
	measurementId = m.id;
});

let app: RunningApp | undefined;

afterAll(async () => {
	await app?.stop();
	await handle?.close();
});

describe('error measures of runs against a measurement', () => {
	it('gives a run page the matching measurement with hand-computed error measures', async () => {
		const [run] = await handle.db.select().from(runs).where(eq(runs.id, runIds[0]));
		const items = await server.measurementsForRun({ teamId: t.team.id, run });
		expect(items).toHaveLength(1);
		// by hand: the profile at 1.0 and 2.0 m is 0.15 and 0.25; deviations −0.01 and +0.03;
		// bias 0.01, RMSE √((1e-4 + 9e-4)/2) = 0.0223607, largest +0.03 at 2.0 m
		const e = items[0].measures!;
		expect(e.meanBias).toBeCloseTo(0.01, 12);
		expect(e.rmse).toBeCloseTo(0.0223607, 7);
		expect(e.largestDeviation).toBeCloseTo(0.03, 12);
		expect(e.largestDeviationAt).toBe(2);
	});

	it('leaves out measurements at another operating point', async () => {
		const [run] = await handle.db.select().from(runs).where(eq(runs.id, runIds[2]));
		expect(await server.measurementsForRun({ teamId: t.team.id, run })).toEqual([]);
	});

	it('ranks the matching runs of the column by RMSE on the measurement page', async () => {
		const [m] = await handle.db.select().from(measurements).where(eq(measurements.id, measurementId));
		const held = await server.runsHeldAgainstMeasurement({ teamId: t.team.id, measurement: m });
		// by hand, second run: 0.16 and 0.18 at 1.0 and 2.0 m; deviations 0 and −0.04; RMSE 0.0282843
		expect(held.map((h) => h.runId)).toEqual([runIds[0], runIds[1]]);
		expect(held[1].measures!.rmse).toBeCloseTo(0.0282843, 7);
	});

	it('ranks a comparison’s runs against a chosen measurement and flags another operating point', async () => {
		const r = await server.rankRunsAgainstMeasurement({ teamId: t.team.id, columnId, runIds: [runIds[2], runIds[1], runIds[0]], measurementId });
		expect(r).not.toBeNull();
		// by hand, third run: deviations 0.04 and −0.02, RMSE √((16e-4 + 4e-4)/2) = 0.0316228
		expect(r!.ranked.map((x) => x.runId)).toEqual([runIds[0], runIds[1], runIds[2]]);
		expect(r!.ranked[2].measures!.rmse).toBeCloseTo(0.0316228, 7);
		expect(r!.ranked.map((x) => x.operatingPointMatches)).toEqual([true, true, false]);
		const outsider = await createTestTeam({ db: handle.db });
		expect(await server.rankRunsAgainstMeasurement({ teamId: outsider.team.id, columnId, runIds, measurementId })).toBeNull();
	});

	it('shows the error measures on the run page and the measurements on the column page', async () => {
		app = await startApp();
		const viewer = await signedInClient(app.baseUrl, t.members.viewer);
		const runPage = await viewer.get(`/runs/${runIds[0]}`);
		expect(runPage.status).toBe(200);
		const html = await runPage.text();
		expect(html).toContain('data-testid="run-measurement-errors"');
		expect(html).toContain('probe traverse');
		// RMSE 0.0223607 shown to three significant figures
		expect(html).toContain('0.0224');
		const other = await viewer.get(`/runs/${runIds[2]}`);
		expect(await other.text()).toContain('No measurement of this column matches this run');
		const columnPage = await viewer.get(`/columns/${columnId}`);
		const columnHtml = await columnPage.text();
		expect(columnHtml).toContain('data-testid="column-measurements"');
		expect(columnHtml).toContain(`/columns/${columnId}/measurements/${measurementId}`);
		// viewers get no upload or import button
		expect(columnHtml).not.toContain(`/columns/${columnId}/measurements/new`);
	});

	it('ranks a comparison by RMSE against the measurement chosen on its page and links the report', async () => {
		app ??= await startApp();
		const [cmp] = await handle.db
			.insert(comparisons)
			.values({ teamId: t.team.id, columnId, name: 'two holdup profiles', runIds: [runIds[1], runIds[0]], baselineRunId: runIds[1] })
			.returning();
		const lead = await signedInClient(app.baseUrl, t.members.lead);
		const page = await lead.get(`/compare/${cmp.id}?measurement=${measurementId}`);
		expect(page.status).toBe(200);
		const html = await page.text();
		const table = html.slice(html.indexOf('data-testid="comparison-ranking"'));
		// ranked by RMSE: 0.0224 (first run) before 0.0283 (second run), as computed by hand above
		expect(table.indexOf('0.0224')).toBeGreaterThan(0);
		expect(table.indexOf('0.0283')).toBeGreaterThan(table.indexOf('0.0224'));
		expect(html).toContain(`/compare/${cmp.id}/report`);
		// a lead keeps the choice with the comparison; a viewer may not
		const viewer = await signedInClient(app.baseUrl, t.members.viewer);
		expect((await viewer.post(`/compare/${cmp.id}?/measurement`, { measurementId })).status).toBe(403);
		expect((await lead.post(`/compare/${cmp.id}?/measurement`, { measurementId })).status).toBe(200);
		const [saved] = await handle.db.select().from(comparisons).where(eq(comparisons.id, cmp.id));
		expect(saved.measurementId).toBe(measurementId);
		expect(await (await lead.get(`/compare/${cmp.id}`)).text()).toMatch(/This is the comparison(&#39;|')s saved measurement/);
		const report = await lead.get(`/compare/${cmp.id}/report`);
		expect(report.status).toBe(200);
		expect(await report.text()).toContain('probe traverse');
	});
});
