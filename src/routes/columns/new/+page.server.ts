import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { columnForm, createColumn, tagTaken } from '$lib/server/columns';
import { parseForm } from '$lib/server/forms';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db/app';

export const load: PageServerLoad = async (event) => {
	await requireMember(event, 'analyst');
	return {};
};

export const actions: Actions = {
	default: async (event) => {
		const { user, team } = await requireMember(event, 'analyst');
		const { data, values, failure } = parseForm(columnForm, await event.request.formData());
		if (!data) return failure;
		if (await tagTaken({ teamId: team.id, tag: data.tag })) {
			return fail(400, { values, errors: { tag: `Your team already has a column ${data.tag}.` } });
		}
		const column = await createColumn({ teamId: team.id, userId: user.id, input: data });
		await audit(db, { teamId: team.id, userId: user.id, action: 'column.create', subject: column.id, detail: { tag: column.tag } });
		redirect(303, `/columns/${column.id}`);
	}
};
