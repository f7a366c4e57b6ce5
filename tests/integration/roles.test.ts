/**
 * The role matrix: every protected route and action of the foundation, requested as anonymous,
 * as each role, and as a member of another team. Roles are enforced on the server, so these
 * requests bypass the UI entirely.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomBytes } from 'node:crypto';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { columns, invitations, memberships, outgoingMail, users, type Role } from '../../src/lib/server/db/schema.js';
import { openTestDb } from '../helpers/db.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { ALL_ROLES, createTestTeam, type TestTeam } from '../helpers/team.js';
import { TestClient, signedInClient } from '../helpers/http.js';

let handle: DbHandle;
let app: RunningApp;
let home: TestTeam;
let other: TestTeam;
const clients = {} as Record<Role, TestClient>;
let outsider: TestClient;
let homeMailId: string;

const rank = (r: Role) => ALL_ROLES.indexOf(r);

async function newColumn(teamId: string) {
	const [c] = await handle.db
		.insert(columns)
		.values({ teamId, tag: `M-${randomBytes(3).toString('hex')}`, service: 'matrix', diameterM: 0.3, heightM: 3 })
		.returning();
	return c.id;
}

interface Check {
	name: string;
	method: 'GET' | 'POST';
	minRole: Role;
	/** builds the path (and form) for one request; fresh rows per request where the action consumes them */
	prepare(teamId: string): Promise<{ path: string; form?: Record<string, string> }>;
	/** does the path name a row of the home team (so another team must get 404)? */
	teamRow: boolean;
}

const columnForm = () => ({ tag: `N-${randomBytes(3).toString('hex')}`, service: 's', diameterM: '0.5', heightM: '4', notes: '' });

const checks: Check[] = [
	{ name: 'team home', method: 'GET', minRole: 'viewer', teamRow: false, prepare: async () => ({ path: '/' }) },
	{ name: 'columns table', method: 'GET', minRole: 'viewer', teamRow: false, prepare: async () => ({ path: '/columns?sort=heightM&dir=desc' }) },
	{ name: 'column page', method: 'GET', minRole: 'viewer', teamRow: true, prepare: async (t) => ({ path: `/columns/${await newColumn(t)}` }) },
	{ name: 'new-column form', method: 'GET', minRole: 'analyst', teamRow: false, prepare: async () => ({ path: '/columns/new' }) },
	{ name: 'create column', method: 'POST', minRole: 'analyst', teamRow: false, prepare: async () => ({ path: '/columns/new', form: columnForm() }) },
	{ name: 'edit-column form', method: 'GET', minRole: 'analyst', teamRow: true, prepare: async (t) => ({ path: `/columns/${await newColumn(t)}/edit` }) },
	{ name: 'save column', method: 'POST', minRole: 'analyst', teamRow: true, prepare: async (t) => ({ path: `/columns/${await newColumn(t)}/edit`, form: columnForm() }) },
	{ name: 'delete confirmation', method: 'GET', minRole: 'analyst', teamRow: true, prepare: async (t) => ({ path: `/columns/${await newColumn(t)}/delete` }) },
	{ name: 'delete column', method: 'POST', minRole: 'analyst', teamRow: true, prepare: async (t) => ({ path: `/columns/${await newColumn(t)}/delete` }) },
	{ name: 'team members', method: 'GET', minRole: 'viewer', teamRow: false, prepare: async () => ({ path: '/team' }) },
	{
		name: 'invite a member',
		method: 'POST',
		minRole: 'admin',
		teamRow: false,
		prepare: async () => ({ path: '/team?/invite', form: { email: `inv-${randomBytes(3).toString('hex')}@test.invalid`, role: 'viewer' } })
	},
	{
		name: 'change a role',
		method: 'POST',
		minRole: 'admin',
		teamRow: false,
		prepare: async () => ({ path: '/team?/setRole', form: { userId: home.members.viewer.id, role: 'viewer' } })
	},
	{
		name: 'remove a member',
		method: 'POST',
		minRole: 'admin',
		teamRow: false,
		prepare: async (t) => {
			const [u] = await handle.db.insert(users).values({ email: `gone-${randomBytes(3).toString('hex')}@test.invalid` }).returning();
			await handle.db.insert(memberships).values({ teamId: t, userId: u.id, role: 'viewer' });
			return { path: '/team?/remove', form: { userId: u.id } };
		}
	},
	{
		name: 'revoke an invitation',
		method: 'POST',
		minRole: 'admin',
		teamRow: false,
		prepare: async (t) => {
			const [inv] = await handle.db
				.insert(invitations)
				.values({ teamId: t, email: 'x@test.invalid', role: 'viewer', tokenHash: randomBytes(16).toString('hex'), expiresAt: new Date(Date.now() + 3600_000) })
				.returning();
			return { path: '/team?/revoke', form: { invitationId: inv.id } };
		}
	},
	{ name: 'outgoing-mail box', method: 'GET', minRole: 'admin', teamRow: false, prepare: async () => ({ path: '/team/mail' }) },
	{ name: 'one outgoing message', method: 'GET', minRole: 'admin', teamRow: true, prepare: async () => ({ path: `/team/mail/${homeMailId}` }) }
];

