/**
 * The JSON API `/api/v1` with personal API tokens, against the built app and a real database:
 *
 * - token lifecycle through the token page (create with field errors, shown once, stored hashed,
 *   list, revoke by owner and admin, audit lines), and what tokens may never do;
 * - a run queued, followed over server-sent events and downloaded with a token (real worker);
 * - role and team scoping of every route: the matrix is generated from the route files
 *   (`src/routes/api/v1/**\/+server.ts` and their exported methods) and fails for a route without
 *   an entry; another team's ids and malformed ids give 404;
 * - unknown, revoked, expired tokens and tokens of removed members give 401; the rate limit 429;
 * - the OpenAPI round trip: the served document is a valid OpenAPI 3.1 document (a general-purpose
 *   OpenAPI validator), and every response this file receives is validated against it (JSON
 *   Schema 2020-12 with Ajv), so the document cannot drift from what the routes answer.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomBytes } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { and, eq, inArray, sql } from 'drizzle-orm';
import { Packr } from 'msgpackr';
import { Validator } from '@seriousme/openapi-schema-validator';
import { Ajv2020 } from 'ajv/dist/2020.js';
import addFormatsModule from 'ajv-formats';
import { startApp, type RunningApp } from '../helpers/app.js';
import { openTestDb } from '../helpers/db.js';
import { signedInClient, TestClient } from '../helpers/http.js';
import { ALL_ROLES, createTestTeam, type TestTeam } from '../helpers/team.js';
import { startWorker, waitFor, type WorkerProcess } from '../helpers/workers.js';
import { readSseEvents, type SseEvent } from '../helpers/runs.js';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { apiTokens, auditLog, cases, columns, comparisons, measurements, memberships, residuals, runs, snapshots, teams, users, type Role } from '../../src/lib/server/db/schema.js';
import { encodeSnapshot } from '../../src/lib/server/runs/codec.js';
import { SOLVER_VERSION } from '../../solver/index.js';
import { defaultCase, SCHEMA_VERSION, type CaseDocument } from '../../solver/case.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const API_DIR = path.join(ROOT, 'src/routes/api/v1');
const API = '/api/v1';
// ajv-formats is CommonJS: its default export arrives wrapped under some loaders
const addFormats = ((addFormatsModule as unknown as { default?: typeof addFormatsModule }).default ?? addFormatsModule) as unknown as (ajv: Ajv2020) => void;

// ------------------------------------------------------------------ the route list

interface Route {
	method: string;
	/** OpenAPI form, relative to /api/v1: `/runs/{id}/cancel` */
	path: string;
	key: string;
}

/** Every `+server.ts` under /api/v1 and the HTTP methods it exports. */
function routeList(): Route[] {
	const out: Route[] = [];
	for (const rel of readdirSync(API_DIR, { recursive: true }) as string[]) {
		if (path.basename(rel) !== '+server.ts') continue;
		const dir = path.dirname(rel);
		const routePath = '/' + (dir === '.' ? '' : dir.split(path.sep).map((s) => s.replace(/^\[(\w+)\]$/, '{$1}')).join('/'));
		const source = readFileSync(path.join(API_DIR, rel), 'utf8');
		for (const m of source.matchAll(/export const (GET|POST|PUT|PATCH|DELETE)\b/g)) out.push({ method: m[1], path: routePath, key: `${m[1]} ${routePath}` });
	}
	return out.sort((a, b) => a.key.localeCompare(b.key));
}

const ROUTES = routeList();

// ------------------------------------------------------------------ the document and its validators

type Json = any; // eslint-disable-line @typescript-eslint/no-explicit-any
const DOC_ID = 'https://twofold.invalid/openapi';
let doc: Json = null;
let ajv: Ajv2020;
/** `METHOD template status` of every response validated, to show each route was answered */
const validated = new Set<string>();

function useDocument(d: Json) {
	doc = d;
	ajv = new Ajv2020({ strict: false, allErrors: true });
	addFormats(ajv);
	// the component schemas as one JSON Schema document, their references pointing into it
	const defs = JSON.parse(JSON.stringify(d.components.schemas).replaceAll('"#/components/schemas/', `"${DOC_ID}#/$defs/`));
	ajv.addSchema({ $id: DOC_ID, $defs: defs });
}

function schemaFor(schema: Json) {
	const text = JSON.stringify(schema).replaceAll('"#/components/schemas/', `"${DOC_ID}#/$defs/`);
	return ajv.compile(JSON.parse(text));
}

function findOperation(method: string, pathname: string): { template: string; op: Json } | null {
	const rel = pathname.slice(API.length) || '/';
	for (const [template, item] of Object.entries(doc.paths as Record<string, Json>)) {
		const re = new RegExp('^' + template.replace(/[.]/g, '\\.').replace(/\{[^}]+\}/g, '[^/]+') + '$');
		if (re.test(rel) && item[method.toLowerCase()]) return { template, op: item[method.toLowerCase()] };
	}
	return null;
}

/** The response must be documented for its route and status, and its JSON body must match the schema. */
function expectDocumented(method: string, url: URL, status: number, headers: Headers, body: string | null) {
	if (!doc) return;
	const found = findOperation(method, url.pathname);
	expect(found, `${method} ${url.pathname} is not in the OpenAPI document`).toBeTruthy();
	let response = found!.op.responses[String(status)];
	expect(response, `${method} ${found!.template} answered ${status}, which the document does not list`).toBeTruthy();
	if (response.$ref) response = doc.components.responses[response.$ref.replace('#/components/responses/', '')];
	const type = (headers.get('content-type') ?? '').split(';')[0].trim();
	if (!response.content) {
		expect(body ?? '', `${method} ${found!.template} ${status} should have no body`).toBe('');
	} else {
		expect(Object.keys(response.content), `${method} ${found!.template} ${status}: content type ${type}`).toContain(type);
		if (type === 'application/json' && body !== null) {
			const schema = response.content[type].schema;
			if (schema) {
				const validate = schemaFor(schema);
				const ok = validate(JSON.parse(body));
				expect(ok, `${method} ${found!.template} ${status} does not match the document:\n${JSON.stringify(validate.errors, null, 1)?.slice(0, 3000)}\n${body.slice(0, 800)}`).toBe(true);
			}
		}
	}
	for (const name of Object.keys(response.headers ?? {})) {
		if (name === 'Retry-After' || (name === 'ETag' && status < 400)) expect(headers.get(name), `${found!.template} ${status} header ${name}`).toBeTruthy();
	}
	validated.add(`${method} ${found!.template} ${status}`);
}

