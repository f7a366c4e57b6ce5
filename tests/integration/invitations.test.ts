/**
 * Invitations and e-mail links end to end through the fake SMTP server: the message is read back
 * from `outgoing_mail` and its link is used like a person would.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { invitations, memberships, users } from '../../src/lib/server/db/schema.js';
import { openTestDb } from '../helpers/db.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { TestClient, signedInClient } from '../helpers/http.js';
import { firstLink, waitForMail } from '../helpers/mail.js';

let handle: DbHandle;
let app: RunningApp;
let t: TestTeam;

beforeAll(async () => {
	handle = await openTestDb();
	t = await createTestTeam({ db: handle.db, name: 'Invitation test team' });
	app = await startApp();
});

afterAll(async () => {
	await app?.stop();
	await handle?.close();
});

describe('invitations', () => {
	it('lets an admin invite an address as analyst; the invitee sets a password from the mailed link and joins', async () => {
		const email = `new-analyst-${Date.now()}@test.invalid`;
		const admin = await signedInClient(app.baseUrl, t.members.admin);
		const since = new Date(Date.now() - 1000);
		const invite = await admin.post('/team?/invite', { email, role: 'analyst' });
		expect(invite.status).toBe(200);

		const mail = await waitForMail({ db: handle.db, to: email, since });
		expect(mail.subject).toContain('Invitation test team');
		const link = firstLink(mail.text);
		expect(link.startsWith(`${app.baseUrl}/invite/`)).toBe(true);
		// only a hash of the token is stored
		const token = link.split('/invite/')[1];
		const stored = await handle.db.select().from(invitations).where(eq(invitations.email, email));
		expect(stored).toHaveLength(1);
		expect(stored[0].tokenHash).not.toContain(token);

		const invitee = new TestClient(app.baseUrl);
		const page = await invitee.get(new URL(link).pathname);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Invitation test team');
		expect(html).toContain(email);

		// a too-short password is refused beside the field
		const short = await invitee.post(new URL(link).pathname, { name: 'Nia Example', password: 'short', confirm: 'short' });
		expect(short.status).toBe(400);
		expect(await short.text()).toContain('at least 10 characters');

		const accept = await invitee.post(new URL(link).pathname, {
			name: 'Nia Example',
			password: 'a-long-enough-password',
			confirm: 'a-long-enough-password'
		});
		expect(accept.status).toBe(303);
		expect(accept.headers.get('location')).toBe('/');

		const [user] = await handle.db.select().from(users).where(eq(users.email, email));
		const [membership] = await handle.db
			.select()
			.from(memberships)
			.where(and(eq(memberships.userId, user.id), eq(memberships.teamId, t.team.id)));
		expect(membership.role).toBe('analyst');

		// signed in straight away, with analyst rights
		expect((await invitee.get('/columns/new')).status).toBe(200);
		// the link works once
		expect((await new TestClient(app.baseUrl).get(new URL(link).pathname)).status).toBe(404);
		// and the admin sees the message in the outgoing-mail box
		expect(await (await admin.get('/team/mail')).text()).toContain(email);
	});

	it('lets a member of another team join with their existing password and switch between the two teams', async () => {
		const elsewhere = await createTestTeam({ db: handle.db, name: 'Second home team' });
		const person = elsewhere.members.lead;
		const admin = await signedInClient(app.baseUrl, t.members.admin);
		const since = new Date(Date.now() - 1000);
		expect((await admin.post('/team?/invite', { email: person.email, role: 'viewer' })).status).toBe(200);
		const path = new URL(firstLink((await waitForMail({ db: handle.db, to: person.email, since })).text)).pathname;

		const client = await signedInClient(app.baseUrl, person);
		expect(await (await client.get(path)).text()).toContain('Enter its password to join');
		expect((await client.post(path, { password: 'not-my-password' })).status).toBe(400);
		const joined = await client.post(path, { password: person.password });
		expect(joined.status).toBe(303);

		// lands in the team just joined, as viewer there
		expect(await (await client.get('/')).text()).toContain('Invitation test team');
		expect((await client.get('/columns/new')).status).toBe(403);
		// switches back to the first team, where they are lead
		expect((await client.post('/team/switch', { teamId: elsewhere.team.id })).status).toBe(303);
		expect(await (await client.get('/')).text()).toContain('Second home team');
		expect((await client.get('/columns/new')).status).toBe(200);
		// a team they are not in cannot be chosen
		const third = await createTestTeam({ db: handle.db });
		expect((await client.post('/team/switch', { teamId: third.team.id })).status).toBe(404);
	});

	it('answers 404 to an unknown invitation token', async () => {
		expect((await new TestClient(app.baseUrl).get('/invite/not-a-real-token')).status).toBe(404);
	});

	it('refuses an invitation to a bad address beside the field', async () => {
		const admin = await signedInClient(app.baseUrl, t.members.admin);
		const res = await admin.post('/team?/invite', { email: 'not-an-address', role: 'viewer' });
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('Enter a valid e-mail address.');
	});
});

describe('e-mail sign-in link', () => {
	it('mails a one-time link that signs the member in', async () => {
		const member = t.members.lead;
		const since = new Date(Date.now() - 1000);
		const res = await new TestClient(app.baseUrl).post('/signin?/link', { email: member.email, redirectTo: '/columns' });
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe('/signin/check-mail');

		const mail = await waitForMail({ db: handle.db, to: member.email, since });
		const link = firstLink(mail.text);
		const client = new TestClient(app.baseUrl);
		const callback = await client.get(link);
		expect([302, 303]).toContain(callback.status);
		expect((await client.get('/columns')).status).toBe(200);
		// used once: a second visit does not sign anyone in
		const again = new TestClient(app.baseUrl);
		await again.get(link);
		expect((await again.get('/columns')).status).toBe(303);
	});

	it('pretends to send for an unknown address, so addresses cannot be probed, and sends nothing', async () => {
		const email = `stranger-${Date.now()}@test.invalid`;
		const since = new Date(Date.now() - 1000);
		const res = await new TestClient(app.baseUrl).post('/signin?/link', { email });
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe('/signin/check-mail');
		await expect(waitForMail({ db: handle.db, to: email, since, timeoutMs: 1500 })).rejects.toThrow(/no mail/);
		expect(await handle.db.select().from(users).where(eq(users.email, email))).toHaveLength(0);
	});
});
