import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { requireMember, requireTeamRow } from '$lib/server/guard';
import { columns, measurements } from '$lib/server/db/schema';
import { hasRole } from '$lib/server/roles';
import { listRunsAtOperatingPoint, runsHeldAgainstMeasurement } from '$lib/server/measurements';
import { analyseReaeration, fitReaeration, truncateReaerationSeries } from '$lib/measurements/reaeration';

/** A positive number from the query string, or null. */
function positive(v: string | null): number | null {
	if (v === null || v.trim() === '') return null;
	const n = Number(v);
	return Number.isFinite(n) && n > 0 ? n : null;
}

export const load: PageServerLoad = async (event) => {
	const { team, role } = await requireMember(event, 'viewer');
	const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
	const measurement = await requireTeamRow({ table: measurements, id: event.params.measurementId, teamId: team.id, what: 'Measurement' });
	if (measurement.columnId !== column.id) error(404, 'Measurement not found.');
	const base = { column, measurement, canEdit: hasRole(role, 'analyst') };

	if (measurement.kind !== 'dissolved-oxygen') {
		return { ...base, heldAgainst: await runsHeldAgainstMeasurement({ teamId: team.id, measurement }), reaeration: null };
	}

	const runsAt = await listRunsAtOperatingPoint({ teamId: team.id, columnId: column.id, operatingPoint: measurement });
	const q = event.url.searchParams;
	const fromRun = runsAt.find((r) => r.liquidVolumeM3 > 0)?.liquidVolumeM3 ?? null;
	const columnVolumeM3 = (Math.PI / 4) * column.diameterM ** 2 * column.heightM;
	const volumeM3 = positive(q.get('volumeM3')) ?? fromRun ?? columnVolumeM3;
	const volumeSource = positive(q.get('volumeM3')) ? 'entered' : fromRun ? 'run' : 'column';
	const barometricPressurePa = (positive(q.get('barometricKPa')) ?? measurement.pressurePa / 1000) * 1000;
	const truncate = q.get('truncate') === '1';

	let timeS = measurement.data.x;
	let concentrationKgM3 = measurement.data.y;
	let truncation: { kept: number; of: number } | null = null;
	if (truncate) {
		// ASCE 2-06 truncation needs C∞, so fit once on everything, then again on the kept points
		const first = fitReaeration({ timeS, concentrationKgM3 });
		if (first.ok) {
			const kept = truncateReaerationSeries({ timeS, concentrationKgM3, saturationKgM3: first.fit.saturationKgM3.value });
			truncation = { kept: kept.timeS.length, of: timeS.length };
			timeS = kept.timeS;
			concentrationKgM3 = kept.concentrationKgM3;
		}
	}
	const result = analyseReaeration({ timeS, concentrationKgM3, temperatureK: measurement.temperatureK, liquidVolumeM3: volumeM3, barometricPressurePa });
	return {
		...base,
		heldAgainst: [],
		reaeration: {
			result,
			fitted: { timeS, concentrationKgM3 },
			volumeM3,
			volumeSource,
			barometricPressurePa,
			truncate,
			truncation,
			runs: runsAt
		}
	};
};
