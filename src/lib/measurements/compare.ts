/**
 * Holding a run against a measurement: the run's profile interpolated at the measured positions,
 * the error measures, and the rule for which measurements a run is held against.
 * SI throughout; profiles and measurements share the x of the measurement kind (height in m,
 * r/R, or time in s).
 */
import type { MeasurementKind, OperatingPoint } from './kinds.js';

export interface Series {
	x: ArrayLike<number>;
	y: ArrayLike<number>;
}

/**
 * Piecewise-linear interpolation of (x, y) at `at`. `x` must be strictly increasing. Outside
 * [x₀, x_last] the end value is held: a finite-volume profile is given at cell centres, so a tap
 * at the sparger or the wall lies half a cell outside it, and the end cell's value is the best
 * the run says about it.
 *
 * Example: interpolateLinear({ x: [0, 1], y: [0, 10], at: 0.25 }) → 2.5
 */
export function interpolateLinear(opts: { x: ArrayLike<number>; y: ArrayLike<number>; at: number }): number {
	const { x, y, at } = opts;
	const n = x.length;
	if (n === 0 || y.length !== n) throw new Error('interpolateLinear needs x and y of the same, non-zero length');
	if (at <= x[0]) return y[0];
	if (at >= x[n - 1]) return y[n - 1];
	// bisection: profiles reach thousands of cells and measurements hundreds of points
	let lo = 0;
	let hi = n - 1;
	while (hi - lo > 1) {
		const mid = (lo + hi) >> 1;
		if (x[mid] <= at) lo = mid;
		else hi = mid;
	}
	const w = (at - x[lo]) / (x[hi] - x[lo]);
	return y[lo] + w * (y[hi] - y[lo]);
}

export interface ErrorMeasures {
	/** number of measured points compared */
	count: number;
	/** mean of (run − measured): positive when the run over-predicts */
	meanBias: number;
	/** root-mean-square of (run − measured) */
	rmse: number;
	/** the largest |run − measured|, with its sign kept, and where it occurs */
	largestDeviation: number;
	largestDeviationAt: number;
	/** the run interpolated at each measured x */
	predicted: number[];
	/** run − measured at each measured x */
	deviations: number[];
	/** measured points outside the run's x range, where the end value was held */
	heldAtEnd: number;
}

/**
 * Error measures of a run profile against a measurement, in the measurement's SI unit:
 * bias = (1/n) Σ (p_i − m_i), RMSE = √((1/n) Σ (p_i − m_i)²), largest = p_k − m_k with
 * k = argmax |p_i − m_i|, where p_i is the profile interpolated linearly at the measured x_i.
 *
 * Example: profile x [0, 1, 2], y [0, 0.1, 0.3]; measured x [0.5, 1.5], y [0.06, 0.18]
 * → bias 0.005, RMSE 0.015811, largest 0.02 at x = 1.5.
 */
export function errorMeasures(opts: { profile: Series; measurement: Series }): ErrorMeasures {
	const { profile, measurement } = opts;
	const n = measurement.x.length;
	if (n === 0) throw new Error('errorMeasures needs at least one measured point');
	const px = profile.x;
	const predicted: number[] = [];
	const deviations: number[] = [];
	let sum = 0;
	let sumSq = 0;
	let largest = 0;
	let largestAt = measurement.x[0];
	let heldAtEnd = 0;
	for (let i = 0; i < n; i++) {
		const at = measurement.x[i];
		if (at < px[0] || at > px[px.length - 1]) heldAtEnd++;
		const p = interpolateLinear({ x: px, y: profile.y, at });
		const d = p - measurement.y[i];
		predicted.push(p);
		deviations.push(d);
		sum += d;
		sumSq += d * d;
		if (Math.abs(d) > Math.abs(largest) || i === 0) {
			largest = d;
			largestAt = at;
		}
	}
	return { count: n, meanBias: sum / n, rmse: Math.sqrt(sumSq / n), largestDeviation: largest, largestDeviationAt: largestAt, predicted, deviations, heldAtEnd };
}

/**
 * How close an operating point must be for a run to be held against a measurement. Relative
 * tolerances are fractions of the measurement's value.
 */
export interface MatchTolerances {
	superficialGasVelocityRel: number;
	temperatureK: number;
	pressureRel: number;
}

/**
 * The default rule: superficial gas velocity within ±10 % and top pressure within ±10 % of the
 * measurement's, temperature within ±5 K. Holdup grows roughly like U_G^0.7–1 in the homogeneous
 * regime, so ±10 % in U_G moves it by about ±10 % — the scatter of pilot holdup data; 5 K and 10 %
 * in pressure change the liquid properties and the gas density far less than that.
 */
export const defaultMatchTolerances: MatchTolerances = { superficialGasVelocityRel: 0.1, temperatureK: 5, pressureRel: 0.1 };

