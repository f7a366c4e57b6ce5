/** GET /api/v1/runs/[id]/residuals — the residual history, oldest step first, a page at a time. */
import { requireMember } from '$lib/server/guard';
import * as runs from '$lib/server/runs';
import { decodeStepCursor, encodeStepCursor, notFound, ok, parseQuery } from '$lib/server/api/http';
import { stepPageQuery } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const db = runs.appHandle.db;
	const run = await runs.getRun({ db, teamId: team.id, runId: event.params.id });
	if (!run) return notFound('Run');
	const q = parseQuery(event.url, stepPageQuery);
	if (!q.ok) return q.response;
	const after = decodeStepCursor(q.data.cursor);
	if (!after.ok) return after.response;
	const points = await runs.listResiduals({ db, runId: run.id, afterStep: after.data, limit: q.data.limit + 1 });
	const items = points.slice(0, q.data.limit);
	const nextCursor = points.length > q.data.limit ? encodeStepCursor(items[items.length - 1].step) : null;
	return ok({ items, nextCursor });
};
