/**
 * GET /api/v1/studies — the team's studies, newest first. POST /api/v1/studies — create and
 * queue a study `{ caseId, name, spec, measurementId? }` (the same body as POST /studies);
 * analysts and up.
 */
import { requireMember } from '$lib/server/guard';
import { readBody } from '$lib/server/json-body';
import * as studyServer from '$lib/server/studies';
import { moduleRefusal, ok, parseListQuery } from '$lib/server/api/http';
import { listStudiesPage } from '$lib/server/api/lists';
import { studiesQuery, studySummaryView } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const q = parseListQuery(event.url, studiesQuery);
	if (!q.ok) return q.response;
	const page = await listStudiesPage({ teamId: team.id, columnId: q.data.column, ...q.data });
	return ok({ items: page.items.map(studySummaryView), nextCursor: page.nextCursor });
};

export const POST: RequestHandler = async (event) => {
	const { team, user } = await requireMember(event, 'analyst');
	const body = await readBody(event.request, studyServer.studyInputSchema);
	if (!body.ok) return body.response;
	try {
		const { study, members } = await studyServer.create({ teamId: team.id, userId: user.id, input: body.data });
		return ok(
			{
				study: { id: study.id, name: study.name, kind: study.kind, memberCount: study.memberCount, columnId: study.columnId, caseId: study.caseId },
				members: members.map((m) => ({ id: m.id, index: m.studyIndex ?? 0, label: m.studyPoint?.label ?? '' }))
			},
			{ status: 201 }
		);
	} catch (e) {
		const refusal = moduleRefusal(e);
		if (refusal) return refusal;
		throw e;
	}
};
