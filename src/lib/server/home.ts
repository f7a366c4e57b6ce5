/** The home page's screen-side lists: comparisons awaiting sign-off and the latest verdicts. */
import { and, desc, eq } from 'drizzle-orm';
import { db } from './db/app.js';
import { cases, comparisons, signOffs, studies, users } from './db/schema.js';
import { listAwaitingSignOff } from './signoffs.js';

export async function homeAdditions(options: { teamId: string }) {
	const awaitingComparisons = await listAwaitingSignOff({ teamId: options.teamId, limit: 10 });
	const latest = await db
		.select({
			subjectType: signOffs.subjectType,
			subjectId: signOffs.subjectId,
			verdict: signOffs.verdict,
			createdAt: signOffs.createdAt,
			signedBy: users.name,
			comparisonName: comparisons.name,
			caseName: cases.name,
			studyName: studies.name
		})
		.from(signOffs)
		.leftJoin(users, eq(users.id, signOffs.signedBy))
		.leftJoin(comparisons, and(eq(signOffs.subjectType, 'comparison'), eq(comparisons.id, signOffs.subjectId)))
		.leftJoin(cases, and(eq(signOffs.subjectType, 'case'), eq(cases.id, signOffs.subjectId)))
		.leftJoin(studies, and(eq(signOffs.subjectType, 'study'), eq(studies.id, signOffs.subjectId)))
		.where(eq(signOffs.teamId, options.teamId))
		.orderBy(desc(signOffs.createdAt))
		.limit(8);
	return {
		awaitingComparisons,
		latestSignOffs: latest.map((s) => ({
			subjectType: s.subjectType,
			subjectId: s.subjectId,
			verdict: s.verdict,
			createdAt: s.createdAt,
			signedBy: s.signedBy,
			name: s.comparisonName ?? s.caseName ?? s.studyName ?? '(deleted)',
			href: s.subjectType === 'comparison' ? `/compare/${s.subjectId}` : s.subjectType === 'study' ? `/studies/${s.subjectId}` : `/cases/${s.subjectId}`
		}))
	};
}
