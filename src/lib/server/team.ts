/** Members, roles and invitations of a team. */
import { createHash, randomBytes } from 'node:crypto';
import { and, asc, desc, eq, gt, isNull, sql } from 'drizzle-orm';
import { z } from 'zod';
import { db } from './db/app.js';
import { invitations, memberships, outgoingMail, teams, users, type Role } from './db/schema.js';
import { sendMail } from './mail/send.js';
import { ROLES } from './roles.js';

export const INVITATION_DAYS = 7;

export class MailNotSent extends Error {}

export function hashToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

export const inviteForm = z.object({
	email: z.string().trim().toLowerCase().email('Enter a valid e-mail address.'),
	role: z.enum(ROLES as [Role, ...Role[]], { message: 'Choose a role.' })
});

export const MAX_STUDY_RUNS_LIMIT = 1000;

/** The admin's cap on the member runs of one study (`teams.max_study_runs`). */
export const studyRunsForm = z.object({
	maxStudyRuns: z.coerce
		.number({ message: 'Enter a whole number of runs.' })
		.int('Enter a whole number of runs.')
		.min(1, 'At least 1 run.')
		.max(MAX_STUDY_RUNS_LIMIT, `At most ${MAX_STUDY_RUNS_LIMIT} runs.`)
});

export async function setMaxStudyRuns(options: { teamId: string; maxStudyRuns: number }): Promise<void> {
	await db.update(teams).set({ maxStudyRuns: options.maxStudyRuns }).where(eq(teams.id, options.teamId));
}

export async function listMembers(teamId: string) {
	return db
		.select({ userId: users.id, email: users.email, name: users.name, role: memberships.role, since: memberships.createdAt })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(eq(memberships.teamId, teamId))
		.orderBy(asc(users.email));
}

export async function listOpenInvitations(teamId: string) {
	return db
		.select()
		.from(invitations)
		.where(and(eq(invitations.teamId, teamId), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())))
		.orderBy(desc(invitations.createdAt));
}

async function adminCount(teamId: string): Promise<number> {
	const [row] = await db
		.select({ n: sql<number>`count(*)::int` })
		.from(memberships)
		.where(and(eq(memberships.teamId, teamId), eq(memberships.role, 'admin')));
	return row?.n ?? 0;
}

/** Changes a member's role; refuses to leave the team without an admin. Returns an error message or null. */
export async function setRole(options: { teamId: string; userId: string; role: Role }): Promise<string | null> {
	const [m] = await db
		.select()
		.from(memberships)
		.where(and(eq(memberships.teamId, options.teamId), eq(memberships.userId, options.userId)));
	if (!m) return 'No such member.';
	if (m.role === 'admin' && options.role !== 'admin' && (await adminCount(options.teamId)) <= 1) {
		return 'The team needs at least one admin.';
	}
	await db
		.update(memberships)
		.set({ role: options.role })
		.where(and(eq(memberships.teamId, options.teamId), eq(memberships.userId, options.userId)));
	return null;
}

export async function removeMember(options: { teamId: string; userId: string }): Promise<string | null> {
	const [m] = await db
		.select()
		.from(memberships)
		.where(and(eq(memberships.teamId, options.teamId), eq(memberships.userId, options.userId)));
	if (!m) return 'No such member.';
	if (m.role === 'admin' && (await adminCount(options.teamId)) <= 1) return 'The team needs at least one admin.';
	await db.delete(memberships).where(and(eq(memberships.teamId, options.teamId), eq(memberships.userId, options.userId)));
	return null;
}

/**
 * Creates an invitation and e-mails its link. Only the SHA-256 of the token is stored, so a
 * database reader cannot accept an invitation.
 */
export async function inviteMember(options: {
	teamId: string;
	teamName: string;
	invitedBy: { id: string; name: string | null; email: string };
	email: string;
	role: Role;
	origin: string;
}): Promise<{ token: string }> {
	const token = randomBytes(24).toString('base64url');
	const expiresAt = new Date(Date.now() + INVITATION_DAYS * 24 * 3600_000);
	await db.insert(invitations).values({
		teamId: options.teamId,
		email: options.email,
		role: options.role,
		tokenHash: hashToken(token),
		invitedBy: options.invitedBy.id,
		expiresAt
	});
	const link = `${options.origin}/invite/${token}`;
	const who = options.invitedBy.name ?? options.invitedBy.email;
	// an invitation nobody was told about is useless: undo it when the mail cannot go out
	await sendMail({
		to: options.email,
		subject: `${who} invites you to ${options.teamName} on Twofold`,
		text:
			`${who} invites you to join the team "${options.teamName}" on Twofold as ${options.role}.\n\n` +
			`Open this link to set your password and join (valid for ${INVITATION_DAYS} days):\n\n${link}\n`
	}).catch(async (e: unknown) => {
		await db.delete(invitations).where(eq(invitations.tokenHash, hashToken(token)));
		throw new MailNotSent(e instanceof Error ? e.message : String(e));
	});
	return { token };
}

/** Deletes one of the team's invitations; false when the team has no such invitation. */
export async function revokeInvitation(options: { teamId: string; id: string }): Promise<boolean> {
	const rows = await db
		.delete(invitations)
		.where(and(eq(invitations.id, options.id), eq(invitations.teamId, options.teamId)))
		.returning({ id: invitations.id });
	return rows.length > 0;
}

/** An open invitation by its token (with its team), or null when unknown, used or expired. */
export async function findOpenInvitation(token: string) {
	const [row] = await db
		.select({ invitation: invitations, team: teams })
		.from(invitations)
		.innerJoin(teams, eq(teams.id, invitations.teamId))
		.where(and(eq(invitations.tokenHash, hashToken(token)), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())));
	return row ?? null;
}

/**
 * The outgoing-mail box an admin may read: messages to the team's members or to addresses the
 * team invited. Mail to other teams' people stays hidden (it may hold their sign-in links).
 */
export async function listTeamMail(teamId: string, limit = 200) {
	return db
		.select({
			id: outgoingMail.id,
			toAddresses: outgoingMail.toAddresses,
			subject: outgoingMail.subject,
			receivedAt: outgoingMail.receivedAt
		})
		.from(outgoingMail)
		.where(teamMailFilter(teamId))
		.orderBy(desc(outgoingMail.receivedAt))
		.limit(limit);
}

export async function getTeamMail(teamId: string, id: string) {
	const [row] = await db
		.select()
		.from(outgoingMail)
		.where(and(eq(outgoingMail.id, id), teamMailFilter(teamId)));
	return row ?? null;
}

function teamMailFilter(teamId: string) {
	return sql`lower(${outgoingMail.toAddresses}) in (
		select lower(u.email) from ${users} u join ${memberships} m on m.user_id = u.id where m.team_id = ${teamId}
		union select lower(i.email) from ${invitations} i where i.team_id = ${teamId})`;
}
