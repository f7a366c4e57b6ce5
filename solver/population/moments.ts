/**
 * Moments of a class-method state N_i (1/m³ on the pivots of a `PivotGrid`), the Sauter diameter,
 * and the projection of a continuous number density onto the pivots.
 */
import { gaussLegendreUnit, type PivotGrid } from './grid.js';

/** Volume moment μ_k = Σ N_i x_i^k (k = 0: number per m³, k = 1: gas volume fraction), SI. */
export function volumeMoment(grid: PivotGrid, N: Float64Array, order: number): number {
	const x = grid.volumesM3;
	let s = 0;
	for (let i = 0; i < grid.classes; i++) s += N[i] * (order === 0 ? 1 : order === 1 ? x[i] : Math.pow(x[i], order));
	return s;
}

/** Diameter moment m_k = Σ N_i d_i^k, m^k/m³. */
export function diameterMoment(grid: PivotGrid, N: Float64Array, order: number): number {
	const d = grid.diametersM;
	let s = 0;
	for (let i = 0; i < grid.classes; i++) s += N[i] * Math.pow(d[i], order);
	return s;
}

/** Bubble number per unit volume, 1/m³. */
export function totalNumber(grid: PivotGrid, N: Float64Array): number {
	return volumeMoment(grid, N, 0);
}

/** Gas volume per unit volume Σ N_i x_i (the holdup of the bubbles). */
export function gasVolumeFraction(grid: PivotGrid, N: Float64Array): number {
	return volumeMoment(grid, N, 1);
}

/** Sauter mean diameter d32 = Σ N d³ / Σ N d², m (NaN without bubbles). */
export function sauterDiameterM(grid: PivotGrid, N: Float64Array): number {
	const d = grid.diametersM;
	let m3 = 0;
	let m2 = 0;
	for (let i = 0; i < grid.classes; i++) {
		const d2 = d[i] * d[i];
		m2 += N[i] * d2;
		m3 += N[i] * d2 * d[i];
	}
	return m2 > 0 ? m3 / m2 : NaN;
}

/** Interfacial area per unit volume a = π Σ N d² = 6 α / d32, 1/m. */
export function interfacialAreaPerM(grid: PivotGrid, N: Float64Array): number {
	return Math.PI * diameterMoment(grid, N, 2);
}

/**
 * Projection of a number density n(v) (1/m⁶: bubbles per m³ per m³ of bubble volume) onto the pivots with the
 * number- and volume-preserving hat weights of Kumar & Ramkrishna (1996): N_i = ∫ η_i(v) n(v) dv. Below the
 * first pivot the weight is v/x_0, above the last v/x_{n−1} up to `upperVolumeM3` (default x_{n−1} r⁸), so the
 * gas volume of the projection equals ∫ v n dv over (0, upper). Gauss–Legendre with `nodes` points per
 * interval between pivots (default 16) and on (0, x_0) in the variable s, v = x_0 s².
 */
export function projectDensity(grid: PivotGrid, density: (volumeM3: number) => number, o: { out?: Float64Array; upperVolumeM3?: number; nodes?: number } = {}): Float64Array {
	const n = grid.classes;
	const x = grid.volumesM3;
	const out = o.out ?? new Float64Array(n);
	out.fill(0, 0, n);
	const { nodes, weights } = gaussLegendreUnit(o.nodes ?? 16);
	const m = nodes.length;
	// below the first pivot: v = x0 s², dv = 2 x0 s ds, weight v/x0
	for (let q = 0; q < m; q++) {
		const s = nodes[q];
		const v = x[0] * s * s;
		out[0] += weights[q] * 2 * x[0] * s * (v / x[0]) * density(v);
	}
	for (let i = 0; i + 1 < n; i++) {
		const a = x[i];
		const h = x[i + 1] - a;
		for (let q = 0; q < m; q++) {
			const v = a + h * nodes[q];
			const w = weights[q] * h * density(v);
			const low = (x[i + 1] - v) / h;
			out[i] += w * low;
			out[i + 1] += w * (1 - low);
		}
	}
	const upper = o.upperVolumeM3 ?? x[n - 1] * Math.pow(grid.ratio, 8);
	let a = x[n - 1];
	while (a < upper) {
		const b = Math.min(a * grid.ratio, upper);
		const h = b - a;
		for (let q = 0; q < m; q++) {
			const v = a + h * nodes[q];
			out[n - 1] += weights[q] * h * density(v) * (v / x[n - 1]);
		}
		a = b;
	}
	return out;
}
