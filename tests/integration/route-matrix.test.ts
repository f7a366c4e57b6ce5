/**
 * The role × route matrix, generated from the route tree: every page, form action and endpoint
 * method under `src/routes` must have an entry in `TABLE` below (its minimum role and how to build
 * a real request for the test team), and the suite fails when one is missing or an entry names a
 * route that no longer exists. Each entry is then requested over HTTP against the built app:
 *
 * - anonymous: a page → 303 to /signin, anything else → 401 (public routes: 2xx/3xx);
 * - each role below the minimum → 403, at or above it → 2xx/3xx (never a bounce to /signin);
 * - an admin of another team asking for this team's row → 404.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomBytes } from 'node:crypto';
import { eq, inArray } from 'drizzle-orm';
import { stringify } from 'devalue';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import {
	apiTokens,
	cases,
	columns,
	comparisons,
	invitations,
	measurements,
	memberships,
	outgoingMail,
	residuals,
	runs,
	snapshots,
	teams,
	users,
	type Role
} from '../../src/lib/server/db/schema.js';
import { encodeSnapshot } from '../../src/lib/server/runs/codec.js';
import { caseToJson } from '../../src/lib/measurements/case-json.js';
import { defaultCase, type CaseDocument } from '../../solver/case.js';
import { openTestDb } from '../helpers/db.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { ALL_ROLES, createTestTeam, type TestTeam, type TestUser } from '../helpers/team.js';
import { TestClient, signedInClient } from '../helpers/http.js';
import { discoverRoutes } from '../helpers/routes.js';

// ------------------------------------------------------------------ requests

type FormValue = string | string[];

interface Req {
	method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
	path: string;
	accept?: string;
	form?: Record<string, FormValue>;
	multipart?: Record<string, string | File>;
	json?: unknown;
}

/** `public`: anyone, signed in or not; `member`: any signed-in user, whatever their role */
type MinRole = Role | 'public' | 'member';

type Who = Role | 'anonymous' | 'outsider';

interface Entry {
	min: MinRole;
	/** builds one request for `who` (fresh rows for requests that consume them) */
	build: (who: Who) => Promise<Req> | Req;
	/** the path names a row of the test team: another team's admin must get 404 */
	teamRow?: boolean;
	/** send with a client signed in just for this request (the request signs it out or in again) */
	fresh?: boolean;
}

const JSON_ACCEPT = 'application/json';
const CSV_ACCEPT = 'text/csv';
const SSE_ACCEPT = 'text/event-stream';

let handle: DbHandle;
let app: RunningApp;
let home: TestTeam;
let other: TestTeam;
const clients = {} as Record<Role, TestClient>;
let outsider: TestClient;
const ids = { column: '', case: '', runA: '', runB: '', snapshotA: 0, measurement: '', comparison: '', study: '', mail: '' };
let doc: CaseDocument;

const rank = (r: Role) => ALL_ROLES.indexOf(r);
const hex = () => randomBytes(4).toString('hex');

interface SendOptions {
	/** the Origin header of a write (default: the app's own; null: none) */
	origin?: string | null;
	/** send this body instead of the request's own */
	body?: { type: string; text: string };
	headers?: Record<string, string>;
}