export interface MatchResult {
	matches: boolean;
	/** why not, one line per quantity out of tolerance */
	reasons: string[];
}

export function operatingPointMatches(opts: { run: OperatingPoint; measurement: OperatingPoint; tolerances?: MatchTolerances }): MatchResult {
	const tol = opts.tolerances ?? defaultMatchTolerances;
	const { run, measurement: m } = opts;
	const reasons: string[] = [];
	const pct = (v: number) => `${Math.round(v * 1000) / 10} %`;
	// a small absolute floor keeps a measurement at zero gas flow matchable by a run at zero
	const dU = Math.abs(run.superficialGasVelocityMS - m.superficialGasVelocityMS);
	if (dU > tol.superficialGasVelocityRel * Math.abs(m.superficialGasVelocityMS) + 1e-9) {
		reasons.push(`superficial gas velocity ${run.superficialGasVelocityMS} m/s is not within ±${pct(tol.superficialGasVelocityRel)} of ${m.superficialGasVelocityMS} m/s`);
	}
	if (Math.abs(run.temperatureK - m.temperatureK) > tol.temperatureK + 1e-9) {
		reasons.push(`temperature ${run.temperatureK} K is not within ±${tol.temperatureK} K of ${m.temperatureK} K`);
	}
	if (Math.abs(run.pressurePa - m.pressurePa) > tol.pressureRel * Math.abs(m.pressurePa) + 1e-9) {
		reasons.push(`pressure ${run.pressurePa} Pa is not within ±${pct(tol.pressureRel)} of ${m.pressurePa} Pa`);
	}
	return { matches: reasons.length === 0, reasons };
}

/** The operating point of a case document (superficial gas velocity, temperature, top pressure). */
export function operatingPointOfCase(caseDoc: {
	sparging: { superficialGasVelocityMS: number };
	fluids: { temperatureK: number; topPressurePa: number };
}): OperatingPoint {
	return {
		superficialGasVelocityMS: caseDoc.sparging.superficialGasVelocityMS,
		temperatureK: caseDoc.fluids.temperatureK,
		pressurePa: caseDoc.fluids.topPressurePa
	};
}

/**
 * Runs ranked by RMSE against one measurement, best first; runs without a profile are listed
 * last with `measures: null`. Ties keep the given order.
 */
export function rankByRmse<T extends { profile: Series | null }>(opts: { runs: T[]; measurement: Series }): Array<T & { measures: ErrorMeasures | null }> {
	const scored = opts.runs.map((r, i) => ({ ...r, measures: r.profile && r.profile.x.length > 0 ? errorMeasures({ profile: r.profile, measurement: opts.measurement }) : null, i }));
	scored.sort((a, b) => {
		const ra = a.measures ? a.measures.rmse : Infinity;
		const rb = b.measures ? b.measures.rmse : Infinity;
		return ra === rb ? a.i - b.i : ra - rb;
	});
	return scored.map(({ i: _i, ...rest }) => rest as unknown as T & { measures: ErrorMeasures | null });
}

/** Which run field and which case kind a measurement kind is compared with. */
export const profileFieldOfKind = {
	'holdup-height': { caseKind: 'height-profile', field: 'holdup' },
	'pressure-height': { caseKind: 'height-profile', field: 'pressure' },
	'holdup-radial': { caseKind: 'cross-section', field: 'holdup' },
	'liquid-velocity-radial': { caseKind: 'cross-section', field: 'liquidVelocity' },
	'dissolved-oxygen': null
} as const satisfies Record<MeasurementKind, { caseKind: 'height-profile' | 'cross-section'; field: string } | null>;

/**
 * The run profile a measurement is held against, on the measurement's x: height above the sparger
 * (m) for the height kinds, r/R (the snapshot's radius divided by D/2) for the radial kinds. Null
 * when the kinds do not go together (a radial measurement and a height-profile run, a
 * dissolved-oxygen series) or the snapshot lacks the field.
 */
export function profileForMeasurement(opts: {
	kind: MeasurementKind;
	caseDoc: { kind: string; geometry: { diameterM: number } };
	snapshot: { x: ArrayLike<number>; fields: Record<string, ArrayLike<number>> };
}): Series | null {
	const m = profileFieldOfKind[opts.kind];
	if (!m || opts.caseDoc.kind !== m.caseKind) return null;
	const y = opts.snapshot.fields[m.field];
	if (!y || y.length !== opts.snapshot.x.length || y.length === 0) return null;
	if (m.caseKind === 'cross-section') {
		const radiusM = opts.caseDoc.geometry.diameterM / 2;
		return { x: Array.from(opts.snapshot.x, (r) => r / radiusM), y };
	}
	return { x: opts.snapshot.x, y };
}