// ------------------------------------------------------------------ requests

interface ApiAnswer {
	status: number;
	headers: Headers;
	text: string;
	json: Json;
	bytes: Uint8Array;
}

let app: RunningApp;

async function api(o: {
	token?: string | null;
	method?: string;
	path: string;
	body?: unknown;
	raw?: { type: string; text: string };
	headers?: Record<string, string>;
	base?: string;
}): Promise<ApiAnswer> {
	const method = o.method ?? 'GET';
	const url = new URL(o.path.startsWith('/api/') ? o.path : API + o.path, o.base ?? app.baseUrl);
	const headers: Record<string, string> = { accept: 'application/json', ...o.headers };
	if (o.token) headers.authorization = `Bearer ${o.token}`;
	let body: string | undefined;
	if (o.body !== undefined) {
		headers['content-type'] = 'application/json';
		body = JSON.stringify(o.body);
	} else if (o.raw) {
		headers['content-type'] = o.raw.type;
		body = o.raw.text;
	}
	const controller = new AbortController();
	const res = await fetch(url, { method, headers, body, redirect: 'manual', signal: controller.signal });
	const type = res.headers.get('content-type') ?? '';
	if (type.startsWith('text/event-stream')) {
		controller.abort();
		if (url.pathname.startsWith(API)) expectDocumented(method, url, res.status, res.headers, null);
		return { status: res.status, headers: res.headers, text: '', json: null, bytes: new Uint8Array() };
	}
	const bytes = new Uint8Array(await res.arrayBuffer());
	const text = type.includes('msgpack') ? '' : new TextDecoder().decode(bytes);
	if (url.pathname.startsWith(API)) expectDocumented(method, url, res.status, res.headers, type.includes('msgpack') ? null : text);
	let json: Json = null;
	if (type.includes('json') && text) json = JSON.parse(text);
	return { status: res.status, headers: res.headers, text, json, bytes };
}

function expectError(r: ApiAnswer, status: number, code?: string) {
	expect(r.status, r.text.slice(0, 500)).toBe(status);
	expect(r.json?.error?.message, 'the uniform error body').toBeTypeOf('string');
	expect(Array.isArray(r.json.error.issues)).toBe(true);
	if (code) expect(r.json.error.code).toBe(code);
}

// ------------------------------------------------------------------ fixtures

let handle: DbHandle;
let home: TestTeam;
let other: TestTeam;
const tokens = {} as Record<Role, string>;
let readAdmin: string;
let outsider: string;

const sha256 = (s: string) => createHash('sha256').update(s).digest('hex');

/** A token written straight into the table, in the documented format. */
async function mintToken(o: { team: TestTeam; role: Role; scope: 'read' | 'role'; expiresAt?: Date | null; revokedAt?: Date | null }): Promise<string> {
	const token = 'tf_' + randomBytes(32).toString('base64url');
	await handle.db.insert(apiTokens).values({
		teamId: o.team.team.id,
		userId: o.team.members[o.role].id,
		name: `${o.role} ${o.scope}`,
		prefix: token.slice(0, 10),
		tokenHash: sha256(token),
		scope: o.scope,
		expiresAt: o.expiresAt ?? null,
		revokedAt: o.revokedAt ?? null
	});
	return token;
}

/** 1 m column, 40 cells: a worker finishes it in well under a second. */
function smallCase(name = 'API small case'): CaseDocument {
	const c = defaultCase('height-profile');
	c.name = name;
	c.geometry.heightM = 1;
	c.geometry.clearLiquidLevelM = 0.7;
	c.numerics.cells = 40;
	c.numerics.endTimeS = 60;
	c.numerics.snapshotIntervalS = 1;
	return c;
}

const fx = {} as {
	columnId: string;
	caseId: string;
	caseDoc: CaseDocument;
	runId: string;
	secondRunId: string;
	finalSnapshotId: number;
	measurementId: string;
	comparisonId: string;
	studyId: string;
};

async function insertColumn(teamId: string, tag = `API-${randomBytes(3).toString('hex')}`) {
	const [c] = await handle.db.insert(columns).values({ teamId, tag, service: 'api test', diameterM: 0.2, heightM: 3 }).returning();
	return c.id;
}

/** A converged run with residuals, a periodic and a final snapshot, written as the worker would. */
async function insertFinishedRun(): Promise<{ runId: string; finalSnapshotId: number }> {
	const [run] = await handle.db
		.insert(runs)
		.values({
			teamId: home.team.id,
			columnId: fx.columnId,
			caseId: fx.caseId,
			caseDocument: fx.caseDoc,
			solverVersion: SOLVER_VERSION,
			status: 'converged',
			queuedBy: home.members.analyst.id,
			startedAt: new Date(Date.now() - 2000),
			finishedAt: new Date(),
			attempts: 1,
			steps: 20,
			simulatedTimeS: 2,
			wallTimeS: 0.2,
			summary: { design: { overallHoldup: { value: 0.12, unit: '1', label: 'overall gas holdup' } } }
		})
		.returning();
	await handle.db.insert(residuals).values([1, 2, 3, 10, 20].map((step) => ({ runId: run.id, step, simulatedTimeS: step / 10, values: { holdup: 1 / step, liquidVelocity: 0.5 / step } })));
	const x = Array.from({ length: 10 }, (_, i) => (i + 0.5) / 10);
	const fields = { holdup: x.map((v) => 0.1 + 0.01 * v), pressure: x.map((v) => 1.1e5 - 1e4 * v) };
	await handle.db.insert(snapshots).values({ runId: run.id, step: 10, simulatedTimeS: 1, isFinal: false, data: Buffer.from(encodeSnapshot({ step: 10, timeS: 1, x, fields }, { precision: 'float32' })) });
	const [fin] = await handle.db
		.insert(snapshots)
		.values({ runId: run.id, step: 20, simulatedTimeS: 2, isFinal: true, data: Buffer.from(encodeSnapshot({ step: 20, timeS: 2, x, fields })) })
		.returning();
	return { runId: run.id, finalSnapshotId: fin.id };
}

async function insertQueuedRun(): Promise<string> {
	const [run] = await handle.db
		.insert(runs)
		.values({ teamId: home.team.id, columnId: fx.columnId, caseId: fx.caseId, caseDocument: fx.caseDoc, solverVersion: SOLVER_VERSION, status: 'queued', queuedBy: home.members.analyst.id })
		.returning();
	return run.id;
}

