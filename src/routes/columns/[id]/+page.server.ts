import type { PageServerLoad } from './$types';
import { requireMember, requireTeamRow } from '$lib/server/guard';
import { columns } from '$lib/server/db/schema';
import { hasRole } from '$lib/server/roles';
import { columnOverview } from '$lib/server/column-overview';
import { listMeasurementsForColumn } from '$lib/server/measurements';

export const load: PageServerLoad = async (event) => {
	const { team, role } = await requireMember(event, 'viewer');
	const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
	return {
		column,
		canEdit: hasRole(role, 'analyst'),
		canCompare: hasRole(role, 'lead'),
		...(await columnOverview({ teamId: team.id, columnId: column.id })),
		measurements: await listMeasurementsForColumn({ teamId: team.id, columnId: column.id })
	};
};
