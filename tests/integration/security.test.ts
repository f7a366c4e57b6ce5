/**
 * Security properties of the built app, read from real responses: the Content-Security-Policy and
 * the other headers of pages, JSON endpoints and live streams, HSTS only over HTTPS, the cookie
 * flags, and the one-time and throttled parts of signing in (parallel attempts included).
 * Cross-site requests are checked for every write route in route-matrix.test.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomBytes } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { columns, invitations, memberships, runs, signInThrottle, users } from '../../src/lib/server/db/schema.js';
import { MAX_FAILURES } from '../../src/lib/server/auth/throttle.js';
import { defaultCase } from '../../solver/case.js';
import { openTestDb } from '../helpers/db.js';
import { freePort, startApp, type RunningApp } from '../helpers/app.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { TestClient, signedInClient } from '../helpers/http.js';
import { firstLink, waitForMail } from '../helpers/mail.js';

let handle: DbHandle;
let app: RunningApp;
let secure: RunningApp;
let secureOrigin: string;
let t: TestTeam;
let runId: string;

/** `default-src 'self'; script-src 'self' 'nonce-…'` → { 'default-src': ["'self'"], … } */
function directives(header: string | null): Record<string, string[]> {
	const out: Record<string, string[]> = {};
	for (const part of (header ?? '').split(';')) {
		const [name, ...values] = part.trim().split(/\s+/);
		if (name) out[name] = values;
	}
	return out;
}

/** Reads the headers of a live stream, then drops it. */
async function streamHeaders(url: string, cookie: string): Promise<Response> {
	const controller = new AbortController();
	const res = await fetch(url, { headers: { accept: 'text/event-stream', cookie }, signal: controller.signal });
	controller.abort();
	return res;
}

const cookieOf = (c: TestClient) => [...c.cookies].map(([k, v]) => `${k}=${v}`).join('; ');

beforeAll(async () => {
	handle = await openTestDb();
	t = await createTestTeam({ db: handle.db, name: 'Security test team' });
	const doc = defaultCase();
	const [col] = await handle.db.insert(columns).values({ teamId: t.team.id, tag: 'SEC-1', diameterM: 0.2, heightM: 2 }).returning();
	const [run] = await handle.db
		.insert(runs)
		.values({ teamId: t.team.id, columnId: col.id, caseDocument: doc, solverVersion: 'test', status: 'converged', queuedBy: t.members.analyst.id })
		.returning();
	runId = run.id;
	app = await startApp();
	// the same build behind an HTTPS address (TLS ends at a proxy in front of it; here the test
	// talks plain HTTP to the port and sends the Origin a browser on the HTTPS address would send)
	const port = await freePort();
	secureOrigin = `https://127.0.0.1:${port}`;
	secure = await startApp({ port, env: { ORIGIN: secureOrigin } });
}, 180_000);

afterAll(async () => {
	await secure?.stop();
	await app?.stop();
	await handle?.close();
});

