import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { requireMember, requireTeamRow } from '$lib/server/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db/app';
import { columns } from '$lib/server/db/schema';
import * as cases from '$lib/server/cases';
import { caseFromJson, MAX_CASE_JSON_BYTES } from '$lib/measurements/case-json';

export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'analyst');
	const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
	return { column: { id: column.id, tag: column.tag } };
};

export const actions: Actions = {
	default: async (event) => {
		const { user, team } = await requireMember(event, 'analyst');
		const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
		const form = await event.request.formData();
		const file = form.get('file');
		let text = String(form.get('json') ?? '');
		if (file instanceof File && file.size > 0) {
			if (file.size > MAX_CASE_JSON_BYTES) {
				return fail(400, { issues: [{ path: '', message: `The file is ${file.size} bytes; a case document is at most ${MAX_CASE_JSON_BYTES} bytes` }] });
			}
			text = await file.text();
		}
		if (text.trim() === '') return fail(400, { issues: [{ path: '', message: 'Choose a case JSON file or paste one' }] });
		const r = caseFromJson(text);
		if (!r.ok) return fail(400, { issues: r.issues });
		const created = await cases.createCase({ teamId: team.id, columnId: column.id, userId: user.id, document: r.value });
		await audit(db, { teamId: team.id, userId: user.id, action: 'case.import', subject: created.id, detail: { columnId: column.id, name: created.name } });
		redirect(303, `/cases/${created.id}`);
	}
};
