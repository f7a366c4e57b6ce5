import { error, fail } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { isUuid, requireMember, requireTeamRow } from '$lib/server/guard';
import { columns } from '$lib/server/db/schema';
import { hasRole } from '$lib/server/roles';
import { deleteMeasurement, listMeasurementsForColumn } from '$lib/server/measurements';

export const load: PageServerLoad = async (event) => {
	const { team, role } = await requireMember(event, 'viewer');
	const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
	const measurements = await listMeasurementsForColumn({ teamId: team.id, columnId: column.id });
	return { column, measurements, canEdit: hasRole(role, 'analyst') };
};

export const actions: Actions = {
	delete: async (event) => {
		const { user, team } = await requireMember(event, 'analyst');
		const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
		const id = String((await event.request.formData()).get('id') ?? '');
		if (!isUuid(id)) return fail(400, { deleteError: 'No measurement chosen.' });
		const deleted = await deleteMeasurement({ teamId: team.id, userId: user.id, id, columnId: column.id });
		if (!deleted) error(404, 'Measurement not found.');
		return { deleted: true };
	}
};
