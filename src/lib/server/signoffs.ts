/**
 * Sign-offs and comments on cases and comparisons. The newest sign-off row is the current state;
 * older ones stay as the record. Signing off e-mails the analysts who queued the runs concerned.
 */
import { and, asc, desc, eq, inArray, isNotNull } from 'drizzle-orm';
import { z } from 'zod';
import { db } from './db/app.js';
import { auditLog, cases, comments, comparisons, runs, signOffs, users } from './db/schema.js';
import { sendMail } from './mail/send.js';

export type SubjectType = 'case' | 'comparison' | 'study';
export type Verdict = 'approved-basis' | 'changes-requested';

export const signOffForm = z
	.object({
		verdict: z.enum(['approved-basis', 'changes-requested'], { error: 'Choose approved basis or changes requested' }),
		comment: z.string().trim().max(4000, { error: 'Keep the comment under 4000 characters' }).default('')
	})
	.refine((f) => f.verdict === 'approved-basis' || f.comment.length > 0, {
		error: 'Say what should change',
		path: ['comment']
	});

export const commentForm = z.object({
	body: z.string().trim().min(1, { error: 'Write something first' }).max(4000, { error: 'Keep the comment under 4000 characters' })
});

export interface SignOffView {
	verdict: Verdict;
	comment: string;
	signedByEmail: string | null;
	signedByName: string | null;
	createdAt: Date;
}

export async function listSignOffs(options: { teamId: string; subjectType: SubjectType; subjectId: string }): Promise<SignOffView[]> {
	return db
		.select({ verdict: signOffs.verdict, comment: signOffs.comment, signedByEmail: users.email, signedByName: users.name, createdAt: signOffs.createdAt })
		.from(signOffs)
		.leftJoin(users, eq(users.id, signOffs.signedBy))
		.where(and(eq(signOffs.teamId, options.teamId), eq(signOffs.subjectType, options.subjectType), eq(signOffs.subjectId, options.subjectId)))
		.orderBy(desc(signOffs.createdAt));
}

export async function listComments(options: { teamId: string; subjectType: SubjectType | 'run'; subjectId: string }) {
	return db
		.select({ id: comments.id, body: comments.body, authorEmail: users.email, authorName: users.name, createdAt: comments.createdAt })
		.from(comments)
		.leftJoin(users, eq(users.id, comments.authorId))
		.where(and(eq(comments.teamId, options.teamId), eq(comments.subjectType, options.subjectType), eq(comments.subjectId, options.subjectId)))
		.orderBy(asc(comments.createdAt));
}

export async function addComment(options: { teamId: string; subjectType: SubjectType | 'run'; subjectId: string; userId: string; body: string }) {
	const [row] = await db
		.insert(comments)
		.values({ teamId: options.teamId, subjectType: options.subjectType, subjectId: options.subjectId, authorId: options.userId, body: options.body })
		.returning();
	return row;
}

/** E-mail addresses of whoever queued the runs of the subject (a comparison's runs, or a case's runs). */
async function analystsToTell(options: { teamId: string; subjectType: SubjectType; subjectId: string }): Promise<string[]> {
	let runIds: string[] = [];
	if (options.subjectType === 'comparison') {
		const [c] = await db
			.select({ runIds: comparisons.runIds })
			.from(comparisons)
			.where(and(eq(comparisons.id, options.subjectId), eq(comparisons.teamId, options.teamId)));
		runIds = c?.runIds ?? [];
	} else if (options.subjectType === 'study') {
		const rows = await db
			.select({ id: runs.id })
			.from(runs)
			.where(and(eq(runs.studyId, options.subjectId), eq(runs.teamId, options.teamId)));
		runIds = rows.map((r) => r.id);
	} else {
		const rows = await db
			.select({ id: runs.id })
			.from(runs)
			.where(and(eq(runs.caseId, options.subjectId), eq(runs.teamId, options.teamId)));
		runIds = rows.map((r) => r.id);
	}
	const emails = new Set<string>();
	if (runIds.length) {
		const rows = await db
			.select({ email: users.email })
			.from(runs)
			.innerJoin(users, eq(users.id, runs.queuedBy))
			.where(and(eq(runs.teamId, options.teamId), inArray(runs.id, runIds), isNotNull(runs.queuedBy)));
		for (const r of rows) emails.add(r.email);
	}
	if (emails.size === 0 && options.subjectType === 'case') {
		// a case without runs: tell whoever wrote it
		const [row] = await db
			.select({ email: users.email })
			.from(cases)
			.innerJoin(users, eq(users.id, cases.createdBy))
			.where(and(eq(cases.id, options.subjectId), eq(cases.teamId, options.teamId)));
		if (row) emails.add(row.email);
	}
	return [...emails];
}

/**
 * Record the lead's verdict and e-mail the analysts concerned. A mail failure does not undo the
 * sign-off (the verdict is the record; the mail is a courtesy) but is reported to the caller.
 */
export async function signOff(options: {
	teamId: string;
	subjectType: SubjectType;
	subjectId: string;
	subjectName: string;
	subjectUrl: string;
	userId: string;
	signerEmail: string;
	verdict: Verdict;
	comment: string;
}): Promise<{ mailedTo: string[]; mailError: string | null }> {
	// the verdict and its audit line commit together
	await db.transaction(async (tx) => {
		await tx.insert(signOffs).values({
			teamId: options.teamId,
			subjectType: options.subjectType,
			subjectId: options.subjectId,
			verdict: options.verdict,
			comment: options.comment,
			signedBy: options.userId
		});
		await tx.insert(auditLog).values({
			teamId: options.teamId,
			userId: options.userId,
			action: `${options.subjectType}.signOff`,
			subject: options.subjectId,
			detail: { name: options.subjectName, verdict: options.verdict }
		});
	});
	const to = await analystsToTell(options);
	const verdictText = options.verdict === 'approved-basis' ? 'approved as the model basis' : 'sent back: changes requested';
	let mailError: string | null = null;
	for (const address of to) {
		try {
			await sendMail({
				to: address,
				subject: `Twofold: ${options.subjectType} “${options.subjectName}” ${verdictText}`,
				text: [
					`${options.signerEmail} marked the ${options.subjectType} “${options.subjectName}” as ${verdictText}.`,
					options.comment ? `\nComment:\n${options.comment}\n` : '',
					`Open it: ${options.subjectUrl}`
				].join('\n')
			});
		} catch (e) {
			mailError = (e as Error).message;
		}
	}
	return { mailedTo: to, mailError };
}

/** Comparisons and cases waiting for the lead: comparisons without any verdict yet, newest first. */
export async function listAwaitingSignOff(options: { teamId: string; limit?: number }) {
	const rows = await db
		.select({ id: comparisons.id, name: comparisons.name, columnId: comparisons.columnId, createdAt: comparisons.createdAt })
		.from(comparisons)
		.where(eq(comparisons.teamId, options.teamId))
		.orderBy(desc(comparisons.createdAt))
		.limit(200);
	if (rows.length === 0) return [];
	const signed = await db
		.selectDistinct({ subjectId: signOffs.subjectId })
		.from(signOffs)
		.where(and(eq(signOffs.teamId, options.teamId), eq(signOffs.subjectType, 'comparison'), inArray(signOffs.subjectId, rows.map((r) => r.id))));
	const done = new Set(signed.map((s) => s.subjectId));
	return rows.filter((r) => !done.has(r.id)).slice(0, options.limit ?? 20);
}
