import { error, fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { requireMember, requireTeamRow } from '$lib/server/guard';
import { columns } from '$lib/server/db/schema';
import { formValues } from '$lib/server/forms';
import { createMeasurement } from '$lib/server/measurements';
import { MAX_FILE_BYTES } from '$lib/measurements/csv';

export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'analyst');
	const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
	return { column };
};

export const actions: Actions = {
	default: async (event) => {
		const { user, team } = await requireMember(event, 'analyst');
		const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
		const formData = await event.request.formData();
		const values = formValues(formData);
		const file = formData.get('file');
		let csvText = '';
		let fileName: string | null = null;
		if (file instanceof File && file.size > 0) {
			if (file.size > MAX_FILE_BYTES) {
				return fail(400, { values, errors: { file: `The file is ${file.size} bytes; the limit is ${MAX_FILE_BYTES} bytes` }, csvErrors: [] });
			}
			csvText = await file.text();
			fileName = file.name;
		} else {
			return fail(400, { values, errors: { file: 'Choose a CSV file' }, csvErrors: [] });
		}
		const r = await createMeasurement({ teamId: team.id, userId: user.id, columnId: column.id, form: values, csvText, fileName });
		if (!r) error(404, 'Column not found.');
		if (!r.ok) return fail(400, { values, errors: r.fieldErrors, csvErrors: r.csvErrors });
		redirect(303, `/columns/${column.id}/measurements/${r.measurement.id}`);
	}
};
