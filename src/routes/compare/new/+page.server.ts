import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { requireMember, requireTeamRow } from '$lib/server/guard';
import { columns } from '$lib/server/db/schema';
import * as comparisons from '$lib/server/comparisons';

/** Leads pick 2–6 finished runs of one column and a baseline. */
export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'lead');
	const column = await requireTeamRow({ table: columns, id: event.url.searchParams.get('column') ?? '', teamId: team.id, what: 'Column' });
	const runs = await comparisons.listComparableRuns({ teamId: team.id, columnId: column.id });
	return {
		column: { id: column.id, tag: column.tag },
		runs: runs.map((r) => ({
			id: r.id,
			caseId: r.caseId,
			caseName: r.caseDocument.name,
			kind: r.caseDocument.kind,
			drag: r.caseDocument.closures.drag,
			cells: r.caseDocument.numerics.cells,
			superficialGasVelocityMS: r.caseDocument.sparging.superficialGasVelocityMS,
			status: r.status,
			queuedAt: r.queuedAt
		})),
		limits: { min: comparisons.MIN_RUNS, max: comparisons.MAX_RUNS },
		// `?runs=<id>,<id>` (a study's members) arrive ticked, as far as they are comparable runs of this column
		preselected: (event.url.searchParams.get('runs') ?? '')
			.split(',')
			.filter((id) => runs.some((r) => r.id === id))
			.slice(0, comparisons.MAX_RUNS),
		measurements: await comparisons.listOverlayMeasurements({ teamId: team.id, columnId: column.id })
	};
};

export const actions: Actions = {
	default: async (event) => {
		const member = await requireMember(event, 'lead');
		const column = await requireTeamRow({ table: columns, id: event.url.searchParams.get('column') ?? '', teamId: member.team.id, what: 'Column' });
		const fd = await event.request.formData();
		const values = {
			name: String(fd.get('name') ?? ''),
			runIds: fd.getAll('runIds').map(String),
			baselineRunId: String(fd.get('baselineRunId') ?? ''),
			measurementId: String(fd.get('measurementId') ?? '')
		};
		const parsed = comparisons.comparisonForm.safeParse(values);
		if (!parsed.success) {
			const errors: Record<string, string> = {};
			for (const i of parsed.error.issues) errors[String(i.path[0] ?? 'form')] ??= i.message;
			return fail(400, { values, errors });
		}
		let id: string;
		try {
			id = (await comparisons.createComparison({ teamId: member.team.id, columnId: column.id, userId: member.user.id, input: parsed.data })).id;
		} catch (e) {
			if (e instanceof comparisons.ComparisonError) return fail(400, { values, errors: { runIds: e.message } as Record<string, string> });
			throw e;
		}
		redirect(303, `/compare/${id}`);
	}
};
