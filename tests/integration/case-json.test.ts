import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { cases, columns } from '../../src/lib/server/db/schema.js';
import { defaultCase, SCHEMA_VERSION } from '../../solver/case.js';
import { openTestDb } from '../helpers/db.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { signedInClient, type TestClient } from '../helpers/http.js';

let handle: DbHandle;
let app: RunningApp;
let t: TestTeam;
let columnId: string;
let caseId: string;
let analyst: TestClient;
const doc = defaultCase();
doc.name = 'C-702 Tomiyama basis';
doc.closures.drag = 'tomiyama-contaminated';
doc.sparging.superficialGasVelocityMS = 0.0375;
doc.numerics.cells = 240;

beforeAll(async () => {
	handle = await openTestDb();
	t = await createTestTeam({ db: handle.db });
	const [c] = await handle.db.insert(columns).values({ teamId: t.team.id, tag: 'C-702', diameterM: 0.2, heightM: 2 }).returning();
	columnId = c.id;
	const [k] = await handle.db
		.insert(cases)
		.values({ teamId: t.team.id, columnId, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc })
		.returning();
	caseId = k.id;
	app = await startApp();
	analyst = await signedInClient(app.baseUrl, t.members.analyst);
});

afterAll(async () => {
	await app?.stop();
	await handle?.close();
});

async function importJson(client: TestClient, json: string) {
	return client.post(`/columns/${columnId}/cases/import`, { json });
}

describe('case JSON export and import', () => {
	it('exports a case and imports it back as an identical new case', async () => {
		const res = await analyst.get(`/cases/${caseId}/export.json`, { accept: 'application/json' });
		expect(res.status).toBe(200);
		expect(res.headers.get('content-disposition')).toContain('C-702_C-702-Tomiyama-basis.case.json');
		const text = await res.text();
		expect(JSON.parse(text)).toEqual(doc);
		const imported = await importJson(analyst, text);
		expect(imported.status).toBe(303);
		const newId = /^\/cases\/([0-9a-f-]{36})$/.exec(imported.headers.get('location') ?? '')?.[1];
		expect(newId).toBeTruthy();
		expect(newId).not.toBe(caseId);
		const [row] = await handle.db.select().from(cases).where(eq(cases.id, newId!));
		expect(row.document).toEqual(doc);
		expect(row.columnId).toBe(columnId);
		expect(row.schemaVersion).toBe(SCHEMA_VERSION);
	});

	it('refuses a newer or unknown schemaVersion with a clear message and creates nothing', async () => {
		const before = (await handle.db.select().from(cases).where(eq(cases.teamId, t.team.id))).length;
		const newer = await importJson(analyst, JSON.stringify({ ...doc, schemaVersion: SCHEMA_VERSION + 1 }));
		expect(newer.status).toBe(400);
		expect(await newer.text()).toContain(`This document has schemaVersion ${SCHEMA_VERSION + 1}, newer than this Twofold understands (${SCHEMA_VERSION})`);
		const unknown = await importJson(analyst, JSON.stringify({ ...doc, schemaVersion: 'beta' }));
		expect(unknown.status).toBe(400);
		expect(await unknown.text()).toContain('The document has an unknown schemaVersion ("beta")');
		const broken = await importJson(analyst, '{ not json');
		expect(broken.status).toBe(400);
		expect(await broken.text()).toContain('The file is not valid JSON');
		expect((await handle.db.select().from(cases).where(eq(cases.teamId, t.team.id))).length).toBe(before);
	});

	it('lets a viewer export but not import, and hides cases from other teams', async () => {
		const viewer = await signedInClient(app.baseUrl, t.members.viewer);
		expect((await viewer.get(`/cases/${caseId}/export.json`, { accept: 'application/json' })).status).toBe(200);
		expect((await importJson(viewer, JSON.stringify(doc))).status).toBe(403);
		const other = await createTestTeam({ db: handle.db });
		const outsider = await signedInClient(app.baseUrl, other.members.admin);
		expect((await outsider.get(`/cases/${caseId}/export.json`, { accept: 'application/json' })).status).toBe(404);
		expect((await importJson(outsider, JSON.stringify(doc))).status).toBe(404);
	});
});
