/**
 * Helpers for overlaying measurements on run and comparison charts: which measurement goes with
 * which run field, as marker points in the chart's units.
 */
import { profileFieldOfKind } from './compare.js';
import { kindSpecs, type MeasurementKind } from './kinds.js';

export interface OverlayItem {
	measurement: { id: string; kind: MeasurementKind; name: string; data: { x: number[]; y: number[] } };
}

/**
 * Marker points for a chart of run field `field` (e.g. `holdup`, `pressure`, `liquidVelocity`) of a
 * case of kind `caseKind`: the first matching measurement of the kind that compares with that
 * field, its y multiplied by `scale` (e.g. 1e-3 for a chart in kPa). Null if none.
 */
export function overlayPoints(opts: {
	items: OverlayItem[];
	caseKind: string;
	field: string;
	scale?: number;
	/** multiplies x: the column radius (m) puts a radial measurement's r/R on a chart in metres */
	xScale?: number;
}): { label: string; x: number[]; y: number[] } | null {
	const scale = opts.scale ?? 1;
	const xScale = opts.xScale ?? 1;
	for (const it of opts.items) {
		const pair = profileFieldOfKind[it.measurement.kind];
		if (pair && pair.caseKind === opts.caseKind && pair.field === opts.field) {
			return { label: it.measurement.name, x: it.measurement.data.x.map((v) => v * xScale), y: it.measurement.data.y.map((v) => v * scale) };
		}
	}
	return null;
}

/** The unit shown for a kind's measured value in tables: kPa for pressures, SI otherwise. */
export function displayUnit(kind: MeasurementKind): { unit: string; scale: number } {
	return kind === 'pressure-height' ? { unit: 'kPa', scale: 1e-3 } : { unit: kindSpecs[kind].y.siUnit === '1' ? '–' : kindSpecs[kind].y.siUnit, scale: 1 };
}
