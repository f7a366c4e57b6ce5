import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { requireMember, requireTeamRow } from '$lib/server/guard';
import { columns } from '$lib/server/db/schema';
import { columnForm, tagTaken, updateColumn } from '$lib/server/columns';
import { parseForm } from '$lib/server/forms';
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
		const { data, values, failure } = parseForm(columnForm, await event.request.formData());
		if (!data) return failure;
		if (await tagTaken({ teamId: team.id, tag: data.tag, exceptId: column.id })) {
			return fail(400, { values, errors: { tag: `Your team already has a column ${data.tag}.` } });
		}
		await updateColumn({ teamId: team.id, id: column.id, input: data });
		await audit(db, { teamId: team.id, userId: user.id, action: 'column.update', subject: column.id, detail: { tag: data.tag } });
		redirect(303, `/columns/${column.id}`);
	}
};