async function send(client: TestClient | null, req: Req, o: SendOptions = {}): Promise<{ status: number; location: string | null; text: string }> {
	const method = req.method ?? (req.form || req.multipart || req.json !== undefined ? 'POST' : 'GET');
	const headers: Record<string, string> = { accept: req.accept ?? 'text/html', ...o.headers };
	if (client) headers.cookie = [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
	const origin = o.origin === undefined ? new URL(app.baseUrl).origin : o.origin;
	if (method !== 'GET' && origin !== null) headers.origin = origin;
	let body: BodyInit | undefined;
	if (o.body) {
		body = o.body.text;
		headers['content-type'] = o.body.type;
	} else if (req.form) {
		const p = new URLSearchParams();
		for (const [k, v] of Object.entries(req.form)) for (const one of Array.isArray(v) ? v : [v]) p.append(k, one);
		body = p;
		headers['content-type'] = 'application/x-www-form-urlencoded';
	} else if (req.multipart) {
		const f = new FormData();
		for (const [k, v] of Object.entries(req.multipart)) f.set(k, v);
		body = f;
	} else if (req.json !== undefined) {
		body = JSON.stringify(req.json);
		headers['content-type'] = 'application/json';
	}
	const controller = new AbortController();
	const res = await fetch(new URL(req.path, app.baseUrl), { method, headers, body, redirect: 'manual', signal: controller.signal });
	const location = res.headers.get('location');
	let text = '';
	// a live stream never ends by itself: its status is the answer
	if ((res.headers.get('content-type') ?? '').includes('text/event-stream')) controller.abort();
	else text = await res.text();
	return { status: res.status, location, text };
}

// ------------------------------------------------------------------ rows of the test team

async function newColumn(teamId = home.team.id): Promise<string> {
	const [c] = await handle.db.insert(columns).values({ teamId, tag: `RM-${hex()}`, service: 'matrix', diameterM: 0.2, heightM: 2 }).returning();
	return c.id;
}

async function newCase(columnId = ids.column): Promise<string> {
	const [c] = await handle.db
		.insert(cases)
		.values({ teamId: home.team.id, columnId, name: `Matrix case ${hex()}`, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc, createdBy: home.members.analyst.id })
		.returning();
	return c.id;
}

/** A converged run with residual rows and a final snapshot (written directly: no worker here). */
async function newConvergedRun(holdup = 0.15): Promise<{ runId: string; snapshotId: number }> {
	const [r] = await handle.db
		.insert(runs)
		.values({
			teamId: home.team.id,
			columnId: ids.column,
			caseId: ids.case,
			caseDocument: doc,
			solverVersion: 'matrix',
			status: 'converged',
			attempts: 1,
			steps: 10,
			simulatedTimeS: 1,
			queuedBy: home.members.analyst.id,
			startedAt: new Date(),
			finishedAt: new Date(),
			summary: { design: { overallHoldup: { value: holdup, unit: '1', label: 'Overall gas holdup' } } }
		})
		.returning();
	await handle.db.insert(residuals).values([1, 2, 10].map((step) => ({ runId: r.id, step, simulatedTimeS: step / 10, values: { holdup: 1 / step } })));
	const x = Float64Array.from({ length: 5 }, (_, i) => (i + 0.5) * 0.4);
	const [s] = await handle.db
		.insert(snapshots)
		.values({
			runId: r.id,
			step: 10,
			simulatedTimeS: 1,
			isFinal: true,
			data: Buffer.from(encodeSnapshot({ step: 10, timeS: 1, x, fields: { holdup: x.map(() => holdup), pressure: x.map((z) => 101325 + 9790 * (2 - z)) } }))
		})
		.returning();
	return { runId: r.id, snapshotId: s.id };
}

/** A queued run without a job (a cancel ends it at once). */
async function newQueuedRun(): Promise<string> {
	const [r] = await handle.db
		.insert(runs)
		.values({ teamId: home.team.id, columnId: ids.column, caseId: ids.case, caseDocument: doc, solverVersion: 'matrix', status: 'queued', queuedBy: home.members.analyst.id })
		.returning();
	return r.id;
}

async function newMeasurement(columnId = ids.column): Promise<string> {
	const [m] = await handle.db
		.insert(measurements)
		.values({
			teamId: home.team.id,
			columnId,
			kind: 'holdup-height',
			name: `Matrix probe ${hex()}`,
			superficialGasVelocityMS: 0.05,
			temperatureK: 293.15,
			pressurePa: 101325,
			units: { x: 'm', y: '1' },
			data: { x: [0.2, 0.6, 1.0], y: [0.1, 0.12, 0.13] }
		})
		.returning();
	return m.id;
}

function hashToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

/** An open invitation of the test team for a new address; returns its token. */
async function newInvitation(): Promise<{ token: string; id: string }> {
	const token = randomBytes(24).toString('base64url');
	const [inv] = await handle.db
		.insert(invitations)
		.values({ teamId: home.team.id, email: `invitee-${hex()}@test.invalid`, role: 'viewer', tokenHash: hashToken(token), invitedBy: home.members.admin.id, expiresAt: new Date(Date.now() + 3600_000) })
		.returning();
	return { token, id: inv.id };
}

async function newMember(): Promise<string> {
	const [u] = await handle.db.insert(users).values({ email: `member-${hex()}@test.invalid` }).returning();
	await handle.db.insert(memberships).values({ teamId: home.team.id, userId: u.id, role: 'viewer' });
	return u.id;
}

/** A read-only API token of the test team owned by `who` (anonymous and outsiders: the viewer's). */
async function newToken(who: Who): Promise<string> {
	const owner = who === 'anonymous' || who === 'outsider' ? home.members.viewer : home.members[who];
	const [t] = await handle.db
		.insert(apiTokens)
		.values({ teamId: home.team.id, userId: owner.id, name: `matrix ${hex()}`, prefix: `tf_${hex()}`, tokenHash: hashToken(randomBytes(16).toString('hex')), scope: 'read' })
		.returning();
	return t.id;
}

const sweepSpec = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'list', values: [0.02, 0.04] }] };

/** A real study of the test team, made through POST /studies (its members stay queued: no worker). */
async function newStudy(): Promise<string> {
	const res = await clients.analyst.postJson('/studies', { caseId: ids.case, name: `Matrix study ${hex()}`, spec: sweepSpec });
	if (res.status !== 201) throw new Error(`study not created: ${res.status} ${await res.text()}`);
	return ((await res.json()) as { study: { id: string } }).study.id;
}

/** A study one member of which failed (what "re-run failed members" needs). */
async function newStudyWithFailure(): Promise<string> {
	const id = await newStudy();
	const [member] = await handle.db.select({ id: runs.id }).from(runs).where(eq(runs.studyId, id)).limit(1);
	await handle.db.update(runs).set({ status: 'failed', finishedAt: new Date(), errorMessage: 'failed for the matrix' }).where(eq(runs.id, member.id));
	return id;
}

const superform = (d: CaseDocument) => ({ __superform_json: stringify(d) });

