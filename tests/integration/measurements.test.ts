import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { columns, measurements } from '../../src/lib/server/db/schema.js';
import { MAX_DATA_ROWS, MAX_FILE_BYTES, parseMeasurementCsv } from '../../src/lib/measurements/csv.js';
import { reaerationConcentration } from '../../src/lib/measurements/reaeration.js';
import { openTestDb } from '../helpers/db.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { signedInClient, type TestClient } from '../helpers/http.js';

let handle: DbHandle;
let app: RunningApp;
let t: TestTeam;
let other: TestTeam;
let columnId: string;
let analyst: TestClient;

beforeAll(async () => {
	handle = await openTestDb();
	t = await createTestTeam({ db: handle.db });
	other = await createTestTeam({ db: handle.db });
	const [c] = await handle.db.insert(columns).values({ teamId: t.team.id, tag: 'C-701', diameterM: 0.3, heightM: 3 }).returning();
	columnId = c.id;
	app = await startApp();
	analyst = await signedInClient(app.baseUrl, t.members.analyst);
});

afterAll(async () => {
	await app?.stop();
	await handle?.close();
});

const holdupForm = {
	kind: 'holdup-height',
	name: 'Pilot run 4',
	sourceNote: 'conductivity probes (invented test data)',
	xUnit: 'cm',
	yUnit: '%',
	superficialGasVelocity: '5',
	superficialGasVelocityUnit: 'cm/s',
	temperature: '20',
	temperatureUnit: 'C',
	pressure: '101.325',
	pressureUnit: 'kPa'
};

