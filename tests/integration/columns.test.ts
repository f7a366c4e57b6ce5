/** The columns table and its forms: validation beside the field, unique tags per team, sort, filter, delete. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { auditLog, columns } from '../../src/lib/server/db/schema.js';
import { openTestDb } from '../helpers/db.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { signedInClient, TestClient } from '../helpers/http.js';

let handle: DbHandle;
let app: RunningApp;
let t: TestTeam;
let other: TestTeam;
let analyst: TestClient;

const form = (over: Record<string, string> = {}) => ({ tag: 'C-900', service: 'Test aeration', diameterM: '0.3', heightM: '3', notes: '', ...over });

/** The tags in table order, read from the rendered table. */
function tagsIn(html: string): string[] {
	return [...html.matchAll(/<td class="px-4 py-2 font-mono font-semibold"><a [^>]*>([^<]+)<\/a>/g)].map((m) => m[1]);
}

beforeAll(async () => {
	handle = await openTestDb();
	t = await createTestTeam({ db: handle.db });
	other = await createTestTeam({ db: handle.db });
	app = await startApp();
	analyst = await signedInClient(app.baseUrl, t.members.analyst);
});

afterAll(async () => {
	await app?.stop();
	await handle?.close();
});

describe('columns', () => {
	it('creates a column in SI and records who did it', async () => {
		const res = await analyst.post('/columns/new', form({ tag: 'C-901', diameterM: '0,45', heightM: '5.5' }));
		expect(res.status).toBe(303);
		const id = res.headers.get('location')!.split('/').pop()!;
		const [row] = await handle.db.select().from(columns).where(eq(columns.id, id));
		// a decimal comma is read as a decimal point
		expect(row.diameterM).toBe(0.45);
		expect(row.heightM).toBe(5.5);
		expect(row.teamId).toBe(t.team.id);
		expect(row.createdBy).toBe(t.members.analyst.id);
		const audit = await handle.db.select().from(auditLog).where(eq(auditLog.subject, id));
		expect(audit.map((a) => a.action)).toEqual(['column.create']);
	});

	it('says what is wrong beside each field and keeps what was typed', async () => {
		const res = await analyst.post('/columns/new', form({ tag: 'C-902', diameterM: '-1', heightM: 'tall' }));
		expect(res.status).toBe(400);
		const html = await res.text();
		expect(html).toContain('The inner diameter must be a positive number of metres.');
		expect(html).toContain('The height must be a positive number of metres.');
		expect(html).toContain('value="C-902"');
	});

	it('refuses a second column with the same tag in one team, in any letter case, but allows it in another team', async () => {
		await analyst.post('/columns/new', form({ tag: 'R-300' }));
		const dup = await analyst.post('/columns/new', form({ tag: 'r-300' }));
		expect(dup.status).toBe(400);
		expect(await dup.text()).toContain('Your team already has a column r-300.');
		const elsewhere = await signedInClient(app.baseUrl, other.members.analyst);
		expect((await elsewhere.post('/columns/new', form({ tag: 'R-300' }))).status).toBe(303);
	});

	it('sorts by any heading in both directions and filters by tag or service', async () => {
		const fresh = await createTestTeam({ db: handle.db });
		await handle.db.insert(columns).values([
			{ teamId: fresh.team.id, tag: 'B-2', service: 'stripper', diameterM: 2, heightM: 4 },
			{ teamId: fresh.team.id, tag: 'A-1', service: 'aeration', diameterM: 0.5, heightM: 12 },
			{ teamId: fresh.team.id, tag: 'C-3', service: 'oxidation', diameterM: 1, heightM: 8 }
		]);
		const client = await signedInClient(app.baseUrl, fresh.members.viewer);
		expect(tagsIn(await (await client.get('/columns')).text())).toEqual(['A-1', 'B-2', 'C-3']);
		expect(tagsIn(await (await client.get('/columns?sort=heightM&dir=desc')).text())).toEqual(['A-1', 'C-3', 'B-2']);
		expect(tagsIn(await (await client.get('/columns?sort=diameterM')).text())).toEqual(['A-1', 'C-3', 'B-2']);
		expect(tagsIn(await (await client.get('/columns?sort=diameterM&dir=desc')).text())).toEqual(['B-2', 'C-3', 'A-1']);
		expect(tagsIn(await (await client.get('/columns?q=OXID')).text())).toEqual(['C-3']);
		expect(tagsIn(await (await client.get('/columns?q=b-')).text())).toEqual(['B-2']);
		// the filter is plain text: a % matches only a %
		expect(tagsIn(await (await client.get('/columns?q=%25')).text())).toEqual([]);
		// an unknown sort key falls back to the tag
		expect(tagsIn(await (await client.get('/columns?sort=passwordHash')).text())).toEqual(['A-1', 'B-2', 'C-3']);
	});

	it('edits a column and deletes it after the confirmation page', async () => {
		const created = await analyst.post('/columns/new', form({ tag: 'E-1' }));
		const path = created.headers.get('location')!;
		const edit = await analyst.post(`${path}/edit`, form({ tag: 'E-1b', heightM: '7.25' }));
		expect(edit.status).toBe(303);
		const id = path.split('/').pop()!;
		const [row] = await handle.db.select().from(columns).where(eq(columns.id, id));
		expect(row.tag).toBe('E-1b');
		expect(row.heightM).toBe(7.25);

		const confirm = await analyst.get(`${path}/delete`);
		expect(confirm.status).toBe(200);
		expect(await confirm.text()).toContain('Delete column E-1b?');
		expect(await handle.db.select().from(columns).where(eq(columns.id, id))).toHaveLength(1);
		const del = await analyst.post(`${path}/delete`);
		expect(del.status).toBe(303);
		expect(del.headers.get('location')).toBe('/columns');
		expect(await handle.db.select().from(columns).where(eq(columns.id, id))).toHaveLength(0);
		expect((await analyst.get(path)).status).toBe(404);
	});

	it('keeps the sign-in redirect on this site', async () => {
		const c = new TestClient(app.baseUrl);
		const res = await c.post('/signin?/password', { email: t.members.viewer.email, password: t.members.viewer.password, redirectTo: '//evil.example/x' });
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe('/');
		const ok = await new TestClient(app.baseUrl).post('/signin?/password', {
			email: t.members.viewer.email,
			password: t.members.viewer.password,
			redirectTo: '/columns?q=x'
		});
		expect(ok.headers.get('location')).toBe('/columns?q=x');
	});
});
