import { error, fail, redirect } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms/server';
import { zod4 } from 'sveltekit-superforms/adapters';
import { and, desc, eq } from 'drizzle-orm';
import type { Actions, PageServerLoad, RequestEvent } from './$types';
import { requireMember } from '$lib/server/guard';
import { hasRole } from '$lib/server/roles';
import { db } from '$lib/server/db/app';
import { columns, runs as runsTable } from '$lib/server/db/schema';
import * as cases from '$lib/server/cases';
import * as signoffs from '$lib/server/signoffs';
import { verdictActions } from '$lib/server/verdict-actions';
import * as runs from '$lib/server/runs';
import { caseSchema, validateCase } from '$solver/case';
import * as studyServer from '$lib/server/studies';
import { gridConvergence } from '$lib/studies/results';
import { cellSize } from '$lib/studies/spec';

/** The case's studies, and the discretisation uncertainty from its newest grid study with three finished grids. */
async function caseStudies(teamId: string, caseId: string) {
	const list = await studyServer.listStudies({ db, teamId, caseId, limit: 20 });
	for (const s of list.filter((x) => x.kind === 'grid' && x.counts.done >= 3)) {
		const study = await studyServer.getStudy({ db, teamId, studyId: s.id });
		if (!study) continue;
		const members = await studyServer.listMembers({ db, teamId, studyId: s.id });
		const rows = gridConvergence(members, (n) => cellSize(study.baseCase, n)).filter((c) => ['overallHoldup', 'levelSwellM', 'aeratedHeightM', 'kLaPerS', 'centrelineLiquidVelocityMS'].includes(c.id));
		return { list, uncertainty: { studyId: s.id, name: s.name, rows } };
	}
	return { list, uncertainty: null };
}

async function loadCase(event: RequestEvent, teamId: string) {
	const row = await cases.getCase({ teamId, id: event.params.id });
	if (!row) error(404, 'Case not found.');
	return row;
}

export const load: PageServerLoad = async (event) => {
	const member = await requireMember(event, 'viewer');
	const row = await loadCase(event, member.team.id);
	const [column] = await db.select({ id: columns.id, tag: columns.tag }).from(columns).where(eq(columns.id, row.columnId));
	// a stored case written by an older schema still opens: defaults fill what it lacks
	const parsed = validateCase(row.document);
	const form = await superValidate(parsed.ok ? parsed.value : row.document, zod4(caseSchema), { errors: false });
	const caseRuns = await db
		.select({ id: runsTable.id, status: runsTable.status, queuedAt: runsTable.queuedAt, steps: runsTable.steps, simulatedTimeS: runsTable.simulatedTimeS })
		.from(runsTable)
		.where(and(eq(runsTable.teamId, member.team.id), eq(runsTable.caseId, row.id)))
		.orderBy(desc(runsTable.queuedAt));
	return {
		form,
		caseRow: { id: row.id, name: row.name, kind: row.kind, updatedAt: row.updatedAt },
		column,
		runs: caseRuns,
		canEdit: hasRole(member.role, 'analyst'),
		canSignOff: hasRole(member.role, 'lead'),
		signOffs: await signoffs.listSignOffs({ teamId: member.team.id, subjectType: 'case', subjectId: row.id }),
		comments: await signoffs.listComments({ teamId: member.team.id, subjectType: 'case', subjectId: row.id }),
		studies: await caseStudies(member.team.id, row.id),
		queueError: event.url.searchParams.get('queueError'),
		saved: event.url.searchParams.has('saved')
	};
};

export const actions: Actions = {
	save: async (event) => {
		const member = await requireMember(event, 'analyst');
		const row = await loadCase(event, member.team.id);
		const form = await superValidate(event.request, zod4(caseSchema));
		if (!form.valid) return fail(400, { form });
		await cases.updateCase({ teamId: member.team.id, id: row.id, document: form.data });
		return message(form, 'Saved.');
	},
	queue: async (event) => {
		const member = await requireMember(event, 'analyst');
		const row = await loadCase(event, member.team.id);
		const form = await superValidate(event.request, zod4(caseSchema));
		if (!form.valid) return fail(400, { form });
		await cases.updateCase({ teamId: member.team.id, id: row.id, document: form.data });
		let runId: string;
		try {
			runId = (await runs.queue({ teamId: member.team.id, caseId: row.id, userId: member.user.id })).id;
		} catch (e) {
			if (e instanceof runs.RunRequestError) return message(form, e.message, { status: e.status === 404 ? 400 : e.status });
			throw e;
		}
		redirect(303, `/runs/${runId}`);
	},
	clone: async (event) => {
		const member = await requireMember(event, 'analyst');
		const copy = await cases.cloneCase({ teamId: member.team.id, id: event.params.id, userId: member.user.id });
		if (!copy) error(404, 'Case not found.');
		redirect(303, `/cases/${copy.id}`);
	},
	...verdictActions({ subjectType: 'case', path: '/cases', load: loadCase })
};