async function insertMeasurement(): Promise<string> {
	const [m] = await handle.db
		.insert(measurements)
		.values({
			teamId: home.team.id,
			columnId: fx.columnId,
			kind: 'holdup-height',
			name: `probe ${randomBytes(2).toString('hex')}`,
			superficialGasVelocityMS: 0.05,
			temperatureK: 293.15,
			pressurePa: 101325,
			units: { x: 'm', y: '1' },
			data: { x: [0.2, 0.5, 0.9], y: [0.1, 0.11, 0.12] },
			createdBy: home.members.analyst.id
		})
		.returning();
	return m.id;
}

const studyBody = () => ({
	caseId: fx.caseId,
	name: `API sweep ${randomBytes(2).toString('hex')}`,
	spec: { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'list', values: [0.02, 0.04] }] }
});

async function createStudy(): Promise<string> {
	const r = await api({ token: tokens.admin, method: 'POST', path: '/studies', body: studyBody() });
	expect(r.status, r.text).toBe(201);
	return r.json.study.id;
}

const uploadBody = () => ({
	columnId: fx.columnId,
	kind: 'holdup-height',
	name: `API upload ${randomBytes(2).toString('hex')}`,
	xUnit: 'm',
	yUnit: '1',
	superficialGasVelocity: 0.05,
	superficialGasVelocityUnit: 'm/s',
	temperature: 20,
	temperatureUnit: 'C',
	pressure: 101.325,
	pressureUnit: 'kPa',
	rows: [
		[0.2, 0.05],
		[0.5, 0.06],
		[1.0, 0.07]
	]
});

// ------------------------------------------------------------------ set-up

beforeAll(async () => {
	handle = await openTestDb();
	home = await createTestTeam({ db: handle.db, name: 'API home team' });
	other = await createTestTeam({ db: handle.db, name: 'API other team' });
	// the matrix queues many runs (no worker takes them): lift the team's limit of active runs
	await handle.db.update(teams).set({ maxActiveRuns: 10_000 }).where(eq(teams.id, home.team.id));
	for (const role of ALL_ROLES) tokens[role] = await mintToken({ team: home, role, scope: 'role' });
	readAdmin = await mintToken({ team: home, role: 'admin', scope: 'read' });
	outsider = await mintToken({ team: other, role: 'admin', scope: 'role' });

	fx.columnId = await insertColumn(home.team.id);
	fx.caseDoc = smallCase();
	const [c] = await handle.db
		.insert(cases)
		.values({ teamId: home.team.id, columnId: fx.columnId, name: fx.caseDoc.name, kind: fx.caseDoc.kind, schemaVersion: fx.caseDoc.schemaVersion, document: fx.caseDoc, createdBy: home.members.analyst.id })
		.returning();
	fx.caseId = c.id;
	({ runId: fx.runId, finalSnapshotId: fx.finalSnapshotId } = await insertFinishedRun());
	fx.secondRunId = (await insertFinishedRun()).runId;
	fx.measurementId = await insertMeasurement();
	const [cmp] = await handle.db
		.insert(comparisons)
		.values({ teamId: home.team.id, columnId: fx.columnId, name: 'API comparison', runIds: [fx.runId, fx.secondRunId], baselineRunId: fx.runId, createdBy: home.members.lead.id })
		.returning();
	fx.comparisonId = cmp.id;

	app = await startApp({ env: { TWOFOLD_API_RATE_PER_MIN: '1000000', TWOFOLD_API_BURST: '1000000' } });
	// the document first: every later answer is checked against it
	const res = await fetch(`${app.baseUrl}${API}/openapi.json`, { headers: { authorization: `Bearer ${tokens.viewer}` } });
	expect(res.status).toBe(200);
	useDocument(await res.json());
	fx.studyId = await createStudy();
});

afterAll(async () => {
	// the runs the matrix queued would keep the next test file's workers busy: cancel them with their jobs
	if (app && handle) {
		const queued = await handle.db.select({ id: runs.id }).from(runs).where(and(eq(runs.teamId, home.team.id), inArray(runs.status, ['queued', 'running'])));
		for (const r of queued) await fetch(`${app.baseUrl}${API}/runs/${r.id}/cancel`, { method: 'POST', headers: { authorization: `Bearer ${tokens.admin}` } });
	}
	await app?.stop();
	await handle?.close();
});

// ------------------------------------------------------------------ the document

describe('the OpenAPI document', () => {
	it('is a valid OpenAPI 3.1 document', async () => {
		const validator = new Validator();
		const result = await validator.validate(structuredClone(doc));
		expect(result.errors ?? [], JSON.stringify(result.errors)).toEqual([]);
		expect(result.valid).toBe(true);
		expect(validator.version).toBe('3.1');
	});

	it('lists exactly the routes under src/routes/api/v1, with a role each', () => {
		const documented = Object.entries(doc.paths as Record<string, Json>)
			.flatMap(([p, item]) => Object.keys(item).map((m) => `${m.toUpperCase()} ${p}`))
			.sort();
		expect(documented).toEqual(ROUTES.map((r) => r.key));
		for (const [, item] of Object.entries(doc.paths as Record<string, Json>)) {
			for (const op of Object.values(item as Record<string, Json>)) expect(ALL_ROLES).toContain(op['x-min-role']);
		}
	});

	it('is served to members, and the reference page draws it', async () => {
		expectError(await api({ path: '/openapi.json' }), 401, 'unauthorized');
		const viewer = await signedInClient(app.baseUrl, home.members.viewer);
		const page = await viewer.get('/team/api');
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('API reference');
		expect(html).toContain('/runs/{id}/events');
		expect(html).toContain('schema-CaseDocument');
	});
});

// ------------------------------------------------------------------ token lifecycle

