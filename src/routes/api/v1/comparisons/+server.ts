/**
 * GET /api/v1/comparisons — the team's comparisons, newest first, with their current verdict.
 * POST /api/v1/comparisons — `{ columnId, name, runIds, baselineRunId, measurementId? }`, the
 * comparison form of the page; leads and up.
 */
import { requireMember } from '$lib/server/guard';
import { errorResponse, readBody } from '$lib/server/json-body';
import * as comparisons from '$lib/server/comparisons';
import { moduleRefusal, ok, parseListQuery } from '$lib/server/api/http';
import { listComparisonsPage, teamColumn } from '$lib/server/api/lists';
import { comparisonCreateBody, comparisonsQuery } from '$lib/server/api/schemas';
import { comparisonDetail, comparisonSummaryView } from '$lib/server/api/comparison-views';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const q = parseListQuery(event.url, comparisonsQuery);
	if (!q.ok) return q.response;
	const page = await listComparisonsPage({ teamId: team.id, columnId: q.data.column, ...q.data });
	return ok({ items: page.items.map(comparisonSummaryView), nextCursor: page.nextCursor });
};

export const POST: RequestHandler = async (event) => {
	const { team, user } = await requireMember(event, 'lead');
	const body = await readBody(event.request, comparisonCreateBody);
	if (!body.ok) return body.response;
	const { columnId, ...input } = body.data;
	const column = await teamColumn({ teamId: team.id, id: columnId });
	if (!column) return errorResponse(404, 'not_found', 'Column not found.', [{ path: 'columnId', message: 'No column of your team has this id' }]);
	try {
		const created = await comparisons.createComparison({ teamId: team.id, columnId: column.id, userId: user.id, input });
		return ok(await comparisonDetail(team.id, created), { status: 201 });
	} catch (e) {
		const refusal = moduleRefusal(e);
		if (refusal) return refusal;
		throw e;
	}
};