const columnForm = () => ({ tag: `RM-${hex()}`, service: 's', diameterM: '0.5', heightM: '4', notes: '' });

const measurementUpload = () => ({
	kind: 'holdup-height',
	name: `Upload ${hex()}`,
	sourceNote: 'matrix',
	xUnit: 'cm',
	yUnit: '%',
	superficialGasVelocity: '5',
	superficialGasVelocityUnit: 'cm/s',
	temperature: '20',
	temperatureUnit: 'C',
	pressure: '101.325',
	pressureUnit: 'kPa',
	file: new File(['z,holdup\n10,4.5\n50,12\n120,13.5\n'], 'data.csv', { type: 'text/csv' })
});

// ------------------------------------------------------------------ the table

const TABLE: Record<string, Entry> = {
	// home, sign-in and out, invitations, switching teams
	'GET /': { min: 'viewer', build: () => ({ path: '/' }) },
	'GET /signin': { min: 'public', build: () => ({ path: '/signin' }) },
	'GET /signin/check-mail': { min: 'public', build: () => ({ path: '/signin/check-mail' }) },
	'POST /signin?/password': {
		min: 'public',
		fresh: true,
		build: () => ({ path: '/signin?/password', form: { email: home.members.viewer.email, password: home.members.viewer.password, redirectTo: '/' } })
	},
	'POST /signin?/link': { min: 'public', build: () => ({ path: '/signin?/link', form: { email: home.members.viewer.email, redirectTo: '/' } }) },
	'GET /signout': { min: 'public', build: () => ({ path: '/signout' }) },
	'POST /signout': { min: 'public', fresh: true, build: () => ({ path: '/signout', form: {} }) },
	'GET /invite/[token]': { min: 'public', build: async () => ({ path: `/invite/${(await newInvitation()).token}` }) },
	'POST /invite/[token]': {
		min: 'public',
		fresh: true,
		build: async () => ({ path: `/invite/${(await newInvitation()).token}`, form: { name: 'New Member', password: 'a-long-enough-password', confirm: 'a-long-enough-password' } })
	},
	'GET /team/switch': { min: 'public', build: () => ({ path: '/team/switch' }) },
	'POST /team/switch': { min: 'member', teamRow: true, build: () => ({ path: '/team/switch', form: { teamId: home.team.id } }) },

	// columns
	'GET /columns': { min: 'viewer', build: () => ({ path: '/columns?sort=heightM&dir=desc' }) },
	'GET /columns/new': { min: 'analyst', build: () => ({ path: '/columns/new' }) },
	'POST /columns/new': { min: 'analyst', build: () => ({ path: '/columns/new', form: columnForm() }) },
	'GET /columns/[id]': { min: 'viewer', teamRow: true, build: () => ({ path: `/columns/${ids.column}` }) },
	'GET /columns/[id]/edit': { min: 'analyst', teamRow: true, build: () => ({ path: `/columns/${ids.column}/edit` }) },
	'POST /columns/[id]/edit': { min: 'analyst', teamRow: true, build: async () => ({ path: `/columns/${await newColumn()}/edit`, form: columnForm() }) },
	'GET /columns/[id]/delete': { min: 'analyst', teamRow: true, build: () => ({ path: `/columns/${ids.column}/delete` }) },
	'POST /columns/[id]/delete': { min: 'analyst', teamRow: true, build: async () => ({ path: `/columns/${await newColumn()}/delete`, form: {} }) },

	// cases
	'GET /columns/[id]/cases/new': { min: 'analyst', teamRow: true, build: () => ({ path: `/columns/${ids.column}/cases/new` }) },
	'POST /columns/[id]/cases/new?/save': { min: 'analyst', teamRow: true, build: () => ({ path: `/columns/${ids.column}/cases/new?/save`, form: superform(doc) }) },
	'POST /columns/[id]/cases/new?/queue': { min: 'analyst', teamRow: true, build: () => ({ path: `/columns/${ids.column}/cases/new?/queue`, form: superform(doc) }) },
	'GET /columns/[id]/cases/import': { min: 'analyst', teamRow: true, build: () => ({ path: `/columns/${ids.column}/cases/import` }) },
	'POST /columns/[id]/cases/import': { min: 'analyst', teamRow: true, build: () => ({ path: `/columns/${ids.column}/cases/import`, form: { json: caseToJson(doc) } }) },
	'GET /cases/[id]': { min: 'viewer', teamRow: true, build: () => ({ path: `/cases/${ids.case}` }) },
	'POST /cases/[id]?/save': { min: 'analyst', teamRow: true, build: () => ({ path: `/cases/${ids.case}?/save`, form: superform(doc) }) },
	'POST /cases/[id]?/queue': { min: 'analyst', teamRow: true, build: () => ({ path: `/cases/${ids.case}?/queue`, form: superform(doc) }) },
	'POST /cases/[id]?/clone': { min: 'analyst', teamRow: true, build: () => ({ path: `/cases/${ids.case}?/clone`, form: {} }) },
	'POST /cases/[id]?/signOff': { min: 'lead', teamRow: true, build: () => ({ path: `/cases/${ids.case}?/signOff`, form: { verdict: 'approved-basis', comment: '' } }) },
	'POST /cases/[id]?/comment': { min: 'viewer', teamRow: true, build: () => ({ path: `/cases/${ids.case}?/comment`, form: { body: 'matrix comment' } }) },
	'GET /cases/[id]/export.json': { min: 'viewer', teamRow: true, build: () => ({ path: `/cases/${ids.case}/export.json`, accept: JSON_ACCEPT }) },

	// measurements
	'GET /columns/[id]/measurements': { min: 'viewer', teamRow: true, build: () => ({ path: `/columns/${ids.column}/measurements` }) },
	'POST /columns/[id]/measurements?/delete': {
		min: 'analyst',
		teamRow: true,
		build: async () => ({ path: `/columns/${ids.column}/measurements?/delete`, form: { id: await newMeasurement() } })
	},
	'GET /columns/[id]/measurements/new': { min: 'analyst', teamRow: true, build: () => ({ path: `/columns/${ids.column}/measurements/new` }) },
	'POST /columns/[id]/measurements/new': { min: 'analyst', teamRow: true, build: () => ({ path: `/columns/${ids.column}/measurements/new`, multipart: measurementUpload() }) },
	'GET /columns/[id]/measurements/[measurementId]': { min: 'viewer', teamRow: true, build: () => ({ path: `/columns/${ids.column}/measurements/${ids.measurement}` }) },
	'GET /columns/[id]/measurements/[measurementId]/csv': {
		min: 'viewer',
		teamRow: true,
		build: () => ({ path: `/columns/${ids.column}/measurements/${ids.measurement}/csv`, accept: CSV_ACCEPT })
	},

	// runs
	'POST /runs': { min: 'analyst', teamRow: true, build: () => ({ path: '/runs', json: { caseId: ids.case }, accept: JSON_ACCEPT }) },
	'GET /runs/[id]': { min: 'viewer', teamRow: true, build: () => ({ path: `/runs/${ids.runA}` }) },
	'POST /runs/[id]?/cancel': { min: 'analyst', teamRow: true, build: async () => ({ path: `/runs/${await newQueuedRun()}?/cancel`, form: {} }) },
	'POST /runs/[id]?/rerun': { min: 'analyst', teamRow: true, build: () => ({ path: `/runs/${ids.runA}?/rerun`, form: {} }) },
	'POST /runs/[id]/cancel': { min: 'analyst', teamRow: true, build: async () => ({ path: `/runs/${await newQueuedRun()}/cancel`, json: {}, accept: JSON_ACCEPT }) },
	'POST /runs/[id]/rerun': { min: 'analyst', teamRow: true, build: () => ({ path: `/runs/${ids.runA}/rerun`, json: {}, accept: JSON_ACCEPT }) },
	'GET /runs/[id]/events': { min: 'viewer', teamRow: true, build: () => ({ path: `/runs/${ids.runA}/events`, accept: SSE_ACCEPT }) },
	'GET /runs/[id]/history': { min: 'viewer', teamRow: true, build: () => ({ path: `/runs/${ids.runA}/history`, accept: JSON_ACCEPT }) },
	'GET /runs/[id]/profiles.csv': { min: 'viewer', teamRow: true, build: () => ({ path: `/runs/${ids.runA}/profiles.csv`, accept: CSV_ACCEPT }) },
	'GET /runs/[id]/residuals.csv': { min: 'viewer', teamRow: true, build: () => ({ path: `/runs/${ids.runA}/residuals.csv`, accept: CSV_ACCEPT }) },
	'GET /runs/[id]/snapshots/[snapshotId]': { min: 'viewer', teamRow: true, build: () => ({ path: `/runs/${ids.runA}/snapshots/${ids.snapshotA}`, accept: JSON_ACCEPT }) },

	// comparisons (leads build and sign off)
	'GET /compare': { min: 'viewer', build: () => ({ path: '/compare' }) },
	'GET /compare/new': { min: 'lead', teamRow: true, build: () => ({ path: `/compare/new?column=${ids.column}` }) },
	'POST /compare/new': {
		min: 'lead',
		teamRow: true,
		build: () => ({ path: `/compare/new?column=${ids.column}`, form: { name: `Matrix comparison ${hex()}`, runIds: [ids.runA, ids.runB], baselineRunId: ids.runA, measurementId: '' } })
	},
	'GET /compare/[id]': { min: 'viewer', teamRow: true, build: () => ({ path: `/compare/${ids.comparison}` }) },
	'GET /compare/[id]/report': { min: 'viewer', teamRow: true, build: () => ({ path: `/compare/${ids.comparison}/report` }) },
	'POST /compare/[id]?/measurement': { min: 'lead', teamRow: true, build: () => ({ path: `/compare/${ids.comparison}?/measurement`, form: { measurementId: ids.measurement } }) },
	'POST /compare/[id]?/signOff': { min: 'lead', teamRow: true, build: () => ({ path: `/compare/${ids.comparison}?/signOff`, form: { verdict: 'approved-basis', comment: '' } }) },
	'POST /compare/[id]?/comment': { min: 'viewer', teamRow: true, build: () => ({ path: `/compare/${ids.comparison}?/comment`, form: { body: 'matrix comment' } }) },

	// the solver's verification: the same for every team (it depends on the solver version only)
	'GET /verification': { min: 'viewer', build: () => ({ path: '/verification' }) },
	'GET /verification/status': { min: 'viewer', build: () => ({ path: '/verification/status', accept: JSON_ACCEPT }) },

	// studies
	'GET /studies': { min: 'viewer', build: () => ({ path: '/studies' }) },
	'POST /studies': { min: 'analyst', teamRow: true, build: () => ({ path: '/studies', json: { caseId: ids.case, name: `Matrix study ${hex()}`, spec: sweepSpec }, accept: JSON_ACCEPT }) },
	'GET /studies/new': { min: 'analyst', teamRow: true, build: () => ({ path: `/studies/new?case=${ids.case}` }) },
	'POST /studies/new': {
		min: 'analyst',
		teamRow: true,
		build: () => ({
			path: `/studies/new?case=${ids.case}`,
			form: { caseId: ids.case, name: `Matrix study ${hex()}`, kind: 'sweep', 'axes.0.input': 'superficialGasVelocityMS', 'axes.0.spacing': 'list', 'axes.0.values': '0.02 0.04' }
		})
	},
	'GET /studies/[id]': { min: 'viewer', teamRow: true, build: () => ({ path: `/studies/${ids.study}` }) },
	'POST /studies/[id]?/cancel': { min: 'analyst', teamRow: true, build: async () => ({ path: `/studies/${await newStudy()}?/cancel`, form: {} }) },
	'POST /studies/[id]?/rerunFailed': { min: 'analyst', teamRow: true, build: async () => ({ path: `/studies/${await newStudyWithFailure()}?/rerunFailed`, form: {} }) },
	'POST /studies/[id]?/signOff': { min: 'lead', teamRow: true, build: () => ({ path: `/studies/${ids.study}?/signOff`, form: { verdict: 'approved-basis', comment: '' } }) },
	'POST /studies/[id]?/comment': { min: 'viewer', teamRow: true, build: () => ({ path: `/studies/${ids.study}?/comment`, form: { body: 'matrix comment' } }) },
	'GET /studies/[id]/events': { min: 'viewer', teamRow: true, build: () => ({ path: `/studies/${ids.study}/events`, accept: SSE_ACCEPT }) },
	'GET /studies/[id]/members.csv': { min: 'viewer', teamRow: true, build: () => ({ path: `/studies/${ids.study}/members.csv`, accept: CSV_ACCEPT }) },

	// the team (admins manage)
	'GET /team': { min: 'viewer', build: () => ({ path: '/team' }) },
	'POST /team?/invite': { min: 'admin', build: () => ({ path: '/team?/invite', form: { email: `inv-${hex()}@test.invalid`, role: 'viewer' } }) },
	'POST /team?/setRole': { min: 'admin', teamRow: true, build: () => ({ path: '/team?/setRole', form: { userId: home.members.viewer.id, role: 'viewer' } }) },
	'POST /team?/remove': { min: 'admin', teamRow: true, build: async () => ({ path: '/team?/remove', form: { userId: await newMember() } }) },
	'POST /team?/revoke': { min: 'admin', teamRow: true, build: async () => ({ path: '/team?/revoke', form: { invitationId: (await newInvitation()).id } }) },
	'POST /team?/studyRuns': { min: 'admin', build: () => ({ path: '/team?/studyRuns', form: { maxStudyRuns: '100' } }) },
	'GET /team/mail': { min: 'admin', build: () => ({ path: '/team/mail' }) },
	'GET /team/mail/[id]': { min: 'admin', teamRow: true, build: () => ({ path: `/team/mail/${ids.mail}` }) },
	'GET /team/workers': { min: 'admin', build: () => ({ path: '/team/workers' }) },
	'GET /team/workers/status': { min: 'admin', build: () => ({ path: '/team/workers/status', accept: JSON_ACCEPT }) },
	'GET /team/audit': { min: 'admin', build: () => ({ path: '/team/audit' }) },
	'GET /team/api': { min: 'viewer', build: () => ({ path: '/team/api' }) },
	'GET /team/tokens': { min: 'viewer', build: () => ({ path: '/team/tokens' }) },
	'POST /team/tokens?/create': { min: 'viewer', build: () => ({ path: '/team/tokens?/create', form: { name: `matrix ${hex()}`, scope: 'read', expiresOn: '' } }) },
	'POST /team/tokens?/revoke': { min: 'viewer', teamRow: true, build: async (who) => ({ path: '/team/tokens?/revoke', form: { tokenId: await newToken(who) } }) },

	// the JSON API (with the session cookie here; tokens are the API's own tests)
	'GET /api/v1/me': { min: 'viewer', build: () => api('/api/v1/me') },
	'GET /api/v1/openapi.json': { min: 'viewer', build: () => api('/api/v1/openapi.json') },
	'GET /api/v1/columns': { min: 'viewer', build: () => api('/api/v1/columns') },
	'GET /api/v1/columns/[id]': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/columns/${ids.column}`) },
	'GET /api/v1/cases': { min: 'viewer', build: () => api('/api/v1/cases') },
	'POST /api/v1/cases': { min: 'analyst', teamRow: true, build: () => api('/api/v1/cases', 'POST', { columnId: ids.column, document: doc }) },
	'GET /api/v1/cases/[id]': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/cases/${ids.case}`) },
	'PUT /api/v1/cases/[id]': { min: 'analyst', teamRow: true, build: () => api(`/api/v1/cases/${ids.case}`, 'PUT', { document: doc }) },
	'GET /api/v1/cases/[id]/signoffs': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/cases/${ids.case}/signoffs`) },
	'POST /api/v1/cases/[id]/signoffs': { min: 'lead', teamRow: true, build: () => api(`/api/v1/cases/${ids.case}/signoffs`, 'POST', { verdict: 'approved-basis', comment: '' }) },
	'GET /api/v1/comparisons': { min: 'viewer', build: () => api('/api/v1/comparisons') },
	'POST /api/v1/comparisons': {
		min: 'lead',
		teamRow: true,
		build: () => api('/api/v1/comparisons', 'POST', { columnId: ids.column, name: `Matrix comparison ${hex()}`, runIds: [ids.runA, ids.runB], baselineRunId: ids.runA })
	},
	'GET /api/v1/comparisons/[id]': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/comparisons/${ids.comparison}`) },
	'GET /api/v1/comparisons/[id]/signoffs': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/comparisons/${ids.comparison}/signoffs`) },
	'POST /api/v1/comparisons/[id]/signoffs': {
		min: 'lead',
		teamRow: true,
		build: () => api(`/api/v1/comparisons/${ids.comparison}/signoffs`, 'POST', { verdict: 'approved-basis', comment: '' })
	},
	'GET /api/v1/measurements': { min: 'viewer', build: () => api('/api/v1/measurements') },
	'POST /api/v1/measurements': {
		min: 'analyst',
		teamRow: true,
		build: () => {
			const { file: _file, ...fields } = measurementUpload();
			return api('/api/v1/measurements', 'POST', { ...fields, columnId: ids.column, csv: 'z,holdup\n10,4.5\n50,12\n' });
		}
	},
	'GET /api/v1/measurements/[id]': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/measurements/${ids.measurement}`) },
	'DELETE /api/v1/measurements/[id]': { min: 'analyst', teamRow: true, build: async () => api(`/api/v1/measurements/${await newMeasurement()}`, 'DELETE') },
	'GET /api/v1/runs': { min: 'viewer', build: () => api('/api/v1/runs') },
	'POST /api/v1/runs': { min: 'analyst', teamRow: true, build: () => api('/api/v1/runs', 'POST', { caseId: ids.case }) },
	'GET /api/v1/runs/[id]': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/runs/${ids.runA}`) },
	'POST /api/v1/runs/[id]/cancel': { min: 'analyst', teamRow: true, build: async () => api(`/api/v1/runs/${await newQueuedRun()}/cancel`, 'POST', {}) },
	'POST /api/v1/runs/[id]/rerun': { min: 'analyst', teamRow: true, build: () => api(`/api/v1/runs/${ids.runA}/rerun`, 'POST', {}) },
	'GET /api/v1/runs/[id]/events': { min: 'viewer', teamRow: true, build: () => ({ path: `/api/v1/runs/${ids.runA}/events`, accept: SSE_ACCEPT }) },
	'GET /api/v1/runs/[id]/residuals': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/runs/${ids.runA}/residuals`) },
	'GET /api/v1/runs/[id]/results': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/runs/${ids.runA}/results`) },
	'GET /api/v1/runs/[id]/snapshots': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/runs/${ids.runA}/snapshots`) },
	'GET /api/v1/runs/[id]/snapshots/[snapshotId]': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/runs/${ids.runA}/snapshots/${ids.snapshotA}`) },
	'GET /api/v1/studies': { min: 'viewer', build: () => api('/api/v1/studies') },
	'POST /api/v1/studies': { min: 'analyst', teamRow: true, build: () => api('/api/v1/studies', 'POST', { caseId: ids.case, name: `Matrix study ${hex()}`, spec: sweepSpec }) },
	'GET /api/v1/studies/[id]': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/studies/${ids.study}`) },
	'POST /api/v1/studies/[id]/cancel': { min: 'analyst', teamRow: true, build: async () => api(`/api/v1/studies/${await newStudy()}/cancel`, 'POST', {}) },
	'POST /api/v1/studies/[id]/rerun': { min: 'analyst', teamRow: true, build: async () => api(`/api/v1/studies/${await newStudyWithFailure()}/rerun`, 'POST', {}) },
	'GET /api/v1/studies/[id]/signoffs': { min: 'viewer', teamRow: true, build: () => api(`/api/v1/studies/${ids.study}/signoffs`) },
	'POST /api/v1/studies/[id]/signoffs': { min: 'lead', teamRow: true, build: () => api(`/api/v1/studies/${ids.study}/signoffs`, 'POST', { verdict: 'approved-basis', comment: '' }) }
};

