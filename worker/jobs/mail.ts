/**
 * The e-mail to whoever queued a run when it ends, unless they muted run mail for that team.
 */
import { and, eq } from 'drizzle-orm';
import type { Db } from '../../src/lib/server/db/index.js';
import { cases, columns, memberships, runs, users } from '../../src/lib/server/db/schema.js';
import { sendMail } from '../../src/lib/server/mail/send.js';

const WORDS: Record<string, string> = {
	converged: 'converged to steady state',
	finished: 'reached its end time',
	failed: 'failed',
	cancelled: 'was cancelled'
};

/** Sends the mail; returns false when nobody is to be told (no queuer, muted, or not ended). */
export async function sendRunEndedMail(o: { db: Db; runId: string }): Promise<boolean> {
	const [row] = await o.db
		.select({
			status: runs.status,
			errorMessage: runs.errorMessage,
			steps: runs.steps,
			simulatedTimeS: runs.simulatedTimeS,
			wallTimeS: runs.wallTimeS,
			caseName: cases.name,
			frozenName: runs.caseDocument,
			columnTag: columns.tag,
			email: users.email,
			name: users.name,
			muted: memberships.muteRunMail
		})
		.from(runs)
		.innerJoin(columns, eq(columns.id, runs.columnId))
		.leftJoin(cases, eq(cases.id, runs.caseId))
		.innerJoin(users, eq(users.id, runs.queuedBy))
		.leftJoin(memberships, and(eq(memberships.userId, runs.queuedBy), eq(memberships.teamId, runs.teamId)))
		.where(eq(runs.id, o.runId));
	if (!row || row.muted !== false || !(row.status in WORDS)) return false;
	const caseName = row.caseName ?? row.frozenName.name;
	const origin = (process.env.ORIGIN ?? 'http://127.0.0.1:5173').replace(/\/$/, '');
	const lines = [
		`Hello ${row.name ?? row.email},`,
		'',
		`The run of case "${caseName}" on column ${row.columnTag} ${WORDS[row.status]}.`,
		`Steps: ${row.steps}; simulated time: ${row.simulatedTimeS.toPrecision(4)} s; wall time: ${row.wallTimeS.toFixed(1)} s.`
	];
	if (row.errorMessage) lines.push(`Reason: ${row.errorMessage}`);
	lines.push('', `Open the run: ${origin}/runs/${o.runId}`, '', 'You can mute these e-mails on your team page.');
	await sendMail({
		to: row.email,
		subject: `Twofold: run ${row.status} — ${caseName} (${row.columnTag})`,
		text: lines.join('\n')
	});
	return true;
}
