/**
 * GET /api/v1/runs — the team's runs, newest queued first (`column`, `case`, `study`, `status`,
 * `since`, `until` filters). POST /api/v1/runs — queue a run of a case `{ caseId }`; analysts and up.
 */
import { requireMember } from '$lib/server/guard';
import { readBody } from '$lib/server/json-body';
import * as runs from '$lib/server/runs';
import type { RunStatusValue } from '$lib/server/db/schema';
import { moduleRefusal, ok, parseListQuery } from '$lib/server/api/http';
import { listRunsPage } from '$lib/server/api/lists';
import { queueBody, runsQuery, runView } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const q = parseListQuery(event.url, runsQuery);
	if (!q.ok) return q.response;
	const statuses = q.data.status?.split(',') as RunStatusValue[] | undefined;
	const page = await listRunsPage({ teamId: team.id, columnId: q.data.column, caseId: q.data.case, studyId: q.data.study, statuses, ...q.data });
	return ok({ items: page.items.map(runView), nextCursor: page.nextCursor });
};

export const POST: RequestHandler = async (event) => {
	const { team, user } = await requireMember(event, 'analyst');
	const body = await readBody(event.request, queueBody);
	if (!body.ok) return body.response;
	try {
		const run = await runs.queue({ teamId: team.id, caseId: body.data.caseId, userId: user.id });
		return ok({ run: runView(run) }, { status: 201 });
	} catch (e) {
		const refusal = moduleRefusal(e);
		if (refusal) return refusal;
		throw e;
	}
};
