import type { Db } from './db/index.js';
import { auditLog } from './db/schema.js';

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