describe('Content-Security-Policy and other headers', () => {
	it('gives a page a policy without inline scripts: a fresh nonce per response on every script, nothing else inline', async () => {
		const first = await new TestClient(app.baseUrl).get('/signin');
		const second = await new TestClient(app.baseUrl).get('/signin');
		expect(first.status).toBe(200);
		const csp = directives(first.headers.get('content-security-policy'));
		expect(csp['default-src']).toEqual(["'self'"]);
		expect(csp['object-src']).toEqual(["'none'"]);
		expect(csp['base-uri']).toEqual(["'self'"]);
		expect(csp['form-action']).toEqual(["'self'"]);
		expect(csp['frame-ancestors']).toEqual(["'none'"]);
		expect(csp['script-src']).toContain("'self'");
		expect(csp['script-src']).not.toContain("'unsafe-inline'");
		expect(csp['script-src']).not.toContain("'unsafe-eval'");
		expect(csp['style-src-elem']).toEqual(["'self'"]);
		const nonce = csp['script-src'].find((v) => v.startsWith("'nonce-"))?.slice(7, -1);
		expect(nonce).toBeTruthy();
		const html = await first.text();
		const scripts = [...html.matchAll(/<script\b([^>]*)>/g)].map((m) => m[1]);
		expect(scripts.length).toBeGreaterThan(0);
		for (const attrs of scripts) expect(attrs).toContain(`nonce="${nonce}"`);
		// no inline event handlers or javascript: links, which no nonce could allow
		expect(html).not.toMatch(/\son[a-z]+=["']/i);
		expect(html).not.toMatch(/javascript:/i);
		const again = directives(second.headers.get('content-security-policy'))['script-src'].find((v) => v.startsWith("'nonce-"));
		expect(again).not.toBe(`'nonce-${nonce}'`);
		for (const res of [first, second]) {
			expect(res.headers.get('x-frame-options')).toBe('DENY');
			expect(res.headers.get('x-content-type-options')).toBe('nosniff');
			expect(res.headers.get('referrer-policy')).toBe('same-origin');
			// served over plain HTTP: no HSTS
			expect(res.headers.get('strict-transport-security')).toBe(null);
		}
	});

	it('gives the pages of a signed-in member, error pages, JSON, CSV and live streams their headers', async () => {
		const viewer = await signedInClient(app.baseUrl, t.members.viewer);
		for (const path of ['/', `/runs/${runId}`, '/no-such-page']) {
			const res = await viewer.get(path);
			expect([200, 404], path).toContain(res.status);
			const csp = directives(res.headers.get('content-security-policy'));
			expect(csp['frame-ancestors'], path).toEqual(["'none'"]);
			expect(csp['script-src'].some((v) => v.startsWith("'nonce-")), path).toBe(true);
			expect(res.headers.get('x-content-type-options'), path).toBe('nosniff');
		}
		const answers = [
			await viewer.get(`/runs/${runId}/history`, { accept: 'application/json' }),
			await viewer.get(`/runs/${runId}/residuals.csv`, { accept: 'text/csv' }),
			await viewer.get('/api/v1/me', { accept: 'application/json' }),
			await new TestClient(app.baseUrl).get('/runs', { accept: 'application/json' }),
			await streamHeaders(`${app.baseUrl}/runs/${runId}/events`, cookieOf(viewer))
		];
		for (const res of answers) {
			const what = `${res.url} ${res.status}`;
			expect(res.headers.get('content-security-policy'), what).toBe("default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'");
			expect(res.headers.get('x-content-type-options'), what).toBe('nosniff');
			expect(res.headers.get('x-frame-options'), what).toBe('DENY');
			expect(res.headers.get('strict-transport-security'), what).toBe(null);
		}
		expect(answers[4].headers.get('content-type')).toContain('text/event-stream');
	});

	it('keeps the session cookie HttpOnly and SameSite=Lax, and not Secure over plain HTTP', async () => {
		const res = await new TestClient(app.baseUrl).post('/signin?/password', { email: t.members.viewer.email, password: t.members.viewer.password });
		expect(res.status).toBe(303);
		const cookies = res.headers.getSetCookie();
		const session = cookies.find((c) => /^authjs\.session-token=/.test(c));
		expect(session, cookies.join('\n')).toBeTruthy();
		for (const c of cookies) {
			expect(c, c).toMatch(/;\s*HttpOnly/i);
			expect(c, c).toMatch(/;\s*SameSite=Lax/i);
			expect(c, c).toMatch(/;\s*Path=\//i);
		}
		expect(session).not.toMatch(/;\s*Secure/i);
	});
});

describe('served over HTTPS', () => {
	const post = (path: string, form: Record<string, string>, cookie = '') =>
		fetch(new URL(path, secure.baseUrl), {
			method: 'POST',
			redirect: 'manual',
			headers: { origin: secureOrigin, 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html', cookie },
			body: new URLSearchParams(form)
		});

	it('sends HSTS on pages, JSON and streams, and only Secure, HttpOnly, SameSite=Lax cookies', async () => {
		const page = await fetch(new URL('/signin', secure.baseUrl), { headers: { accept: 'text/html' } });
		expect(page.status).toBe(200);
		expect(page.headers.get('strict-transport-security')).toBe('max-age=31536000; includeSubDomains');

		const signIn = await post('/signin?/password', { email: t.members.viewer.email, password: t.members.viewer.password });
		expect(signIn.status).toBe(303);
		const cookies = signIn.headers.getSetCookie();
		const session = cookies.find((c) => /^__Secure-authjs\.session-token=/.test(c));
		expect(session, cookies.join('\n')).toBeTruthy();
		for (const c of cookies) {
			expect(c, c).toMatch(/;\s*Secure/i);
			expect(c, c).toMatch(/;\s*HttpOnly/i);
			expect(c, c).toMatch(/;\s*SameSite=Lax/i);
		}
		const cookie = cookies.map((c) => c.split(';')[0]).join('; ');

		// the team cookie a member of several teams gets is flagged the same way
		const switched = await post('/team/switch', { teamId: t.team.id }, cookie);
		expect(switched.status).toBe(303);
		const team = switched.headers.getSetCookie().find((c) => c.startsWith('twofold_team='));
		expect(team).toMatch(/;\s*Secure/i);
		expect(team).toMatch(/;\s*HttpOnly/i);
		expect(team).toMatch(/;\s*SameSite=Lax/i);

		const json = await fetch(new URL(`/runs/${runId}/history`, secure.baseUrl), { headers: { accept: 'application/json', cookie } });
		expect(json.status).toBe(200);
		expect(json.headers.get('strict-transport-security')).toBe('max-age=31536000; includeSubDomains');
		const stream = await streamHeaders(`${secure.baseUrl}/runs/${runId}/events`, cookie);
		expect(stream.status).toBe(200);
		expect(stream.headers.get('strict-transport-security')).toBe('max-age=31536000; includeSubDomains');
	});
});

describe('signing in', () => {
	it(`holds the lock under 20 wrong passwords at once: the right one is refused afterwards`, async () => {
		const user = t.members.lead;
		const attempts = await Promise.all(
			Array.from({ length: 20 }, (_, i) => new TestClient(app.baseUrl).post('/signin?/password', { email: user.email, password: `wrong-${i}` }))
		);
		const statuses = attempts.map((r) => r.status);
		// each is refused: as a wrong password, or already as locked
		expect(statuses.every((s) => s === 400 || s === 429), statuses.join(',')).toBe(true);
		expect(statuses.filter((s) => s === 400).length).toBeGreaterThanOrEqual(MAX_FAILURES);
		for (const r of attempts) expect(r.headers.getSetCookie().some((c) => c.includes('session-token='))).toBe(false);
		const right = await new TestClient(app.baseUrl).post('/signin?/password', { email: user.email, password: user.password });
		expect(right.status).toBe(429);
		expect(await right.text()).toContain('Too many failed attempts');
		// and the same in another letter case: the lock is per address, not per spelling
		const upper = await new TestClient(app.baseUrl).post('/signin?/password', { email: user.email.toUpperCase(), password: user.password });
		expect(upper.status).toBe(429);
		await handle.db.delete(signInThrottle).where(eq(signInThrottle.key, `email:${user.email}`));
		await new TestClient(app.baseUrl).signIn(user.email, user.password);
	});

	it('signs in with a mailed link once, even when the link is opened five times at once', async () => {
		const member = t.members.analyst;
		const since = new Date(Date.now() - 1000);
		expect((await new TestClient(app.baseUrl).post('/signin?/link', { email: member.email })).status).toBe(303);
		const link = firstLink((await waitForMail({ db: handle.db, to: member.email, since })).text);
		const clients = Array.from({ length: 5 }, () => new TestClient(app.baseUrl));
		await Promise.all(clients.map((c) => c.get(link)));
		const signedIn = await Promise.all(clients.map(async (c) => (await c.get('/columns')).status === 200));
		expect(signedIn.filter(Boolean)).toHaveLength(1);
		const late = new TestClient(app.baseUrl);
		await late.get(link);
		expect((await late.get('/columns')).status).toBe(303);
	});

	it('accepts an invitation once, also when it is posted five times at once, and never after it expired', async () => {
		const token = randomBytes(24).toString('base64url');
		const tokenHash = createHash('sha256').update(token).digest('hex');
		const email = `once-${randomBytes(3).toString('hex')}@test.invalid`;
		const [inv] = await handle.db
			.insert(invitations)
			.values({ teamId: t.team.id, email, role: 'analyst', tokenHash, invitedBy: t.members.admin.id, expiresAt: new Date(Date.now() + 3600_000) })
			.returning();
		const form = { name: 'Once Only', password: 'a-long-enough-password', confirm: 'a-long-enough-password' };
		const answers = await Promise.all(Array.from({ length: 5 }, () => new TestClient(app.baseUrl).post(`/invite/${token}`, form)));
		const statuses = answers.map((r) => r.status).sort();
		expect(statuses, statuses.join(',')).toEqual([303, 404, 404, 404, 404]);
		const accounts = await handle.db.select().from(users).where(eq(users.email, email));
		expect(accounts).toHaveLength(1);
		const joined = await handle.db.select().from(memberships).where(and(eq(memberships.teamId, t.team.id), eq(memberships.userId, accounts[0].id)));
		expect(joined).toHaveLength(1);
		expect((await new TestClient(app.baseUrl).get(`/invite/${token}`)).status).toBe(404);
		expect(inv.id).toBeTruthy();

		// an invitation past its expiry: neither the page nor the form works
		const oldToken = randomBytes(24).toString('base64url');
		const oldEmail = `expired-${randomBytes(3).toString('hex')}@test.invalid`;
		await handle.db.insert(invitations).values({
			teamId: t.team.id,
			email: oldEmail,
			role: 'viewer',
			tokenHash: createHash('sha256').update(oldToken).digest('hex'),
			invitedBy: t.members.admin.id,
			expiresAt: new Date(Date.now() - 1000)
		});
		expect((await new TestClient(app.baseUrl).get(`/invite/${oldToken}`)).status).toBe(404);
		expect((await new TestClient(app.baseUrl).post(`/invite/${oldToken}`, form)).status).toBe(404);
		expect(await handle.db.select().from(users).where(eq(users.email, oldEmail))).toHaveLength(0);
	});
});
