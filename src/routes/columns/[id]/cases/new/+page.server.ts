import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms/server';
import { zod4 } from 'sveltekit-superforms/adapters';
import type { Actions, PageServerLoad } from './$types';
import { requireMember, requireTeamRow } from '$lib/server/guard';
import { columns } from '$lib/server/db/schema';
import * as cases from '$lib/server/cases';
import * as runs from '$lib/server/runs';
import { caseSchema, defaultCase, type CaseKind } from '$solver/case';

/** A new case of a column, pre-filled with the column's diameter and height. */
export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'analyst');
	const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
	const kind = (event.url.searchParams.get('kind') === 'cross-section' ? 'cross-section' : 'height-profile') as CaseKind;
	const doc = defaultCase(kind);
	doc.name = `${column.tag} base case`;
	doc.geometry.diameterM = column.diameterM;
	doc.geometry.heightM = column.heightM;
	// clear level at three quarters of the height leaves room for the level swell
	doc.geometry.clearLiquidLevelM = Number((column.heightM * 0.75).toPrecision(3));
	const form = await superValidate(doc, zod4(caseSchema), { errors: false });
	return { column: { id: column.id, tag: column.tag }, form };
};

async function save(event: Parameters<Actions['save']>[0], thenQueue: boolean) {
	const member = await requireMember(event, 'analyst');
	const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: member.team.id, what: 'Column' });
	const form = await superValidate(event.request, zod4(caseSchema));
	if (!form.valid) return fail(400, { form });
	const created = await cases.createCase({ teamId: member.team.id, columnId: column.id, userId: member.user.id, document: form.data });
	if (thenQueue) {
		try {
			const run = await runs.queue({ teamId: member.team.id, caseId: created.id, userId: member.user.id });
			redirect(303, `/runs/${run.id}`);
		} catch (e) {
			if (e instanceof runs.RunRequestError) redirect(303, `/cases/${created.id}?queueError=${encodeURIComponent(e.message)}`);
			throw e;
		}
	}
	redirect(303, `/cases/${created.id}?saved=1`);
}

export const actions: Actions = {
	save: (event) => save(event, false),
	queue: (event) => save(event, true)
};