function api(path: string, method: Req['method'] = 'GET', json?: unknown): Req {
	return { path, method, json: method === 'GET' || (method === 'DELETE' && json === undefined) ? undefined : json, accept: JSON_ACCEPT };
}

// ------------------------------------------------------------------ set-up

beforeAll(async () => {
	handle = await openTestDb();
	home = await createTestTeam({ db: handle.db, name: 'Route matrix home team' });
	other = await createTestTeam({ db: handle.db, name: 'Route matrix other team' });
	// room for the runs the matrix queues
	await handle.db.update(teams).set({ maxActiveRuns: 1000 }).where(eq(teams.id, home.team.id));
	doc = defaultCase('height-profile');
	doc.name = 'Matrix case';
	ids.column = await newColumn();
	ids.case = await newCase();
	const a = await newConvergedRun(0.15);
	ids.runA = a.runId;
	ids.snapshotA = a.snapshotId;
	ids.runB = (await newConvergedRun(0.18)).runId;
	ids.measurement = await newMeasurement();
	const [cmp] = await handle.db
		.insert(comparisons)
		.values({ teamId: home.team.id, columnId: ids.column, name: 'Matrix comparison', runIds: [ids.runA, ids.runB], baselineRunId: ids.runA, createdBy: home.members.lead.id })
		.returning();
	ids.comparison = cmp.id;
	const [mail] = await handle.db
		.insert(outgoingMail)
		.values({ fromAddress: 'no-reply@twofold.local', toAddresses: home.members.viewer.email, subject: 'matrix', raw: 'matrix' })
		.returning();
	ids.mail = mail.id;
	app = await startApp();
	for (const role of ALL_ROLES) clients[role] = await signedInClient(app.baseUrl, home.members[role]);
	// an admin elsewhere: the highest role, so only team isolation can stop it
	outsider = await signedInClient(app.baseUrl, other.members.admin);
	ids.study = await newStudy();
});

