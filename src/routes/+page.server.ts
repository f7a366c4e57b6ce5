import { and, desc, eq, inArray, notInArray, sql } from 'drizzle-orm';
import type { PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { db } from '$lib/server/db/app';
import { columns, runs, signOffs } from '$lib/server/db/schema';
import { countColumns } from '$lib/server/columns';
import { homeAdditions } from '$lib/server/home';
import { listStudies } from '$lib/server/studies';

/** The team home: runs in progress, recent results, items awaiting sign-off. */
export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const runFields = {
		id: runs.id,
		status: runs.status,
		queuedAt: runs.queuedAt,
		finishedAt: runs.finishedAt,
		simulatedTimeS: runs.simulatedTimeS,
		steps: runs.steps,
		columnTag: columns.tag,
		caseName: sql<string>`${runs.caseDocument}->>'name'`
	};
	const inProgress = await db
		.select(runFields)
		.from(runs)
		.innerJoin(columns, eq(columns.id, runs.columnId))
		.where(and(eq(runs.teamId, team.id), inArray(runs.status, ['queued', 'running'])))
		.orderBy(desc(runs.queuedAt))
		.limit(20);
	const recent = await db
		.select(runFields)
		.from(runs)
		.innerJoin(columns, eq(columns.id, runs.columnId))
		.where(and(eq(runs.teamId, team.id), notInArray(runs.status, ['queued', 'running'])))
		.orderBy(desc(runs.finishedAt))
		.limit(10);
	// the newest verdict per subject; "changes requested" means it waits for another look
	const verdicts = await db
		.selectDistinctOn([signOffs.subjectType, signOffs.subjectId], {
			subjectType: signOffs.subjectType,
			subjectId: signOffs.subjectId,
			verdict: signOffs.verdict,
			createdAt: signOffs.createdAt
		})
		.from(signOffs)
		.where(eq(signOffs.teamId, team.id))
		.orderBy(signOffs.subjectType, signOffs.subjectId, desc(signOffs.createdAt));
	return {
		teamName: team.name,
		columnCount: await countColumns(team.id),
		inProgress,
		recent,
		awaiting: verdicts.filter((v) => v.verdict === 'changes-requested'),
		studies: await listStudies({ db, teamId: team.id, limit: 5 }),
		...(await homeAdditions({ teamId: team.id }))
	};
};
