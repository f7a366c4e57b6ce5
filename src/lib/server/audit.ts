import { alias } from 'drizzle-orm/pg-core';
import { desc, eq } from 'drizzle-orm';
import type { Db } from './db/index.js';
import { auditLog, users } from './db/schema.js';

/** Appends one line to the team's audit log (who did what to which subject). */
export async function audit(
	db: Db,
	entry: { teamId: string | null; userId: string | null; action: string; subject?: string; detail?: Record<string, unknown> }
): Promise<void> {
	await db.insert(auditLog).values({
		teamId: entry.teamId,
		userId: entry.userId,
		action: entry.action,
		subject: entry.subject ?? null,
		detail: entry.detail ?? null
	});
}

/** What each action means, for people reading the log; unknown actions show as they are stored. */
export const AUDIT_ACTIONS: Record<string, string> = {
	'member.role': 'Role changed',
	'member.remove': 'Member removed',
	'invitation.create': 'Invitation sent',
	'invitation.revoke': 'Invitation revoked',
	'invitation.accept': 'Invitation accepted',
	'case.signOff': 'Case signed off',
	'comparison.signOff': 'Comparison signed off',
	'study.signOff': 'Study signed off',
	'column.create': 'Column added',
	'column.update': 'Column changed',
	'column.delete': 'Column deleted',
	'case.import': 'Case imported',
	'measurement.create': 'Measurement uploaded',
	'measurement.delete': 'Measurement deleted',
	'team.maxStudyRuns': 'Study run cap changed',
	'apiToken.create': 'API token created',
	'apiToken.revoke': 'API token revoked'
};

export interface AuditEntry {
	id: number;
	at: Date;
	action: string;
	label: string;
	/** who did it (e-mail), null when the account is gone */
	actor: string | null;
	/** what it was done to, in words */
	subject: string;
}

const VERDICTS: Record<string, string> = { 'approved-basis': 'approved basis', 'changes-requested': 'changes requested' };

function describeSubject(action: string, subject: string | null, subjectEmail: string | null, d: Record<string, unknown>): string {
	const s = (k: string) => (typeof d[k] === 'string' || typeof d[k] === 'number' ? String(d[k]) : '');
	const parts: string[] = [];
	if (subjectEmail) parts.push(subjectEmail);
	if (action === 'member.role' && s('role')) parts.push(`now ${s('role')}`);
	if (s('email')) parts.push(s('email'));
	if (s('tag')) parts.push(s('tag'));
	if (s('name')) parts.push(`“${s('name')}”`);
	if (s('verdict')) parts.push(VERDICTS[s('verdict')] ?? s('verdict'));
	if (action.startsWith('invitation.') && s('role')) parts.push(`as ${s('role')}`);
	if (s('prefix')) parts.push(`${s('prefix')}…`);
	if (s('scope')) parts.push(`scope ${s('scope')}`);
	if (action === 'team.maxStudyRuns') parts.push(`${s('from')} → ${s('to')} runs`);
	if (parts.length === 0 && subject) parts.push(subject);
	return parts.join(' · ');
}

/** The team's audit log, newest first (at most `limit` lines). */
export async function listAuditLog(db: Db, options: { teamId: string; limit?: number }): Promise<AuditEntry[]> {
	const actor = alias(users, 'actor');
	const subjectUser = alias(users, 'subject_user');
	const rows = await db
		.select({
			id: auditLog.id,
			at: auditLog.at,
			action: auditLog.action,
			subject: auditLog.subject,
			detail: auditLog.detail,
			actorEmail: actor.email,
			subjectEmail: subjectUser.email
		})
		.from(auditLog)
		.leftJoin(actor, eq(actor.id, auditLog.userId))
		.leftJoin(subjectUser, eq(subjectUser.id, auditLog.subject))
		.where(eq(auditLog.teamId, options.teamId))
		.orderBy(desc(auditLog.at), desc(auditLog.id))
		.limit(options.limit ?? 1000);
	return rows.map((r) => ({
		id: r.id,
		at: r.at,
		action: r.action,
		label: AUDIT_ACTIONS[r.action] ?? r.action,
		actor: r.actorEmail,
		subject: describeSubject(r.action, r.subject, r.subjectEmail, r.detail ?? {})
	}));
}
