/**
 * GET /api/v1/cases — the team's cases (without documents), newest first.
 * POST /api/v1/cases — create a case `{ columnId, document }`, checked with the editor's case
 * schema (a document of an earlier schema version is upgraded first, as an imported file is); refusals
 * name the field path (`document.geometry.heightM`). Analysts and up.
 */
import { requireMember } from '$lib/server/guard';
import { errorResponse, readBody } from '$lib/server/json-body';
import * as cases from '$lib/server/cases';
import { ok, parseListQuery } from '$lib/server/api/http';
import { listCasesPage, teamColumn } from '$lib/server/api/lists';
import { caseCreateBody, caseDetailView, casesQuery, caseSummaryView, upgradeBodyDocument } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const q = parseListQuery(event.url, casesQuery);
	if (!q.ok) return q.response;
	const page = await listCasesPage({ teamId: team.id, columnId: q.data.column, ...q.data });
	return ok({ items: page.items.map(caseSummaryView), nextCursor: page.nextCursor });
};

export const POST: RequestHandler = async (event) => {
	const { team, user } = await requireMember(event, 'analyst');
	const body = await readBody(event.request, caseCreateBody, { prepare: upgradeBodyDocument });
	if (!body.ok) return body.response;
	const column = await teamColumn({ teamId: team.id, id: body.data.columnId });
	if (!column) return errorResponse(404, 'not_found', 'Column not found.', [{ path: 'columnId', message: 'No column of your team has this id' }]);
	const created = await cases.createCase({ teamId: team.id, columnId: column.id, userId: user.id, document: body.data.document });
	return ok(caseDetailView(created), { status: 201 });
};
