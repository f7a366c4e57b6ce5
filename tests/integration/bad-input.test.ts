/**
 * Bad input to the JSON endpoints and the pages behind an id: every refusal is a 4xx that names
 * the field (and its limit), in the uniform error body, and nothing stored changes.
 */
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { startApp, type RunningApp } from '../helpers/app.js';
import { openTestDb } from '../helpers/db.js';
import { signedInClient, type TestClient } from '../helpers/http.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { cases, columns, runs } from '../../src/lib/server/db/schema.js';
import { defaultCase } from '../../solver/index.js';

interface ErrorBody {
	message: string;
	error: { code: string; message: string; issues: { path: string; message: string }[] };
}

let app: RunningApp;
let handle: DbHandle;
let team: TestTeam;
let analyst: TestClient;
let caseId: string;

/** POST a raw body with the analyst's cookies and a same-origin Origin header. */
async function postRaw(path: string, body: BodyInit | null, contentType: string | null, init: { duplex?: 'half' } = {}): Promise<Response> {
	const headers: Record<string, string> = {
		accept: 'application/json',
		origin: new URL(app.baseUrl).origin,
		cookie: [...analyst.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
	};
	if (contentType) headers['content-type'] = contentType;
	return fetch(new URL(path, app.baseUrl), { method: 'POST', redirect: 'manual', headers, body, ...init } as RequestInit);
}

const postJsonText = (text: string) => postRaw('/runs', text, 'application/json');

async function runCount(): Promise<number> {
	const [row] = await handle.db.select({ n: sql<number>`count(*)::int` }).from(runs).where(eq(runs.teamId, team.team.id));
	return row.n;
}

async function expectRefusal(res: Response, status: number, code: string): Promise<ErrorBody> {
	const text = await res.text();
	expect(res.status, text).toBe(status);
	const body = JSON.parse(text) as ErrorBody;
	expect(body.error.code).toBe(code);
	expect(body.error.message.length).toBeGreaterThan(0);
	// the top-level message stays for callers that read only that
	expect(body.message).toBe(body.error.message);
	return body;
}

beforeAll(async () => {
	handle = await openTestDb();
	app = await startApp();
	team = await createTestTeam({ db: handle.db, name: 'Bad input team' });
	const [col] = await handle.db.insert(columns).values({ teamId: team.team.id, tag: 'B-1', diameterM: 0.2, heightM: 2 }).returning({ id: columns.id });
	const doc = defaultCase('height-profile');
	const [c] = await handle.db
		.insert(cases)
		.values({ teamId: team.team.id, columnId: col.id, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc })
		.returning({ id: cases.id });
	caseId = c.id;
	analyst = await signedInClient(app.baseUrl, team.members.analyst);
}, 180_000);

afterAll(async () => {
	await app?.stop();
	await handle?.close();
});

describe('POST /runs refuses bad input', () => {
	it('refuses bodies that are not an object with a case id, naming caseId', async () => {
		const before = await runCount();
		for (const body of ['null', '[]', '"x"', '{}', '{"caseId":"../../etc"}', JSON.stringify({ caseId: 'a'.repeat(3000) }), '{"caseId":42}', '{"caseId":null}']) {
			const r = await expectRefusal(await postJsonText(body), 400, 'invalid_input');
			expect(r.error.issues.length, body).toBeGreaterThan(0);
			expect(r.error.message, body).toContain('caseId');
			if (body.startsWith('{')) expect(r.error.issues[0].path, body).toBe('caseId');
			else expect(r.error.issues[0].path, body).toBe('');
		}
		const long = await expectRefusal(await postJsonText(JSON.stringify({ caseId: 'a'.repeat(3000) })), 400, 'invalid_input');
		expect(long.error.issues[0].message).toBe('caseId must be a case id (a UUID, 36 characters)');
		const missing = await expectRefusal(await postJsonText('{}'), 400, 'invalid_input');
		expect(missing.error.issues[0].message).toMatch(/^caseId is required/);
		// the same check for a form post
		const form = await expectRefusal(await postRaw('/runs', new URLSearchParams({ caseId: '../../etc' }), 'application/x-www-form-urlencoded'), 400, 'invalid_input');
		expect(form.error.issues[0].path).toBe('caseId');
		expect(await runCount()).toBe(before);
	});

	it('refuses malformed JSON, a wrong content type and an oversized body', async () => {
		const before = await runCount();
		const broken = await expectRefusal(await postJsonText('{"caseId": '), 400, 'invalid_json');
		expect(broken.error.message).toMatch(/not valid JSON/);
		await expectRefusal(await postJsonText(''), 400, 'invalid_json');
		await expectRefusal(await postRaw('/runs', new Uint8Array([0x7b, 0xff, 0xfe, 0x7d]), 'application/json'), 400, 'invalid_json');
		await expectRefusal(await postRaw('/runs', new Uint8Array([1, 2, 3]), 'multipart/form-data; boundary=nothing-here'), 400, 'invalid_form');

		const plain = await expectRefusal(await postRaw('/runs', JSON.stringify({ caseId }), 'text/plain'), 415, 'unsupported_media_type');
		expect(plain.error.message).toContain('application/json');
		await expectRefusal(await postRaw('/runs', JSON.stringify({ caseId }), 'application/xml'), 415, 'unsupported_media_type');
		await expectRefusal(await postRaw('/runs', JSON.stringify({ caseId }), null), 415, 'unsupported_media_type');

		const big = JSON.stringify({ caseId, padding: 'x'.repeat(100 * 1024) });
		const tooLarge = await expectRefusal(await postJsonText(big), 413, 'body_too_large');
		expect(tooLarge.error.message).toContain('65536 bytes (64 KiB)');
		// the same without a declared length (chunked): the reading stops at the limit
		const chunks = new ReadableStream<Uint8Array>({
			start(controller) {
				const piece = new TextEncoder().encode('x'.repeat(16 * 1024));
				controller.enqueue(new TextEncoder().encode(`{"caseId":"${caseId}","padding":"`));
				for (let i = 0; i < 6; i++) controller.enqueue(piece);
				controller.enqueue(new TextEncoder().encode('"}'));
				controller.close();
			}
		});
		await expectRefusal(await postRaw('/runs', chunks, 'application/json', { duplex: 'half' }), 413, 'body_too_large');
		expect(await runCount()).toBe(before);
	});

	it('answers a well-formed id of no case of the team 404, and still queues a real case', async () => {
		const before = await runCount();
		const unknown = await expectRefusal(await postJsonText(JSON.stringify({ caseId: '00000000-0000-4000-8000-000000000000' })), 404, 'not_found');
		expect(unknown.message).toBe('Case not found');
		expect(await runCount()).toBe(before);

		const res = await analyst.postJson('/runs', { caseId, extra: 'ignored' });
		expect(res.status, await res.clone().text()).toBe(201);
		const { run } = (await res.json()) as { run: { id: string; status: string } };
		expect(run.status).toBe('queued');
		expect(await runCount()).toBe(before + 1);
		// cancel it again: no worker runs in this file
		expect((await analyst.postJson(`/runs/${run.id}/cancel`, {})).status).toBe(200);
		const [row] = await handle.db.select({ status: runs.status }).from(runs).where(and(eq(runs.id, run.id), eq(runs.teamId, team.team.id)));
		expect(row.status).toBe('cancelled');
	});

	it('never answers 500 to any JSON value', async () => {
		const before = await runCount();
		const body = fc.oneof(
			fc.jsonValue({ maxDepth: 3 }),
			fc.record({ caseId: fc.oneof(fc.jsonValue({ maxDepth: 1 }), fc.string({ unit: 'binary', maxLength: 100 }), fc.uuid()) })
		);
		await fc.assert(
			fc.asyncProperty(body, async (value) => {
				const res = await analyst.postJson('/runs', value);
				const text = await res.text();
				expect(res.status, `${JSON.stringify(value)} → ${text}`).toBeLessThan(500);
				expect([400, 404]).toContain(res.status);
				const parsed = JSON.parse(text) as ErrorBody;
				expect(['invalid_input', 'not_found']).toContain(parsed.error.code);
			}),
			{ numRuns: 30, seed: 20_260_611 }
		);
		expect(await runCount()).toBe(before);
	});
});

describe('malformed ids in paths and forms', () => {
	const bad = ['not-a-uuid', '..%2F..%2Fetc', 'a'.repeat(3000)];

	it('answers 404 for malformed ids of runs, cases and comparisons, never 500', async () => {
		for (const id of bad) {
			await expectRefusal(await analyst.postJson(`/runs/${id}/cancel`, {}), 404, 'not_found');
			await expectRefusal(await analyst.postJson(`/runs/${id}/rerun`, {}), 404, 'not_found');
			for (const path of [`/cases/${id}`, `/cases/${id}/export.json`, `/compare/${id}`, `/runs/${id}`, `/runs/${id}/history`, `/runs/${id}/snapshots/1`]) {
				const res = await analyst.get(path);
				expect(res.status, path).toBe(404);
			}
			// form actions behind a malformed id
			expect((await analyst.post(`/cases/${id}?/clone`, {})).status).toBe(404);
			expect((await analyst.post(`/runs/${id}?/cancel`, {})).status).toBeLessThan(500);
		}
	});

	it('answers 400 to a form body that cannot be read, in any form action', async () => {
		for (const path of ['/columns/new', '/team/switch', '/signin?/link']) {
			const res = await postRaw(path, 'not a multipart body', 'multipart/form-data; boundary=nothing-here');
			expect(res.status, path).toBe(400);
		}
	});

	it('reads an unusable event cursor as the start, not as an error', async () => {
		const res = await analyst.postJson('/runs', { caseId });
		const { run } = (await res.json()) as { run: { id: string } };
		const controller = new AbortController();
		const events = await fetch(new URL(`/runs/${run.id}/events?after=99999999999.0.0`, app.baseUrl), {
			headers: { accept: 'text/event-stream', cookie: [...analyst.cookies].map(([k, v]) => `${k}=${v}`).join('; ') },
			signal: controller.signal
		});
		expect(events.status).toBe(200);
		const reader = events.body!.getReader();
		let text = '';
		const deadline = Date.now() + 10_000;
		while (!/event: status|read failed/.test(text) && Date.now() < deadline) {
			const { value, done } = await reader.read();
			if (done) break;
			text += new TextDecoder().decode(value);
		}
		controller.abort();
		expect(text).not.toContain('read failed');
		expect(text).toContain('event: status');
		await analyst.postJson(`/runs/${run.id}/cancel`, {});
	});
});
