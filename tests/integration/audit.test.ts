/**
 * The audit log: role changes, sign-offs, deletions and API-token changes made through the app are
 * recorded, and the admins' page /team/audit lists them (newest first, sortable), to admins only,
 * and only their own team's.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, desc, eq } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { apiTokens, auditLog, cases, columns, comparisons, invitations, measurements, memberships, runs, users } from '../../src/lib/server/db/schema.js';
import { defaultCase } from '../../solver/case.js';
import { openTestDb } from '../helpers/db.js';
import { startApp, type RunningApp } from '../helpers/app.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { signedInClient, type TestClient } from '../helpers/http.js';

let handle: DbHandle;
let app: RunningApp;
let t: TestTeam;
let fresh: TestTeam;
let admin: TestClient;

async function actions(teamId: string): Promise<string[]> {
	const rows = await handle.db.select({ action: auditLog.action }).from(auditLog).where(eq(auditLog.teamId, teamId)).orderBy(desc(auditLog.id));
	return rows.map((r) => r.action);
}

beforeAll(async () => {
	handle = await openTestDb();
	t = await createTestTeam({ db: handle.db, name: 'Audit test team' });
	fresh = await createTestTeam({ db: handle.db, name: 'Audit empty team' });
	app = await startApp();
	admin = await signedInClient(app.baseUrl, t.members.admin);
});

afterAll(async () => {
	await app?.stop();
	await handle?.close();
});

describe('audit log', () => {
	it('records role changes, sign-offs, deletions and token changes, and shows them to admins newest first', async () => {
		const lead = await signedInClient(app.baseUrl, t.members.lead);
		const analyst = await signedInClient(app.baseUrl, t.members.analyst);
		const viewer = await signedInClient(app.baseUrl, t.members.viewer);
		const db = handle.db;

		// a role change and a removal
		expect((await admin.post('/team?/setRole', { userId: t.members.viewer.id, role: 'analyst' })).status).toBe(200);
		expect((await admin.post('/team?/setRole', { userId: t.members.viewer.id, role: 'viewer' })).status).toBe(200);
		const [gone] = await db.insert(users).values({ email: `leaving-${t.team.slug}@test.invalid` }).returning();
		await db.insert(memberships).values({ teamId: t.team.id, userId: gone.id, role: 'viewer' });
		expect((await admin.post('/team?/remove', { userId: gone.id })).status).toBe(200);
		const [inv] = await db
			.insert(invitations)
			.values({ teamId: t.team.id, email: 'withdrawn@test.invalid', role: 'viewer', tokenHash: `audit-${t.team.slug}`, expiresAt: new Date(Date.now() + 3600_000) })
			.returning();
		expect((await admin.post('/team?/revoke', { invitationId: inv.id })).status).toBe(200);

		// sign-offs of a case and a comparison
		const [col] = await db.insert(columns).values({ teamId: t.team.id, tag: 'AUD-1', diameterM: 0.2, heightM: 2 }).returning();
		const doc = defaultCase();
		const [c] = await db
			.insert(cases)
			.values({ teamId: t.team.id, columnId: col.id, name: 'Audited basis', kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc, createdBy: t.members.analyst.id })
			.returning();
		expect((await lead.post(`/cases/${c.id}?/signOff`, { verdict: 'approved-basis', comment: '' })).status).toBe(200);
		const runIds: string[] = [];
		for (let i = 0; i < 2; i++) {
			const [r] = await db
				.insert(runs)
				.values({ teamId: t.team.id, columnId: col.id, caseId: c.id, caseDocument: doc, solverVersion: 'test', status: 'converged', queuedBy: t.members.analyst.id })
				.returning();
			runIds.push(r.id);
		}
		const [cmp] = await db
			.insert(comparisons)
			.values({ teamId: t.team.id, columnId: col.id, name: 'Audited comparison', runIds, baselineRunId: runIds[0], createdBy: t.members.lead.id })
			.returning();
		expect((await lead.post(`/compare/${cmp.id}?/signOff`, { verdict: 'changes-requested', comment: 'Add the Tomiyama run.' })).status).toBe(200);

		// deletions: a measurement, then a column
		const [m] = await db
			.insert(measurements)
			.values({ teamId: t.team.id, columnId: col.id, kind: 'holdup-height', name: 'Probe to delete', superficialGasVelocityMS: 0.05, temperatureK: 293.15, pressurePa: 101325, units: { x: 'm', y: '1' }, data: { x: [0.5], y: [0.1] } })
			.returning();
		expect((await analyst.post(`/columns/${col.id}/measurements?/delete`, { id: m.id })).status).toBe(200);
		const [doomed] = await db.insert(columns).values({ teamId: t.team.id, tag: 'AUD-GONE', diameterM: 0.2, heightM: 2 }).returning();
		expect((await analyst.post(`/columns/${doomed.id}/delete`, {})).status).toBe(303);

		// a member makes an API token and revokes it
		expect((await viewer.post('/team/tokens?/create', { name: 'audit notebook', scope: 'read', expiresOn: '' })).status).toBe(200);
		const [token] = await db.select().from(apiTokens).where(and(eq(apiTokens.teamId, t.team.id), eq(apiTokens.name, 'audit notebook')));
		expect((await viewer.post('/team/tokens?/revoke', { tokenId: token.id })).status).toBe(200);

		expect(await actions(t.team.id)).toEqual([
			'apiToken.revoke',
			'apiToken.create',
			'column.delete',
			'measurement.delete',
			'comparison.signOff',
			'case.signOff',
			'invitation.revoke',
			'member.remove',
			'member.role',
			'member.role'
		]);

		const res = await admin.get('/team/audit');
		expect(res.status).toBe(200);
		const html = await res.text();
		const order = [
			'API token revoked',
			'API token created',
			'Column deleted',
			'Measurement deleted',
			'Comparison signed off',
			'Case signed off',
			'Invitation revoked',
			'Member removed',
			'Role changed'
		].map((label) => html.indexOf(`>${label}<`));
		expect(order.every((i) => i > 0), String(order)).toBe(true);
		expect([...order].sort((a, b) => a - b)).toEqual(order);
		for (const text of ['AUD-GONE', '“Probe to delete”', '“Audited basis”', 'approved basis', 'changes requested', `${t.members.viewer.email} · now analyst`, gone.email, '“audit notebook”'])
			expect(html, text).toContain(text);
		// who did it
		expect(html).toContain(t.members.lead.email);
		// a sortable table: every heading is a sort button, newest first to start with
		expect(html).toMatch(/aria-sort="descending"[^>]*>\s*<button[^>]*>\s*When/);
		expect((html.match(/<th[^>]*aria-sort=/g) ?? []).length).toBe(4);
	});

	it('is for admins only, and shows an admin only their own team, with an empty state when nothing happened yet', async () => {
		for (const role of ['viewer', 'analyst', 'lead'] as const) {
			const client = await signedInClient(app.baseUrl, t.members[role]);
			expect((await client.get('/team/audit')).status, role).toBe(403);
		}
		const otherAdmin = await signedInClient(app.baseUrl, fresh.members.admin);
		const res = await otherAdmin.get('/team/audit');
		expect(res.status).toBe(200);
		const html = await res.text();
		expect(html).toContain('Nothing recorded yet');
		expect(html).not.toContain('Audited basis');
		expect(html).not.toContain('AUD-GONE');
		// the team page links to it for admins
		expect(await (await admin.get('/team')).text()).toContain('href="/team/audit"');
	});
});