afterAll(async () => {
	// the runs queued here must not be worked by the workers of later test files
	if (handle && home) {
		const queued = await handle.db.select({ id: runs.id, jobId: runs.jobId }).from(runs).where(eq(runs.teamId, home.team.id));
		const jobIds = queued.map((r) => r.jobId).filter((j): j is string => !!j);
		if (jobIds.length) await handle.pool.query(`update pgboss.job set state = 'cancelled', completed_on = now() where id = any($1::uuid[]) and state < 'completed'`, [jobIds]).catch(() => {});
		await handle.db
			.update(runs)
			.set({ status: 'cancelled', finishedAt: new Date() })
			.where(inArray(runs.id, queued.map((r) => r.id)));
	}
	await app?.stop();
	await handle?.close();
});

// ------------------------------------------------------------------ the matrix

const discovered = discoverRoutes();

describe('route tree', () => {
	it('has a matrix entry for every page, form action and endpoint method, and no entry for a route that is gone', () => {
		const keys = discovered.map((r) => r.key);
		const missing = discovered.filter((r) => !(r.key in TABLE)).map((r) => `${r.key}  (${r.file})`);
		const stale = Object.keys(TABLE).filter((k) => !keys.includes(k));
		expect(missing, 'routes without an entry in TABLE of tests/integration/route-matrix.test.ts').toEqual([]);
		expect(stale, 'entries of TABLE whose route no longer exists').toEqual([]);
	});
});

