import { fail, redirect } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import type { Actions, PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { db } from '$lib/server/db/app';
import { columns, measurements, teams } from '$lib/server/db/schema';
import * as cases from '$lib/server/cases';
import * as studyServer from '$lib/server/studies';
import { formFields, issuesToFieldErrors, studyInputFromForm } from '$lib/studies/form';
import { validateCase } from '$solver/case';
import { error } from '@sveltejs/kit';

async function loadBase(event: Parameters<PageServerLoad>[0], teamId: string) {
	const caseId = event.url.searchParams.get('case') ?? '';
	const row = await cases.getCase({ teamId, id: caseId });
	if (!row) error(404, 'Case not found. Start a study from a case page.');
	const checked = validateCase(row.document);
	if (!checked.ok) error(400, `The case "${row.name}" is not valid; fix it in the editor first.`);
	return { row, doc: checked.value };
}

/** Analysts set up a sweep, a closure matrix or a grid study of one case. */
export const load: PageServerLoad = async (event) => {
	const member = await requireMember(event, 'analyst');
	const { row, doc } = await loadBase(event, member.team.id);
	const [column] = await db.select({ id: columns.id, tag: columns.tag }).from(columns).where(eq(columns.id, row.columnId));
	const [team] = await db.select({ cap: teams.maxStudyRuns }).from(teams).where(eq(teams.id, member.team.id));
	const measured = await db
		.select({ id: measurements.id, name: measurements.name, kind: measurements.kind })
		.from(measurements)
		.where(and(eq(measurements.teamId, member.team.id), eq(measurements.columnId, row.columnId)));
	const kind = event.url.searchParams.get('kind');
	return {
		caseRow: { id: row.id, name: row.name },
		caseDoc: doc,
		column,
		cap: team?.cap ?? 100,
		measurements: measured.filter((m) => m.kind !== 'dissolved-oxygen'),
		initialKind: kind === 'closure-matrix' || kind === 'grid' ? kind : 'sweep'
	};
};

export const actions: Actions = {
	default: async (event) => {
		const member = await requireMember(event, 'analyst');
		const values = formFields(await event.request.formData());
		const input = studyInputFromForm(values);
		let id: string;
		try {
			id = (await studyServer.create({ teamId: member.team.id, userId: member.user.id, input })).study.id;
		} catch (e) {
			if (e instanceof studyServer.StudyRequestError) {
				return fail(e.status, { values, message: e.message, errors: issuesToFieldErrors(e.issues) });
			}
			throw e;
		}
		redirect(303, `/studies/${id}`);
	}
};
