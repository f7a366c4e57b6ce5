/**
 * GET /api/v1/cases/[id] — one case with its document.
 * PUT /api/v1/cases/[id] — replace its document `{ document }` (analysts and up); runs already
 * queued keep their frozen copy.
 */
import { requireMember } from '$lib/server/guard';
import { readBody } from '$lib/server/json-body';
import * as cases from '$lib/server/cases';
import { notFound, ok } from '$lib/server/api/http';
import { caseDetailView, caseUpdateBody, upgradeBodyDocument } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const row = await cases.getCase({ teamId: team.id, id: event.params.id });
	if (!row) return notFound('Case');
	return ok(caseDetailView(row));
};

export const PUT: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'analyst');
	const row = await cases.getCase({ teamId: team.id, id: event.params.id });
	if (!row) return notFound('Case');
	const body = await readBody(event.request, caseUpdateBody, { prepare: upgradeBodyDocument });
	if (!body.ok) return body.response;
	const updated = await cases.updateCase({ teamId: team.id, id: row.id, document: body.data.document });
	if (!updated) return notFound('Case');
	return ok(caseDetailView(updated));
};