async function freshClient(role: Role): Promise<TestClient> {
	return signedInClient(app.baseUrl, home.members[role] as TestUser);
}

const entries = discovered.filter((r) => r.key in TABLE).map((r) => ({ ...r, entry: TABLE[r.key] }));

describe.each(entries)('$key', ({ key, kind, entry }) => {
	const isPage = kind === 'page';

	it(entry.min === 'public' ? 'answers anonymous requests' : isPage ? 'sends anonymous visitors to sign-in' : 'refuses anonymous requests with 401', async () => {
		const res = await send(new TestClient(app.baseUrl), await entry.build('anonymous'));
		if (entry.min === 'public') {
			expect(res.status, `${key}: ${res.text.slice(0, 300)}`).toBeGreaterThanOrEqual(200);
			expect(res.status, `${key}: ${res.text.slice(0, 300)}`).toBeLessThan(400);
		} else if (isPage) {
			expect(res.status).toBe(303);
			expect(res.location).toMatch(/^\/signin\?redirectTo=/);
		} else {
			expect(res.status).toBe(401);
		}
	});

	it.each(ALL_ROLES)('answers %s by role', async (role) => {
		const client = entry.fresh ? await freshClient(role) : clients[role];
		const res = await send(client, await entry.build(role));
		const needed: Role | null = entry.min === 'public' ? null : entry.min === 'member' ? 'viewer' : entry.min;
		if (needed === null || rank(role) >= rank(needed)) {
			expect([200, 201, 204, 302, 303], `${role} on ${key}: ${res.status} ${res.text.slice(0, 300)}`).toContain(res.status);
			if (entry.min !== 'public' && res.location) expect(res.location).not.toMatch(/^\/signin/);
		} else {
			expect(res.status, `${role} on ${key}`).toBe(403);
		}
	});

	if (entry.teamRow) {
		it("answers 404 to another team's admin asking for this team's row", async () => {
			const res = await send(outsider, await entry.build('outsider'));
			expect(res.status, `${key}: ${res.text.slice(0, 300)}`).toBe(404);
		});
	}
});

