import type { PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { listColumns, SORTABLE, type ColumnSort } from '$lib/server/columns';
import { hasRole } from '$lib/server/roles';

export const load: PageServerLoad = async (event) => {
	const { team, role } = await requireMember(event, 'viewer');
	const sortParam = event.url.searchParams.get('sort') ?? 'tag';
	const sort: ColumnSort = (SORTABLE as readonly string[]).includes(sortParam) ? (sortParam as ColumnSort) : 'tag';
	const descending = event.url.searchParams.get('dir') === 'desc';
	const filter = (event.url.searchParams.get('q') ?? '').trim().slice(0, 100);
	const rows = await listColumns({ teamId: team.id, sort, descending, filter });
	return { columns: rows, sort, descending, filter, canEdit: hasRole(role, 'analyst') };
};