/** Posts the upload form as a browser does: multipart, with the file. */
async function upload(client: TestClient, fields: Record<string, string>, csv: string, path = `/columns/${columnId}/measurements/new`) {
	const body = new FormData();
	for (const [k, v] of Object.entries(fields)) body.set(k, v);
	body.set('file', new File([csv], 'data.csv', { type: 'text/csv' }));
	return fetch(new URL(path, app.baseUrl), {
		method: 'POST',
		redirect: 'manual',
		headers: { accept: 'text/html', origin: new URL(app.baseUrl).origin, cookie: [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ') },
		body
	});
}

async function count(): Promise<number> {
	const [r] = await handle.db.select({ n: sql<number>`count(*)::int` }).from(measurements).where(eq(measurements.teamId, t.team.id));
	return r.n;
}

function idFrom(res: Response): string {
	const m = /\/measurements\/([0-9a-f-]{36})$/.exec(res.headers.get('location') ?? '');
	if (!m) throw new Error(`no measurement in the redirect: ${res.status} ${res.headers.get('location')}`);
	return m[1];
}

describe('measurement uploads', () => {
	it('stores an analyst’s holdup profile in SI and shows it', async () => {
		const res = await upload(analyst, holdupForm, 'z,holdup\n10,4.5\n50,12\n120,13.5\n');
		expect(res.status).toBe(303);
		const id = idFrom(res);
		const [row] = await handle.db.select().from(measurements).where(eq(measurements.id, id));
		// 1 cm = 0.01 m, 1 % = 0.01, 5 cm/s = 0.05 m/s, 20 °C = 293.15 K (definitions)
		expect(row.data.x).toEqual([0.1, 0.5, 1.2]);
		expect(row.data.y[1]).toBeCloseTo(0.12, 15);
		expect(row.superficialGasVelocityMS).toBeCloseTo(0.05, 15);
		expect(row.temperatureK).toBeCloseTo(293.15, 12);
		expect(row.units).toEqual({ x: 'cm', y: '%' });
		expect(row.fileName).toBe('data.csv');
		const page = await analyst.get(`/columns/${columnId}/measurements/${id}`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Pilot run 4');
		expect(html).toContain('No run of this column matches this operating point yet.');
		const list = await analyst.get(`/columns/${columnId}/measurements`);
		expect(await list.text()).toContain('Pilot run 4');
	});

	it('refuses a faulty file naming the row and the column, and stores nothing', async () => {
		const before = await count();
		const cases: Array<[string, string]> = [
			['z,holdup\n10,4.5\n50,112\n', 'Row 3, column 2 (holdup: gas holdup): 112 % is out of range'],
			['10,4.5\n50,\n', 'Row 2, column 2 (gas holdup): the value is missing'],
			['10,4.5\n50,abc\n', 'Row 2, column 2 (gas holdup): "abc" is not a number'],
			['10,4.5\n400,5\n', 'Row 2, column 1 (height above the sparger): 4 m is outside the column (0 to 3 m above the sparger)'],
			['10,4.5\n10,5\n', 'Row 2, column 1 (height above the sparger): duplicate position 10 cm (also in row 1)'],
			['20,4.5\n10,5\n', 'positions must increase down the file'],
			['z,holdup\n', 'The file has a header row but no data rows']
		];
		for (const [csv, message] of cases) {
			const res = await upload(analyst, holdupForm, csv);
			expect(res.status).toBe(400);
			expect(await res.text()).toContain(message);
		}
		// an empty file, a file over the size limit and one over the row limit
		const empty = await upload(analyst, holdupForm, '');
		expect(empty.status).toBe(400);
		expect(await empty.text()).toContain('Choose a CSV file');
		const blank = await upload(analyst, holdupForm, '\n\n');
		expect(blank.status).toBe(400);
		expect(await blank.text()).toContain('The file is empty');
		const big = await upload(analyst, holdupForm, `10,4\n${'#'.repeat(MAX_FILE_BYTES)}`);
		expect(big.status).toBe(400);
		expect(await big.text()).toContain(`The file is ${MAX_FILE_BYTES + 5} bytes; the limit is ${MAX_FILE_BYTES} bytes`);
		const long = await upload(
			analyst,
			{ ...holdupForm, kind: 'dissolved-oxygen', xUnit: 's', yUnit: 'mg/L' },
			Array.from({ length: MAX_DATA_ROWS + 1 }, (_, i) => `${i},5`).join('\n')
		);
		expect(long.status).toBe(400);
		expect(await long.text()).toContain(`The file has ${MAX_DATA_ROWS + 1} data rows; the limit is ${MAX_DATA_ROWS}`);
		// a file with many good rows and one bad one is refused whole
		const rows = Array.from({ length: 200 }, (_, i) => `${i + 1},${(i % 30) + 1}`);
		rows[150] = '151,-3';
		const res = await upload(analyst, holdupForm, rows.join('\n'));
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('Row 151, column 2 (gas holdup): -3 % is out of range');
		expect(await count()).toBe(before);
	});

	it('refuses wrong form fields beside the field', async () => {
		const res = await upload(analyst, { ...holdupForm, name: '', temperature: 'warm' }, '10,4\n');
		expect(res.status).toBe(400);
		const html = await res.text();
		expect(html).toContain('Give the measurement a name');
	});

	it('lets a viewer read but not upload, and hides a team’s data from another team', async () => {
		const viewer = await signedInClient(app.baseUrl, t.members.viewer);
		expect((await viewer.get(`/columns/${columnId}/measurements`)).status).toBe(200);
		const before = await count();
		expect((await upload(viewer, holdupForm, '10,4\n')).status).toBe(403);
		expect((await viewer.get(`/columns/${columnId}/measurements/new`)).status).toBe(403);
		expect(await count()).toBe(before);

		const [m] = await handle.db.select().from(measurements).where(eq(measurements.teamId, t.team.id)).limit(1);
		const outsider = await signedInClient(app.baseUrl, other.members.admin);
		expect((await outsider.get(`/columns/${columnId}/measurements/${m.id}`)).status).toBe(404);
		expect((await outsider.get(`/columns/${columnId}/measurements/${m.id}/csv`, { accept: 'text/csv' })).status).toBe(404);
		expect((await upload(outsider, holdupForm, '10,4\n')).status).toBe(404);
		expect(await count()).toBe(before);
	});

	it('downloads a measurement as CSV that reads back to the stored values', async () => {
		const [m] = await handle.db.select().from(measurements).where(and(eq(measurements.teamId, t.team.id), eq(measurements.kind, 'holdup-height'))).limit(1);
		const res = await analyst.get(`/columns/${columnId}/measurements/${m.id}/csv`, { accept: 'text/csv' });
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toContain('text/csv');
		expect(res.headers.get('content-disposition')).toContain('C-701_Pilot-run-4_SI.csv');
		const back = parseMeasurementCsv({ text: await res.text(), kind: 'holdup-height', xUnit: 'm', yUnit: '1', columnHeightM: 3 });
		expect(back.ok && back.table.x).toEqual(m.data.x);
		expect(back.ok && back.table.y).toEqual(m.data.y);
		const uploaded = await analyst.get(`/columns/${columnId}/measurements/${m.id}/csv?units=uploaded`, { accept: 'text/csv' });
		expect((await uploaded.text()).split('\r\n')[0]).toBe('height above the sparger [cm],gas holdup [%]');
	});

	it('analyses a dissolved-oxygen series and reports kLa20 and SOTR', async () => {
		// generated from known parameters (PHYSICS §15 #29: C∞ 9.09, C₀ 0.5 mg/L, kLa 10 h⁻¹), no noise
		const lines = ['t_min,DO_mg_L'];
		for (let i = 0; i <= 80; i++) {
			const c = reaerationConcentration({ timeS: 30 * i, kLaPerS: 10 / 3600, saturationKgM3: 9.09, initialKgM3: 0.5 });
			lines.push(`${(30 * i) / 60},${c.toFixed(9)}`);
		}
		const res = await upload(analyst, { ...holdupForm, kind: 'dissolved-oxygen', name: 'Re-aeration test A', xUnit: 'min', yUnit: 'mg/L' }, lines.join('\n'));
		expect(res.status).toBe(303);
		const id = idFrom(res);
		const page = await analyst.get(`/columns/${columnId}/measurements/${id}?volumeM3=1`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('data-testid="reaeration-fit"');
		// at 20 °C and 101.325 kPa, kLa20 = kLa = 10 h⁻¹ and SOTR = 1 m³ · 10 h⁻¹ · 9.09 g/m³ = 90.9 g O₂/h (PHYSICS §15 #31)
		expect(html).toMatch(/kLa20<\/td>\s*<td[^>]*>10<\/td>/);
		expect(html).toMatch(/SOTR<\/td>\s*<td[^>]*>90\.9<\/td>/);
		expect(html).toContain('g O₂/h');
	});

	it('deletes a measurement for an analyst only', async () => {
		const [m] = await handle.db.select().from(measurements).where(eq(measurements.teamId, t.team.id)).limit(1);
		const viewer = await signedInClient(app.baseUrl, t.members.viewer);
		expect((await viewer.post(`/columns/${columnId}/measurements?/delete`, { id: m.id })).status).toBe(403);
		const res = await analyst.post(`/columns/${columnId}/measurements?/delete`, { id: m.id });
		expect(res.status).toBe(200);
		expect(await handle.db.select().from(measurements).where(eq(measurements.id, m.id))).toEqual([]);
	});
});