// ------------------------------------------------------------------ cross-site requests

/**
 * What a forged request could change, as one fingerprint per table: the test team's rows with the
 * columns the write routes touch.
 */
async function fingerprint(): Promise<Record<string, string>> {
	const t = home.team.id;
	const q = async (sql: string) => String((await handle.pool.query<{ f: string | null }>(sql, [t])).rows[0].f ?? '');
	return {
		columns: await q(`select md5(string_agg(concat_ws('|', id, tag, updated_at), ',' order by id)) as f from columns where team_id = $1`),
		cases: await q(`select md5(string_agg(concat_ws('|', id, updated_at), ',' order by id)) as f from cases where team_id = $1`),
		runs: await q(`select md5(string_agg(concat_ws('|', id, status, cancel_requested), ',' order by id)) as f from runs where team_id = $1`),
		measurements: await q(`select md5(string_agg(id::text, ',' order by id)) as f from measurements where team_id = $1`),
		comparisons: await q(`select md5(string_agg(concat_ws('|', id, measurement_id), ',' order by id)) as f from comparisons where team_id = $1`),
		studies: await q(`select md5(string_agg(concat_ws('|', id, cancelled_at), ',' order by id)) as f from studies where team_id = $1`),
		signOffs: await q(`select count(*)::text as f from sign_offs where team_id = $1`),
		comments: await q(`select count(*)::text as f from comments where team_id = $1`),
		audit: await q(`select count(*)::text as f from audit_log where team_id = $1`),
		invitations: await q(`select md5(string_agg(concat_ws('|', id, accepted_at), ',' order by id)) as f from invitations where team_id = $1`),
		members: await q(`select md5(string_agg(concat_ws('|', user_id, role), ',' order by user_id)) as f from memberships where team_id = $1`),
		tokens: await q(`select md5(string_agg(concat_ws('|', id, revoked_at), ',' order by id)) as f from api_tokens where team_id = $1`),
		team: await q(`select max_study_runs::text as f from teams where id = $1`)
	};
}