describe('token lifecycle', () => {
	let analyst: TestClient;
	let token: string;
	let tokenId: string;

	beforeAll(async () => {
		analyst = await signedInClient(app.baseUrl, home.members.analyst);
	});

	it('refuses a bad form, naming the field', async () => {
		const cases: [Record<string, string>, string][] = [
			[{ name: '', scope: 'read' }, 'Give the token a name'],
			[{ name: 'x'.repeat(81), scope: 'read' }, '80 characters'],
			[{ name: 'ok', scope: 'admin' }, 'Choose read-only or your role'],
			[{ name: 'ok', scope: 'read', expiresOn: new Date(Date.now() - 86_400_000).toISOString().slice(0, 10) }, 'after today'],
			[{ name: 'ok', scope: 'read', expiresOn: '31/12/2030' }, 'Enter a date']
		];
		for (const [form, message] of cases) {
			const res = await analyst.post('/team/tokens?/create', form);
			expect(res.status, JSON.stringify(form)).toBe(400);
			expect(await res.text()).toContain(message);
		}
		const [{ n }] = await handle.db.select({ n: sql<number>`count(*)::int` }).from(apiTokens).where(eq(apiTokens.userId, home.members.analyst.id));
		expect(n).toBe(1); // only the minted one
	});

	it('creates a token, shows it once and stores only its SHA-256', async () => {
		const expiresOn = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10);
		const res = await analyst.post('/team/tokens?/create', { name: 'lab notebook 7', scope: 'role', expiresOn });
		expect(res.status).toBe(200);
		const html = await res.text();
		const m = /tf_[A-Za-z0-9_-]{43}/.exec(html);
		expect(m, 'the new token is on the page').toBeTruthy();
		token = m![0];
		const [row] = await handle.db.select().from(apiTokens).where(eq(apiTokens.tokenHash, sha256(token)));
		expect(row.name).toBe('lab notebook 7');
		expect(row.scope).toBe('role');
		expect(row.prefix).toBe(token.slice(0, 10));
		expect(row.expiresAt?.toISOString()).toBe(`${expiresOn}T00:00:00.000Z`);
		expect(Object.values(row).map(String)).not.toContain(token);
		tokenId = row.id;
		const [line] = await handle.db.select().from(auditLog).where(and(eq(auditLog.action, 'apiToken.create'), eq(auditLog.subject, tokenId)));
		expect(line.userId).toBe(home.members.analyst.id);
		// listed by prefix; the token itself is never shown again
		const list = await (await analyst.get('/team/tokens')).text();
		expect(list).toContain('lab notebook 7');
		expect(list).toContain(`${token.slice(0, 10)}…`);
		expect(list).not.toContain(token);
	});

	it('acts as its member with their role, and notes when it was last used (at most once a minute)', async () => {
		const me = await api({ token, path: '/me' });
		expect(me.status).toBe(200);
		expect(me.json).toMatchObject({ role: 'analyst', user: { email: home.members.analyst.email }, team: { id: home.team.id }, token: { id: tokenId, scope: 'role' } });
		const [first] = await handle.db.select({ at: apiTokens.lastUsedAt }).from(apiTokens).where(eq(apiTokens.id, tokenId));
		expect(first.at).toBeInstanceOf(Date);
		await api({ token, path: '/me' });
		const [second] = await handle.db.select({ at: apiTokens.lastUsedAt }).from(apiTokens).where(eq(apiTokens.id, tokenId));
		expect(second.at?.getTime()).toBe(first.at?.getTime());
	});

	it('cannot manage tokens itself', async () => {
		const res = await fetch(`${app.baseUrl}/team/tokens`, { headers: { authorization: `Bearer ${token}`, accept: 'text/html' }, redirect: 'manual' });
		expect(res.status).toBe(403);
	});

	it("keeps other members' tokens out of reach; admins see and revoke all of the team's", async () => {
		const viewer = await signedInClient(app.baseUrl, home.members.viewer);
		expect(await (await viewer.get('/team/tokens')).text()).not.toContain('lab notebook 7');
		expect((await viewer.post('/team/tokens?/revoke', { tokenId })).status).toBe(404);
		const outsiderAdmin = await signedInClient(app.baseUrl, other.members.admin);
		expect((await outsiderAdmin.post('/team/tokens?/revoke', { tokenId })).status).toBe(404);
		expect((await api({ token, path: '/me' })).status).toBe(200);

		const admin = await signedInClient(app.baseUrl, home.members.admin);
		const list = await (await admin.get('/team/tokens')).text();
		expect(list).toContain('lab notebook 7');
		expect(list).toContain(home.members.analyst.email);
		expect((await admin.post('/team/tokens?/revoke', { tokenId })).status).toBe(200);
		const [line] = await handle.db.select().from(auditLog).where(and(eq(auditLog.action, 'apiToken.revoke'), eq(auditLog.subject, tokenId)));
		expect(line.userId).toBe(home.members.admin.id);
	});

	it('answers 401 with the uniform body once revoked', async () => {
		const r = await api({ token, path: '/me' });
		expectError(r, 401, 'unauthorized');
		expect(r.json.error.message).toMatch(/revoked/);
		expect(r.headers.get('www-authenticate')).toMatch(/^Bearer/);
	});

	it('lets a member revoke their own token', async () => {
		const res = await analyst.post('/team/tokens?/create', { name: 'short-lived', scope: 'read' });
		const own = /tf_[A-Za-z0-9_-]{43}/.exec(await res.text())![0];
		const [row] = await handle.db.select().from(apiTokens).where(eq(apiTokens.tokenHash, sha256(own)));
		expect((await api({ token: own, path: '/me' })).json.role).toBe('viewer');
		expect((await analyst.post('/team/tokens?/revoke', { tokenId: row.id })).status).toBe(200);
		expectError(await api({ token: own, path: '/me' }), 401);
	});
});

