/** GET /api/v1/columns — the team's columns, newest first, a page at a time. */
import { requireMember } from '$lib/server/guard';
import { ok, parseListQuery } from '$lib/server/api/http';
import { listColumnsPage } from '$lib/server/api/lists';
import { columnsQuery, columnView } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const q = parseListQuery(event.url, columnsQuery);
	if (!q.ok) return q.response;
	const page = await listColumnsPage({ teamId: team.id, ...q.data });
	return ok({ items: page.items.map(columnView), nextCursor: page.nextCursor });
};