const FOREIGN = 'https://attacker.example';
const writes = entries.filter((e) => e.method !== 'GET' && e.method !== 'HEAD');

describe('cross-site requests (CSRF)', () => {
	it(`refuses every one of the ${writes.length} write routes from a foreign Origin, whatever the body type, and changes nothing`, async () => {
		expect(writes.length).toBeGreaterThan(50);
		const admin = clients.admin;
		// the requests first (building some writes rows), then the fingerprint, then the forgeries
		const built = await Promise.all(writes.map(async (w) => ({ key: w.key, req: await w.entry.build('admin') })));
		const before = await fingerprint();
		const refusals: string[] = [];
		for (const { key, req } of built) {
			const variants: [string, SendOptions][] = [
				['own body', { origin: FOREIGN }],
				['own body, Origin null', { origin: 'null' }],
				['JSON', { origin: FOREIGN, body: { type: 'application/json', text: JSON.stringify(req.json ?? {}) } }],
				['text/plain', { origin: FOREIGN, body: { type: 'text/plain', text: 'x=1' } }],
				['url-encoded', { origin: FOREIGN, body: { type: 'application/x-www-form-urlencoded', text: 'x=1' } }]
			];
			for (const [what, o] of variants) {
				const res = await send(admin, req, o);
				if (res.status !== 403) refusals.push(`${key} (${what}): ${res.status} ${res.text.slice(0, 120)}`);
			}
		}
		expect(refusals, 'forged requests that were not refused with 403').toEqual([]);
		expect(await fingerprint()).toEqual(before);
		// and the session survived the forged sign-out
		expect((await admin.get('/team')).status).toBe(200);
	});

	it('still serves the same requests from the app itself, and a script without an Origin header', async () => {
		// same origin (what the matrix above sends) and no Origin at all: both queue a run
		expect((await send(clients.analyst, { path: '/runs', json: { caseId: ids.case }, accept: JSON_ACCEPT })).status).toBe(201);
		expect((await send(clients.analyst, { path: '/runs', json: { caseId: ids.case }, accept: JSON_ACCEPT }, { origin: null })).status).toBe(201);
		expect((await send(clients.analyst, { path: `/api/v1/runs`, json: { caseId: ids.case }, accept: JSON_ACCEPT }, { origin: null })).status).toBe(201);
	});

	it('lets an API token through whatever its Origin (no cookie a page could borrow)', async () => {
		const token = `tf_${randomBytes(32).toString('base64url')}`;
		await handle.db
			.insert(apiTokens)
			.values({ teamId: home.team.id, userId: home.members.analyst.id, name: 'csrf check', prefix: token.slice(0, 10), tokenHash: hashToken(token), scope: 'role' });
		const req: Req = { path: '/api/v1/runs', json: { caseId: ids.case }, accept: JSON_ACCEPT };
		const res = await send(null, req, { origin: FOREIGN, headers: { authorization: `Bearer ${token}` } });
		expect(res.status, res.text).toBe(201);
	});
});