async function send(client: TestClient, check: Check, teamId: string) {
	const { path, form } = await check.prepare(teamId);
	return check.method === 'GET' ? client.get(path) : client.post(path, form ?? {});
}

beforeAll(async () => {
	handle = await openTestDb();
	home = await createTestTeam({ db: handle.db, name: 'Matrix home team' });
	other = await createTestTeam({ db: handle.db, name: 'Matrix other team' });
	const [mail] = await handle.db
		.insert(outgoingMail)
		.values({ fromAddress: 'no-reply@twofold.local', toAddresses: home.members.viewer.email, subject: 'matrix', raw: 'matrix' })
		.returning();
	homeMailId = mail.id;
	app = await startApp();
	for (const role of ALL_ROLES) clients[role] = await signedInClient(app.baseUrl, home.members[role]);
	// an admin elsewhere: the highest role, so only team isolation can stop it
	outsider = await signedInClient(app.baseUrl, other.members.admin);
});

afterAll(async () => {
	await app?.stop();
	await handle?.close();
});

describe.each(checks)('$method $name (at least $minRole)', (check) => {
	it('sends anonymous page requests to sign-in and refuses anonymous posts with 401', async () => {
		const res = await send(new TestClient(app.baseUrl), check, home.team.id);
		if (check.method === 'GET') {
			expect(res.status).toBe(303);
			expect(res.headers.get('location')).toMatch(/^\/signin\?redirectTo=/);
		} else {
			expect(res.status).toBe(401);
		}
	});

	it.each(ALL_ROLES)('answers %s with success when the role suffices and 403 when not', async (role) => {
		const res = await send(clients[role], check, home.team.id);
		if (rank(role) >= rank(check.minRole)) {
			expect([200, 303], `${role} on ${check.name}: ${res.status}`).toContain(res.status);
			if (res.status === 303) expect(res.headers.get('location')).not.toMatch(/^\/signin/);
		} else {
			expect(res.status).toBe(403);
		}
	});

	if (check.teamRow) {
		it("answers 404 to a member of another team asking for this team's row", async () => {
			const res = await send(outsider, check, home.team.id);
			expect(res.status).toBe(404);
		});
	}
});

describe('team isolation in lists', () => {
	it("never lists another team's columns or mail", async () => {
		const [c] = await handle.db
			.insert(columns)
			.values({ teamId: home.team.id, tag: 'SECRET-77', service: 'hidden', diameterM: 1, heightM: 5 })
			.returning();
		const list = await (await outsider.get('/columns')).text();
		expect(list).not.toContain('SECRET-77');
		const own = await (await clients.viewer.get('/columns')).text();
		expect(own).toContain('SECRET-77');
		const mail = await (await outsider.get('/team/mail')).text();
		expect(mail).not.toContain(home.members.viewer.email);
		expect(c.id).toBeTruthy();
	});

	it('answers 404 for a malformed column id rather than an error', async () => {
		expect((await clients.viewer.get('/columns/not-a-uuid')).status).toBe(404);
	});
});