describe('tokens that do not count', () => {
	it('answers 401 to unknown, malformed, expired and orphaned tokens and other schemes', async () => {
		expectError(await api({ token: 'tf_' + randomBytes(32).toString('base64url'), path: '/me' }), 401, 'unauthorized');
		expectError(await api({ token: 'not-a-token', path: '/columns' }), 401);
		expectError(await api({ path: '/me', headers: { authorization: 'Basic dXNlcjpwYXNz' } }), 401);
		const expired = await mintToken({ team: home, role: 'lead', scope: 'role', expiresAt: new Date(Date.now() - 1000) });
		const r = await api({ token: expired, path: '/me' });
		expectError(r, 401);
		expect(r.json.error.message).toMatch(/expired/);
		const revoked = await mintToken({ team: home, role: 'lead', scope: 'role', revokedAt: new Date() });
		expectError(await api({ token: revoked, path: `/runs/${fx.runId}` }), 401);
		// a member who left the team: their tokens stop working
		const [u] = await handle.db.insert(users).values({ email: `leaver-${randomBytes(3).toString('hex')}@test.invalid` }).returning();
		await handle.db.insert(memberships).values({ teamId: home.team.id, userId: u.id, role: 'analyst' });
		const leaverToken = 'tf_' + randomBytes(32).toString('base64url');
		await handle.db.insert(apiTokens).values({ teamId: home.team.id, userId: u.id, name: 'leaver', prefix: leaverToken.slice(0, 10), tokenHash: sha256(leaverToken), scope: 'role' });
		expect((await api({ token: leaverToken, path: '/me' })).status).toBe(200);
		await handle.db.delete(memberships).where(and(eq(memberships.teamId, home.team.id), eq(memberships.userId, u.id)));
		expectError(await api({ token: leaverToken, path: '/me' }), 401);
	});

	it('answers an anonymous API request 401 in JSON, never with a redirect to sign-in', async () => {
		const r = await api({ path: '/runs', headers: { accept: 'text/html' } });
		expectError(r, 401, 'unauthorized');
	});

	it('follows the member: a demoted member’s token is demoted with them, a read-only token is a viewer', async () => {
		const [u] = await handle.db.insert(users).values({ email: `demoted-${randomBytes(3).toString('hex')}@test.invalid` }).returning();
		await handle.db.insert(memberships).values({ teamId: home.team.id, userId: u.id, role: 'lead' });
		const t = 'tf_' + randomBytes(32).toString('base64url');
		await handle.db.insert(apiTokens).values({ teamId: home.team.id, userId: u.id, name: 'demoted', prefix: t.slice(0, 10), tokenHash: sha256(t), scope: 'role' });
		expect((await api({ token: t, path: '/me' })).json.role).toBe('lead');
		await handle.db.update(memberships).set({ role: 'viewer' }).where(and(eq(memberships.teamId, home.team.id), eq(memberships.userId, u.id)));
		expect((await api({ token: t, path: '/me' })).json.role).toBe('viewer');
		expectError(await api({ token: t, method: 'POST', path: '/runs', body: { caseId: fx.caseId } }), 403, 'forbidden');

		expect((await api({ token: readAdmin, path: '/me' })).json).toMatchObject({ role: 'viewer', token: { scope: 'read' } });
		const r = await api({ token: readAdmin, method: 'POST', path: '/runs', body: { caseId: fx.caseId } });
		expectError(r, 403, 'forbidden');
		expect(r.json.error.message).toMatch(/read-only/);
	});
});

// ------------------------------------------------------------------ a run from a script, live

async function readEvents(o: { token: string; path: string; until: (e: SseEvent) => boolean; timeoutMs?: number }): Promise<SseEvent[]> {
	const controller = new AbortController();
	const timer = setTimeout(() => controller.abort(), o.timeoutMs ?? 60_000);
	const res = await fetch(new URL(o.path, app.baseUrl), { headers: { authorization: `Bearer ${o.token}`, accept: 'text/event-stream' }, signal: controller.signal });
	if (o.path.startsWith(API)) expectDocumented('GET', new URL(o.path, app.baseUrl), res.status, res.headers, null);
	expect(res.status).toBe(200);
	const events: SseEvent[] = [];
	try {
		const done = await readSseEvents(res.body!, (e) => {
			events.push(e);
			return o.until(e);
		});
		if (done) {
			controller.abort();
			return events;
		}
	} catch (err) {
		if (!controller.signal.aborted) throw err;
		if (!events.length || !o.until(events[events.length - 1])) throw new Error(`event stream timed out after ${events.length} events`);
	} finally {
		clearTimeout(timer);
	}
	return events;
}

describe('a run from a script: create the case, queue, follow, download', () => {
	let worker: WorkerProcess | null = null;

	afterAll(async () => {
		await worker?.stop();
	});

	it('works with a token end to end, over server-sent events with Authorization', async () => {
		worker = await startWorker(app);
		const t = tokens.analyst;
		const created = await api({ token: t, method: 'POST', path: '/cases', body: { columnId: fx.columnId, document: smallCase('from a script') } });
		expect(created.status, created.text).toBe(201);
		const queued = await api({ token: t, method: 'POST', path: '/runs', body: { caseId: created.json.id } });
		expect(queued.status, queued.text).toBe(201);
		const runId = queued.json.run.id as string;

		const events = await readEvents({ token: t, path: `${API}/runs/${runId}/events`, until: (e) => e.event === 'status' && ['converged', 'finished', 'failed', 'cancelled'].includes(e.data.status) });
		expect(events.at(-1)!.data.status).toBe('converged');
		expect(events.some((e) => e.event === 'residuals')).toBe(true);
		// the event stream of the run page takes the token too
		const pageStream = await readEvents({ token: t, path: `/runs/${runId}/events`, until: (e) => e.event === 'status' && e.data.status === 'converged' });
		expect(pageStream.length).toBeGreaterThan(0);

		const status = await api({ token: t, path: `/runs/${runId}` });
		expect(status.json).toMatchObject({ id: runId, status: 'converged', caseDocument: { name: 'from a script' } });

		const results = await api({ token: t, path: `/runs/${runId}/results` });
		expect(results.status).toBe(200);
		expect(results.json.profiles.isFinal).toBe(true);
		expect(results.json.profiles.x).toHaveLength(40);
		const etag = results.headers.get('etag')!;
		const again = await api({ token: t, path: `/runs/${runId}/results`, headers: { 'if-none-match': etag } });
		expect(again.status).toBe(304);
		expect(again.headers.get('etag')).toBe(etag);

		// residual history, walked page by page
		const [{ n }] = await handle.db.select({ n: sql<number>`count(*)::int` }).from(residuals).where(eq(residuals.runId, runId));
		let cursor: string | null = null;
		const steps: number[] = [];
		do {
			const page: ApiAnswer = await api({ token: t, path: `/runs/${runId}/residuals?limit=100${cursor ? `&cursor=${cursor}` : ''}` });
			steps.push(...page.json.items.map((p: { step: number }) => p.step));
			cursor = page.json.nextCursor;
		} while (cursor);
		expect(steps).toHaveLength(n);
		expect([...steps].sort((a, b) => a - b)).toEqual(steps);

		// the final snapshot as JSON and as msgpack
		const list = await api({ token: t, path: `/runs/${runId}/snapshots` });
		const final = list.json.items.find((s: { isFinal: boolean }) => s.isFinal);
		const asJson = await api({ token: t, path: `/runs/${runId}/snapshots/${final.id}` });
		const asPack = await api({ token: t, path: `/runs/${runId}/snapshots/${final.id}`, headers: { accept: 'application/x-msgpack' } });
		expect(asPack.headers.get('content-type')).toBe('application/x-msgpack');
		const decoded = new Packr({ moreTypes: true }).unpack(asPack.bytes) as { x: Float64Array; names: string[] };
		expect(Array.from(decoded.x)).toEqual(asJson.json.x);
		expect(decoded.names.sort()).toEqual(Object.keys(asJson.json.fields).sort());
		expectError(await api({ token: t, path: `/runs/${runId}/snapshots/${final.id}`, headers: { accept: 'text/plain' } }), 406, 'not_acceptable');

		// the profiles as CSV, the page's download, with the token
		const csv = await fetch(`${app.baseUrl}/runs/${runId}/profiles.csv`, { headers: { authorization: `Bearer ${t}` } });
		expect(csv.status).toBe(200);
		expect(csv.headers.get('content-type')).toContain('text/csv');
		expect((await csv.text()).split('\n').length).toBeGreaterThan(40);
	});
});

