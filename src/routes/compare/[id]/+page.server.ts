import { error, fail } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import type { Actions, PageServerLoad, RequestEvent } from './$types';
import { requireMember } from '$lib/server/guard';
import { hasRole } from '$lib/server/roles';
import { db } from '$lib/server/db/app';
import { columns, measurements } from '$lib/server/db/schema';
import * as comparisons from '$lib/server/comparisons';
import * as signoffs from '$lib/server/signoffs';
import { verdictActions } from '$lib/server/verdict-actions';
import { isUuid } from '$lib/server/guard';
import { listMeasurementsForColumn, rankRunsAgainstMeasurement, setComparisonMeasurement } from '$lib/server/measurements';

async function loadComparison(event: RequestEvent, teamId: string) {
	const c = await comparisons.getComparison({ teamId, id: event.params.id });
	if (!c) error(404, 'Comparison not found.');
	return c;
}

export const load: PageServerLoad = async (event) => {
	const member = await requireMember(event, 'viewer');
	const c = await loadComparison(event, member.team.id);
	const [column] = await db.select({ id: columns.id, tag: columns.tag }).from(columns).where(eq(columns.id, c.columnId));
	const runs = await comparisons.loadComparedRuns({ teamId: member.team.id, runIds: c.runIds });
	// the measurement to rank against: `?measurement=<id>`, else the one saved with the comparison
	const asked = event.url.searchParams.get('measurement');
	const chosenId = asked && isUuid(asked) ? asked : c.measurementId;
	const [measurement] = chosenId
		? await db
				.select({ id: measurements.id, name: measurements.name, kind: measurements.kind, data: measurements.data })
				.from(measurements)
				.where(and(eq(measurements.id, chosenId), eq(measurements.teamId, member.team.id), eq(measurements.columnId, c.columnId)))
		: [];
	const measurementChoices = await listMeasurementsForColumn({ teamId: member.team.id, columnId: c.columnId });
	const ranking = measurement ? await rankRunsAgainstMeasurement({ teamId: member.team.id, columnId: c.columnId, runIds: c.runIds, measurementId: measurement.id }) : null;
	return {
		comparison: { id: c.id, name: c.name, baselineRunId: c.baselineRunId, createdAt: c.createdAt },
		column,
		runs,
		measurement: measurement ?? null,
		// a dissolved-oxygen series is a time series, not a profile: nothing to rank runs against
		measurementChoices: measurementChoices.filter((m) => m.kind !== 'dissolved-oxygen').map((m) => ({ id: m.id, name: m.name, kind: m.kind })),
		ranking: ranking ? { measurement: { id: ranking.measurement.id, kind: ranking.measurement.kind, name: ranking.measurement.name }, ranked: ranking.ranked } : null,
		canSignOff: hasRole(member.role, 'lead'),
		savedMeasurementId: c.measurementId,
		signOffs: await signoffs.listSignOffs({ teamId: member.team.id, subjectType: 'comparison', subjectId: c.id }),
		comments: await signoffs.listComments({ teamId: member.team.id, subjectType: 'comparison', subjectId: c.id })
	};
};

export const actions: Actions = {
	/** keep the measurement the runs are ranked against with the comparison (report and page default) */
	measurement: async (event) => {
		const member = await requireMember(event, 'lead');
		const c = await loadComparison(event, member.team.id);
		const id = String((await event.request.formData()).get('measurementId') ?? '');
		if (!isUuid(id)) return fail(400, { measurementError: 'Choose a measurement first.' });
		const [m] = await db.select({ id: measurements.id }).from(measurements).where(and(eq(measurements.id, id), eq(measurements.teamId, member.team.id), eq(measurements.columnId, c.columnId)));
		if (!m) error(404, 'Measurement not found.');
		await setComparisonMeasurement({ teamId: member.team.id, comparisonId: c.id, measurementId: m.id });
		return { measurementSaved: true };
	},
	...verdictActions({ subjectType: 'comparison', path: '/compare', load: loadComparison })
};
