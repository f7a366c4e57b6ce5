/** GET /api/v1/columns/[id] — one column of the team. */
import { requireMember, requireTeamRow } from '$lib/server/guard';
import { columns } from '$lib/server/db/schema';
import { ok } from '$lib/server/api/http';
import { columnView } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
	return ok(columnView(column));
};