// ------------------------------------------------------------------ role and team scoping of every route

interface Prepared {
	path: string;
	body?: unknown;
	raw?: { type: string; text: string };
	headers?: Record<string, string>;
}

/** One request per route that succeeds for a role that suffices (fresh rows where it consumes them). */
const prepare: Record<string, () => Promise<Prepared>> = {
	'GET /me': async () => ({ path: '/me' }),
	'GET /openapi.json': async () => ({ path: '/openapi.json' }),
	'GET /columns': async () => ({ path: '/columns?limit=5' }),
	'GET /columns/{id}': async () => ({ path: `/columns/${fx.columnId}` }),
	'GET /cases': async () => ({ path: `/cases?column=${fx.columnId}` }),
	'POST /cases': async () => ({ path: '/cases', body: { columnId: fx.columnId, document: { schemaVersion: 2, name: 'API matrix case', geometry: { heightM: 1, clearLiquidLevelM: 0.7 } } } }),
	'GET /cases/{id}': async () => ({ path: `/cases/${fx.caseId}` }),
	'PUT /cases/{id}': async () => ({ path: `/cases/${fx.caseId}`, body: { document: fx.caseDoc } }),
	'GET /cases/{id}/signoffs': async () => ({ path: `/cases/${fx.caseId}/signoffs` }),
	'POST /cases/{id}/signoffs': async () => ({ path: `/cases/${fx.caseId}/signoffs`, body: { verdict: 'approved-basis' } }),
	'GET /runs': async () => ({ path: `/runs?column=${fx.columnId}&status=converged,finished` }),
	'POST /runs': async () => ({ path: '/runs', body: { caseId: fx.caseId } }),
	'GET /runs/{id}': async () => ({ path: `/runs/${fx.runId}` }),
	'POST /runs/{id}/cancel': async () => ({ path: `/runs/${await insertQueuedRun()}/cancel` }),
	'POST /runs/{id}/rerun': async () => ({ path: `/runs/${fx.runId}/rerun` }),
	'GET /runs/{id}/results': async () => ({ path: `/runs/${fx.runId}/results` }),
	'GET /runs/{id}/residuals': async () => ({ path: `/runs/${fx.runId}/residuals?limit=2` }),
	'GET /runs/{id}/snapshots': async () => ({ path: `/runs/${fx.runId}/snapshots` }),
	'GET /runs/{id}/snapshots/{snapshotId}': async () => ({ path: `/runs/${fx.runId}/snapshots/${fx.finalSnapshotId}` }),
	'GET /runs/{id}/events': async () => ({ path: `/runs/${fx.runId}/events` }),
	'GET /studies': async () => ({ path: `/studies?column=${fx.columnId}` }),
	'POST /studies': async () => ({ path: '/studies', body: studyBody() }),
	'GET /studies/{id}': async () => ({ path: `/studies/${fx.studyId}` }),
	'POST /studies/{id}/cancel': async () => ({ path: `/studies/${fx.studyId}/cancel` }),
	'POST /studies/{id}/rerun': async () => {
		const id = await createStudy();
		await handle.db.update(runs).set({ status: 'failed', errorMessage: 'failed on purpose' }).where(eq(runs.studyId, id));
		return { path: `/studies/${id}/rerun` };
	},
	'GET /studies/{id}/signoffs': async () => ({ path: `/studies/${fx.studyId}/signoffs` }),
	'POST /studies/{id}/signoffs': async () => ({ path: `/studies/${fx.studyId}/signoffs`, body: { verdict: 'changes-requested', comment: 'finer grid first' } }),
	'GET /measurements': async () => ({ path: `/measurements?column=${fx.columnId}&kind=holdup-height` }),
	'POST /measurements': async () => ({ path: '/measurements', body: uploadBody() }),
	'GET /measurements/{id}': async () => ({ path: `/measurements/${fx.measurementId}` }),
	'DELETE /measurements/{id}': async () => ({ path: `/measurements/${await insertMeasurement()}` }),
	'GET /comparisons': async () => ({ path: `/comparisons?column=${fx.columnId}` }),
	'POST /comparisons': async () => ({ path: '/comparisons', body: { columnId: fx.columnId, name: 'API matrix comparison', runIds: [fx.runId, fx.secondRunId], baselineRunId: fx.secondRunId } }),
	'GET /comparisons/{id}': async () => ({ path: `/comparisons/${fx.comparisonId}` }),
	'GET /comparisons/{id}/signoffs': async () => ({ path: `/comparisons/${fx.comparisonId}/signoffs` }),
	'POST /comparisons/{id}/signoffs': async () => ({ path: `/comparisons/${fx.comparisonId}/signoffs`, body: { verdict: 'approved-basis', comment: '' } })
};

const rank = (r: Role) => ALL_ROLES.indexOf(r);
const minRoleOf = (route: Route): Role => doc.paths[route.path][route.method.toLowerCase()]['x-min-role'];
const successStatuses = (route: Route) =>
	Object.keys(doc.paths[route.path][route.method.toLowerCase()].responses)
		.map(Number)
		.filter((s) => s < 300);

async function call(route: Route, token: string | null, p: Prepared, pathOverride?: string): Promise<ApiAnswer> {
	return api({ token, method: route.method, path: pathOverride ?? p.path, body: p.body, raw: p.raw, headers: p.headers });
}

