import { redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { requireMember, requireTeamRow } from '$lib/server/guard';
import { columns } from '$lib/server/db/schema';
import { deleteColumn } from '$lib/server/columns';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db/app';

export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'analyst');
	const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
	return { column };
};

export const actions: Actions = {
	default: async (event) => {
		const { user, team } = await requireMember(event, 'analyst');
		const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
		await deleteColumn({ teamId: team.id, id: column.id });
		await audit(db, { teamId: team.id, userId: user.id, action: 'column.delete', subject: column.id, detail: { tag: column.tag } });
		redirect(303, '/columns');
	}
};
