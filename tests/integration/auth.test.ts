import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { signInThrottle } from '../../src/lib/server/db/schema.js';
import { MAX_FAILURES } from '../../src/lib/server/auth/throttle.js';
import { openTestDb } from '../helpers/db.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { TestClient } from '../helpers/http.js';

let handle: DbHandle;
let app: RunningApp;
let t: TestTeam;

beforeAll(async () => {
	handle = await openTestDb();
	t = await createTestTeam({ db: handle.db });
	app = await startApp();
});

afterAll(async () => {
	await app?.stop();
	await handle?.close();
});

describe('password sign-in', () => {
	it('signs in with the right password and lands on the team home', async () => {
		const client = new TestClient(app.baseUrl);
		const res = await client.post('/signin?/password', { email: t.members.analyst.email, password: t.members.analyst.password });
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe('/');
		const home = await client.get('/');
		expect(home.status).toBe(200);
		expect(await home.text()).toContain(t.team.name);
	});

	it('accepts the e-mail address in another letter case', async () => {
		const client = new TestClient(app.baseUrl);
		await client.signIn(t.members.viewer.email.toUpperCase(), t.members.viewer.password);
		expect((await client.get('/columns')).status).toBe(200);
	});

	it('refuses a wrong password with the same message as an unknown address, and sets no session', async () => {
		const wrongPassword = await new TestClient(app.baseUrl).post('/signin?/password', {
			email: t.members.lead.email,
			password: 'not-the-password'
		});
		const unknownUser = await new TestClient(app.baseUrl).post('/signin?/password', {
			email: `nobody-${Date.now()}@test.invalid`,
			password: 'not-the-password'
		});
		expect(wrongPassword.status).toBe(400);
		expect(unknownUser.status).toBe(400);
		const a = await wrongPassword.text();
		const b = await unknownUser.text();
		expect(a).toContain('E-mail or password is not right.');
		expect(b).toContain('E-mail or password is not right.');
		expect(wrongPassword.headers.getSetCookie().some((c) => c.includes('session-token='))).toBe(false);
	});

	it(`locks an address after ${MAX_FAILURES} wrong passwords, refusing even the right one`, async () => {
		const user = t.members.admin;
		const client = new TestClient(app.baseUrl);
		for (let i = 0; i < MAX_FAILURES; i++) {
			const res = await client.post('/signin?/password', { email: user.email, password: `wrong-${i}` });
			expect(res.status).toBe(400);
		}
		const locked = await client.post('/signin?/password', { email: user.email, password: user.password });
		expect(locked.status).toBe(429);
		expect(await locked.text()).toContain('Too many failed attempts');
		// unlocking by clearing the record shows the refusal came from the lock, not the password
		await handle.db.delete(signInThrottle).where(eq(signInThrottle.key, `email:${user.email}`));
		await client.signIn(user.email, user.password);
	});

	it('signs out and forgets the session', async () => {
		const client = await new TestClient(app.baseUrl).signIn(t.members.viewer.email, t.members.viewer.password);
		const out = await client.post('/signout');
		expect([302, 303]).toContain(out.status);
		const res = await client.get('/columns');
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toMatch(/^\/signin/);
	});
});