describe.each(ROUTES)('$key', (route) => {
	it('has an entry in this matrix', () => {
		expect(prepare[route.key], `add "${route.key}" to the matrix in tests/integration/api.test.ts`).toBeTypeOf('function');
	});

	it('answers 401 without a token', async () => {
		const r = await call(route, null, await prepare[route.key]());
		expectError(r, 401, 'unauthorized');
	});

	it.each(ALL_ROLES)('answers %s as its role allows', async (role) => {
		const r = await call(route, tokens[role], await prepare[route.key]());
		if (rank(role) >= rank(minRoleOf(route))) expect(successStatuses(route), `${role}: ${r.status} ${r.text.slice(0, 400)}`).toContain(r.status);
		else expectError(r, 403, 'forbidden');
	});

	it('treats a read-only token of an admin as a viewer', async () => {
		const r = await call(route, readAdmin, await prepare[route.key]());
		if (minRoleOf(route) === 'viewer') expect(successStatuses(route), r.text.slice(0, 400)).toContain(r.status);
		else expectError(r, 403, 'forbidden');
	});

	if (route.path.includes('{')) {
		it("answers 404 to another team's admin asking for this team's row", async () => {
			const r = await call(route, outsider, await prepare[route.key]());
			expectError(r, 404, 'not_found');
		});

		it('answers 404 to a malformed id', async () => {
			const p = await prepare[route.key]();
			const template = route.path.split('/');
			const malformed = p.path
				.split('?')[0]
				.split('/')
				.map((segment, i) => (template[i]?.startsWith('{') ? 'not-an-id' : segment))
				.join('/');
			expectError(await call(route, tokens.admin, p, malformed), 404, 'not_found');
		});
	}
});

describe('ids in bodies and lists', () => {
	it("answers 404 naming the field for another team's ids in a body", async () => {
		const [foreignCase] = await handle.db.select({ id: cases.id }).from(cases).where(eq(cases.teamId, home.team.id)).limit(1);
		const queued = await api({ token: outsider, method: 'POST', path: '/runs', body: { caseId: foreignCase.id } });
		expectError(queued, 404, 'not_found');
		const created = await api({ token: outsider, method: 'POST', path: '/cases', body: { columnId: fx.columnId, document: { schemaVersion: 2 } } });
		expectError(created, 404);
		expect(created.json.error.issues[0].path).toBe('columnId');
		const study = await api({ token: outsider, method: 'POST', path: '/studies', body: studyBody() });
		expectError(study, 404);
		const upload = await api({ token: outsider, method: 'POST', path: '/measurements', body: uploadBody() });
		expectError(upload, 404);
	});

	it("never lists another team's rows", async () => {
		for (const list of ['/columns', '/cases', '/runs', '/studies', '/measurements', '/comparisons']) {
			const r = await api({ token: outsider, path: `${list}?limit=200` });
			expect(r.status).toBe(200);
			expect(JSON.stringify(r.json.items)).not.toContain(fx.columnId);
		}
	});
});

