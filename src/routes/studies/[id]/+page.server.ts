import { error, fail } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import type { Actions, PageServerLoad, RequestEvent } from './$types';
import { requireMember } from '$lib/server/guard';
import { hasRole } from '$lib/server/roles';
import { db } from '$lib/server/db/app';
import { cases, columns, measurements } from '$lib/server/db/schema';
import * as studyServer from '$lib/server/studies';
import * as signoffs from '$lib/server/signoffs';
import { verdictActions } from '$lib/server/verdict-actions';
import { rankRunsAgainstMeasurement } from '$lib/server/measurements';
import { isUuid } from '$lib/server/guard';
import { DONE_STATUSES } from '$lib/studies/results';

async function loadStudy(event: RequestEvent, teamId: string) {
	const s = await studyServer.getStudy({ db, teamId, studyId: event.params.id ?? '' });
	if (!s) error(404, 'Study not found.');
	return s;
}

/** Profiles sent for the matrix band: the fields a lead compares, not every stored field. */
const BAND_FIELDS = ['holdup', 'liquidVelocity', 'gasVelocity', 'pressure', 'holdupSmall', 'holdupLarge'];

export const load: PageServerLoad = async (event) => {
	const member = await requireMember(event, 'viewer');
	const study = await loadStudy(event, member.team.id);
	const [column] = await db.select({ id: columns.id, tag: columns.tag }).from(columns).where(eq(columns.id, study.columnId));
	const [baseCase] = study.caseId ? await db.select({ id: cases.id, name: cases.name }).from(cases).where(eq(cases.id, study.caseId)) : [];
	const members = await studyServer.listMembers({ db, teamId: member.team.id, studyId: study.id });
	const done = members.filter((m) => (DONE_STATUSES as readonly string[]).includes(m.status));

	// closure matrix: the members' final profiles (for the band) and the ranking against a measurement
	let profiles: Array<{ index: number; x: number[]; fields: Record<string, number[]> }> = [];
	if (study.kind !== 'sweep' && done.length) {
		const snaps = await studyServer.finalProfiles({ db, runIds: done.map((m) => m.id) });
		profiles = done.flatMap((m) => {
			const s = snaps.get(m.id);
			if (!s) return [];
			const fields: Record<string, number[]> = {};
			for (const f of BAND_FIELDS) if (s.fields[f]) fields[f] = Array.from(s.fields[f]);
			return [{ index: m.index, x: Array.from(s.x), fields }];
		});
	}
	const asked = event.url.searchParams.get('measurement');
	const measurementId = asked && isUuid(asked) ? asked : study.measurementId;
	const ranking =
		study.kind === 'closure-matrix' && measurementId && done.length
			? await rankRunsAgainstMeasurement({ teamId: member.team.id, columnId: study.columnId, runIds: done.map((m) => m.id), measurementId })
			: null;
	const labelOf = new Map(members.map((m) => [m.id, m.point.label]));
	const columnMeasurements = await db
		.select({
			id: measurements.id,
			name: measurements.name,
			kind: measurements.kind,
			superficialGasVelocityMS: measurements.superficialGasVelocityMS,
			temperatureK: measurements.temperatureK,
			pressurePa: measurements.pressurePa,
			data: measurements.data
		})
		.from(measurements)
		.where(and(eq(measurements.teamId, member.team.id), eq(measurements.columnId, study.columnId)));

	return {
		study: {
			id: study.id,
			name: study.name,
			kind: study.kind,
			spec: study.spec,
			memberCount: study.memberCount,
			createdAt: study.createdAt,
			cancelledAt: study.cancelledAt
		},
		baseCase: study.baseCase,
		baseCaseRow: baseCase ?? null,
		column,
		members,
		profiles,
		measurements: columnMeasurements.filter((m) => m.kind !== 'dissolved-oxygen'),
		chosenMeasurementId: measurementId ?? null,
		ranking: ranking
			? {
					measurement: { id: ranking.measurement.id, kind: ranking.measurement.kind, name: ranking.measurement.name },
					ranked: ranking.ranked.map((r) => ({ ...r, caseName: labelOf.get(r.runId) ?? r.caseName }))
				}
			: null,
		canAct: hasRole(member.role, 'analyst'),
		canSignOff: hasRole(member.role, 'lead'),
		signOffs: await signoffs.listSignOffs({ teamId: member.team.id, subjectType: 'study', subjectId: study.id }),
		comments: await signoffs.listComments({ teamId: member.team.id, subjectType: 'study', subjectId: study.id })
	};
};

export const actions: Actions = {
	cancel: async (event) => {
		const member = await requireMember(event, 'analyst');
		const study = await loadStudy(event, member.team.id);
		const r = await studyServer.cancel({ teamId: member.team.id, studyId: study.id });
		return { cancelled: r };
	},
	rerunFailed: async (event) => {
		const member = await requireMember(event, 'analyst');
		const study = await loadStudy(event, member.team.id);
		try {
			const queued = await studyServer.rerunFailed({ teamId: member.team.id, studyId: study.id, userId: member.user.id });
			return { rerun: queued.length };
		} catch (e) {
			if (e instanceof studyServer.StudyRequestError) return fail(e.status, { actionError: e.message });
			throw e;
		}
	},
	...verdictActions({ subjectType: 'study', path: '/studies', load: loadStudy })
};
