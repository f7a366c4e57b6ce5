/**
 * Time histories of a run from its stored snapshots, for the run page after the run ends.
 * Height profile: the mean holdup of the aerated zone (cells below the free surface, α < 0.5 —
 * above it the freeboard is gas-filled and would swamp the average) and the pressure in the
 * sparger cell. Cross-section: the area-weighted mean holdup (weights r·dr) and the centreline
 * liquid velocity.
 */
import type { Snapshot } from '../../../solver/types.js';

export interface TimeHistory {
	id: string;
	label: string;
	/** short name for the axis */
	short: string;
	unit: string;
	timeS: number[];
	values: number[];
}

export function timeHistories(options: { kind: string; snapshots: Snapshot[] }): TimeHistory[] {
	const { kind, snapshots } = options;
	if (snapshots.length === 0) return [];
	const t = snapshots.map((s) => s.timeS);
	if (kind === 'cross-section') {
		return [
			{ id: 'meanHoldup', label: 'section-mean gas holdup', short: 'holdup', unit: '1', timeS: t, values: snapshots.map((s) => areaMean(s.x, s.fields.holdup)) },
			{ id: 'centrelineLiquidVelocity', label: 'centreline liquid velocity', short: 'velocity', unit: 'm/s', timeS: t, values: snapshots.map((s) => s.fields.liquidVelocity?.[0] ?? Number.NaN) }
		];
	}
	return [
		{ id: 'aeratedHoldup', label: 'mean holdup below the free surface (α < 0.5)', short: 'holdup', unit: '1', timeS: t, values: snapshots.map((s) => aeratedMean(s.fields.holdup)) },
		{ id: 'spargerPressure', label: 'pressure at the sparger cell', short: 'pressure', unit: 'Pa', timeS: t, values: snapshots.map((s) => s.fields.pressure?.[0] ?? Number.NaN) }
	];
}

/** Mean of the holdup over the cells below the free surface (α < 0.5). */
export function aeratedMean(holdup: ArrayLike<number> | undefined): number {
	if (!holdup) return Number.NaN;
	let sum = 0;
	let n = 0;
	for (let i = 0; i < holdup.length; i++) {
		if (holdup[i] < 0.5) {
			sum += holdup[i];
			n++;
		}
	}
	return n ? sum / n : Number.NaN;
}

/** Area-weighted mean over a circular section from cell-centre values at radii `r` (weights r). */
export function areaMean(r: ArrayLike<number>, values: ArrayLike<number> | undefined): number {
	if (!values) return Number.NaN;
	let num = 0;
	let den = 0;
	for (let i = 0; i < r.length; i++) {
		num += values[i] * r[i];
		den += r[i];
	}
	return den ? num / den : Number.NaN;
}