describe('bodies, pages and filters', () => {
	it('upgrades a case document of an earlier schema version, as an imported file is: a version-2 cross-section keeps its one size', async () => {
		const r = await api({ token: tokens.analyst, method: 'POST', path: '/cases', body: { columnId: fx.columnId, document: { schemaVersion: 2, kind: 'cross-section', name: 'API v2 section' } } });
		expect(r.status).toBe(201);
		expect(r.json.document.schemaVersion).toBe(SCHEMA_VERSION);
		expect(r.json.document.bubbles.classes).toBe('single');
		const now = await api({ token: tokens.analyst, method: 'POST', path: '/cases', body: { columnId: fx.columnId, document: { schemaVersion: SCHEMA_VERSION, kind: 'cross-section', name: 'API v3 section' } } });
		expect(now.status).toBe(201);
		expect(now.json.document.bubbles.classes).toBe('small-large');
	});

	it('refuses an invalid case naming the field path, and stores nothing', async () => {
		const [{ n: before }] = await handle.db.select({ n: sql<number>`count(*)::int` }).from(cases).where(eq(cases.teamId, home.team.id));
		const r = await api({ token: tokens.analyst, method: 'POST', path: '/cases', body: { columnId: fx.columnId, document: { schemaVersion: 2, geometry: { heightM: 500 }, numerics: { cells: 'many' } } } });
		expectError(r, 400, 'invalid_input');
		const paths = r.json.error.issues.map((i: { path: string }) => i.path);
		expect(paths).toContain('document.geometry.heightM');
		expect(paths).toContain('document.numerics.cells');
		const bad = await api({ token: tokens.analyst, method: 'POST', path: '/runs', body: { caseId: 'nope' } });
		expectError(bad, 400);
		expect(bad.json.error.issues[0].path).toBe('caseId');
		expectError(await api({ token: tokens.analyst, method: 'POST', path: '/runs', raw: { type: 'application/json', text: '{"caseId":' } }), 400, 'invalid_json');
		expectError(await api({ token: tokens.analyst, method: 'POST', path: '/runs', raw: { type: 'application/xml', text: '<run/>' } }), 415, 'unsupported_media_type');
		const [{ n: after }] = await handle.db.select({ n: sql<number>`count(*)::int` }).from(cases).where(eq(cases.teamId, home.team.id));
		expect(after).toBe(before);
	});

	it('pages with opaque cursors, never skipping or repeating, and refuses bad paging parameters', async () => {
		const ids = [];
		for (let i = 0; i < 5; i++) ids.push(await insertColumn(home.team.id, `PAGE-${i}-${randomBytes(2).toString('hex')}`));
		const seen: string[] = [];
		let cursor: string | null = null;
		do {
			const page: ApiAnswer = await api({ token: tokens.viewer, path: `/columns?limit=2${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ''}` });
			expect(page.json.items.length).toBeLessThanOrEqual(2);
			seen.push(...page.json.items.map((c: { id: string }) => c.id));
			cursor = page.json.nextCursor;
		} while (cursor);
		expect(new Set(seen).size).toBe(seen.length);
		for (const id of ids) expect(seen).toContain(id);
		const [{ n }] = await handle.db.select({ n: sql<number>`count(*)::int` }).from(columns).where(eq(columns.teamId, home.team.id));
		expect(seen).toHaveLength(n);

		const badCursor = await api({ token: tokens.viewer, path: '/columns?cursor=garbage' });
		expectError(badCursor, 400);
		expect(badCursor.json.error.issues[0].path).toBe('cursor');
		for (const limit of ['0', '201', 'ten']) {
			const r = await api({ token: tokens.viewer, path: `/columns?limit=${limit}` });
			expectError(r, 400);
			expect(r.json.error.issues[0].path).toBe('limit');
		}
		const unknown = await api({ token: tokens.viewer, path: '/columns?colour=red' });
		expectError(unknown, 400);
		expect(unknown.json.error.message).toMatch(/colour/);
	});

	it('filters runs by column, status and date', async () => {
		const converged = await api({ token: tokens.viewer, path: `/runs?column=${fx.columnId}&status=converged&limit=200` });
		expect(converged.json.items.length).toBeGreaterThanOrEqual(2);
		expect(converged.json.items.every((r: { status: string; columnId: string }) => r.status === 'converged' && r.columnId === fx.columnId)).toBe(true);
		const future = await api({ token: tokens.viewer, path: `/runs?since=${new Date(Date.now() + 86_400_000).toISOString().slice(0, 10)}` });
		expect(future.json.items).toEqual([]);
		const past = await api({ token: tokens.viewer, path: `/runs?until=2000-01-01T00:00:00Z` });
		expect(past.json.items).toEqual([]);
		const otherColumn = await api({ token: tokens.viewer, path: `/runs?column=${await insertColumn(home.team.id)}` });
		expect(otherColumn.json.items).toEqual([]);
		const badStatus = await api({ token: tokens.viewer, path: '/runs?status=done' });
		expectError(badStatus, 400);
		expect(badStatus.json.error.issues[0].path).toBe('status');
	});

	it('uploads measurements as JSON rows or a CSV body, with the refusals of the upload page', async () => {
		const rows = await api({ token: tokens.analyst, method: 'POST', path: '/measurements', body: uploadBody() });
		expect(rows.status, rows.text).toBe(201);
		expect(rows.json.data.x).toEqual([0.2, 0.5, 1.0]);

		const csvQuery = new URLSearchParams({ columnId: fx.columnId, kind: 'holdup-height', name: 'CSV upload', xUnit: 'cm', yUnit: '%', superficialGasVelocity: '5', superficialGasVelocityUnit: 'cm/s', temperature: '20', temperatureUnit: 'C', pressure: '101.325', pressureUnit: 'kPa', fileName: 'probe.csv' });
		const csv = await api({ token: tokens.analyst, method: 'POST', path: `/measurements?${csvQuery}`, raw: { type: 'text/csv', text: 'height,holdup\n20,5\n50,6\n100,7\n' } });
		expect(csv.status, csv.text).toBe(201);
		expect(csv.json).toMatchObject({ name: 'CSV upload', fileName: 'probe.csv', units: { x: 'cm', y: '%' }, points: 3 });
		expect(csv.json.data.x[1]).toBeCloseTo(0.5, 12);

		const unordered = await api({ token: tokens.analyst, method: 'POST', path: '/measurements', body: { ...uploadBody(), rows: [[0.5, 0.05], [0.2, 0.06]] } });
		expectError(unordered, 400);
		expect(unordered.json.error.issues.map((i: { path: string }) => i.path)).toContain('rows.1.0');
		const tooHigh = await api({ token: tokens.analyst, method: 'POST', path: `/measurements?${csvQuery}`, raw: { type: 'text/csv', text: 'height,holdup\n20,5\n900,6\n' } });
		expectError(tooHigh, 400);
		expect(tooHigh.json.error.issues[0]).toMatchObject({ path: 'csv' });
		expect(tooHigh.json.error.issues[0].message).toMatch(/Row 3/);
		const badMeta = await api({ token: tokens.analyst, method: 'POST', path: '/measurements', body: { ...uploadBody(), temperatureUnit: 'F', xUnit: 'parsec' } });
		expectError(badMeta, 400);
		expect(badMeta.json.error.issues.map((i: { path: string }) => i.path).sort()).toEqual(['temperatureUnit', 'xUnit']);
		const both = await api({ token: tokens.analyst, method: 'POST', path: '/measurements', body: { ...uploadBody(), csv: '0.1,0.1' } });
		expectError(both, 400);
	});

	it('answers unknown paths and methods under /api/v1 with the uniform body', async () => {
		expectError(await fetchApi('/api/v1/nothing-here', 'GET'), 404, 'not_found');
		const r = await fetchApi(`/api/v1/runs/${fx.runId}`, 'DELETE');
		expectError(r, 405, 'method_not_allowed');
	});
});

/** Outside the document (unknown paths): a plain request, checked only for the uniform body. */
async function fetchApi(p: string, method: string): Promise<ApiAnswer> {
	const res = await fetch(`${app.baseUrl}${p}`, { method, headers: { authorization: `Bearer ${tokens.viewer}` } });
	const text = await res.text();
	return { status: res.status, headers: res.headers, text, json: JSON.parse(text), bytes: new Uint8Array() };
}

// ------------------------------------------------------------------ rate limit

describe('rate limit', () => {
	let limited: RunningApp;

	beforeAll(async () => {
		limited = await startApp({ env: { TWOFOLD_API_RATE_PER_MIN: '60', TWOFOLD_API_BURST: '3' } });
	});

	afterAll(async () => {
		await limited?.stop();
	});

	it('answers 429 with Retry-After per token once the burst is spent, and lets it through again after the wait', async () => {
		const base = limited.baseUrl;
		for (let i = 0; i < 3; i++) expect((await api({ base, token: tokens.viewer, path: '/me' })).status).toBe(200);
		const refused = await api({ base, token: tokens.viewer, path: '/me' });
		expectError(refused, 429, 'rate_limited');
		const wait = Number(refused.headers.get('retry-after'));
		expect(Number.isInteger(wait) && wait >= 1 && wait <= 2).toBe(true);
		// per token: another token of the same member's team is not affected
		expect((await api({ base, token: tokens.analyst, path: '/me' })).status).toBe(200);
		await new Promise((r) => setTimeout(r, wait * 1000 + 100));
		expect((await api({ base, token: tokens.viewer, path: '/me' })).status).toBe(200);
	});
});

// ------------------------------------------------------------------ every route answered and checked

describe('the OpenAPI round trip', () => {
	it('validated a documented success answer of every operation', () => {
		const missing = ROUTES.filter((r) => ![...validated].some((v) => v.startsWith(`${r.method} ${r.path} 2`)));
		expect(missing.map((r) => r.key)).toEqual([]);
		// and the usual refusals were checked against the document too
		for (const status of [400, 401, 403, 404, 429]) expect([...validated].some((v) => v.endsWith(` ${status}`)), String(status)).toBe(true);
	});

	it('left the other team untouched', async () => {
		const [{ n }] = await handle.db.select({ n: sql<number>`count(*)::int` }).from(runs).where(inArray(runs.teamId, [other.team.id]));
		expect(n).toBe(0);
	});
});
