/**
 * Fixed-pivot class method for bubble coalescence and breakage, after Kumar & Ramkrishna (1996),
 * Chem. Eng. Sci. 51, 1311–1332 (section 3, the fixed pivot technique).
 *
 * State: N_i, the number of bubbles per unit mixture volume (1/m³) represented by pivot x_i.
 * Gas volume per unit volume (the holdup of the bubbles) is Σ x_i N_i.
 *
 * Coalescence (binary, kernel β_jk in m³/s): each pair (j ≥ k) meets at the rate
 * (1 − δ_jk/2) β_jk N_j N_k and makes one bubble of volume v = x_j + x_k, which is lumped onto the
 * pivots around v by the number- and volume-preserving weights of `lumpVolume`:
 *   dN_i/dt|c = Σ_{j≥k} (1 − δ_jk/2) η_i(x_j + x_k) β_jk N_j N_k − N_i Σ_k β_ik N_k.
 * Every event removes x_j + x_k and adds η_lo x_i + η_hi x_{i+1} = x_j + x_k, so gas volume is
 * conserved to round-off, and number too while v stays below the last pivot (above it the merged
 * bubble counts as v/x_{n−1} bubbles of the last class: volume kept, number not).
 *
 * Breakage (binary): a bubble of class k breaks into f x_k and (1 − f) x_k, 0 < f ≤ 1/2, at the
 * rate density ω_k(f) (1/s per unit f). Its frequency is S_k = ∫_0^½ ω_k df and
 *   dN_i/dt|b = Σ_{k≥i} n_{i,k} S_k N_k − S_i N_i,
 * n_{i,k} = (1/S_k) ∫_0^½ [η_i(f x_k) + η_i((1 − f) x_k)] ω_k(f) df, the number of class-i daughters
 * per breakage (Kumar & Ramkrishna's breakage coefficients written in the fraction f). The integral is taken by
 * Gauss–Legendre between the kinks of the hat weights (f = x_i/x_k and 1 − x_i/x_k), with f = f₁s² on
 * the first piece [0, f₁] so a rate density like f^(−1/2) at f → 0 stays integrable; S_k uses the same
 * nodes. Each node adds two daughters whose volumes sum to x_k exactly, so breakage conserves volume
 * to round-off and number too, except for daughters smaller than the first pivot (counted as
 * v/x_0 bubbles of the first class). The first class does not break (its daughters are not resolved).
 *
 * `createPopulationBalance(grid)` precomputes the coalescence redistribution once; `tabulate(kernels)`
 * evaluates the kernels on the grid (and the breakage redistribution, which depends on ω) once per
 * flow state; `rates(N, out, table)` allocates nothing.
 */
import { gaussLegendreUnit, lumpVolume, type Lumping, type PivotGrid } from './grid.js';

/** Coalescence kernel β(d_i, d_j), m³/s (volumes given too, for kernels written in volume). */
export type CoalescenceKernel = (diameterIM: number, diameterJM: number, volumeIM3: number, volumeJM3: number) => number;

/**
 * Binary breakage rate density ω(f) of one bubble of diameter d (volume v), 1/s per unit daughter
 * volume fraction f, for the smaller daughter 0 < f ≤ 1/2; the frequency is ∫_0^½ ω df.
 */
export type BreakageKernel = (diameterM: number, volumeM3: number, fraction: number) => number;

export interface Kernels {
	coalescence?: CoalescenceKernel;
	breakage?: BreakageKernel;
	/** Gauss–Legendre nodes per piece of the breakage integral (default 8) */
	quadratureNodes?: number;
}

/** The kernels evaluated on a grid; reusable across `rates` calls while the flow state holds. */
export interface KernelTable {
	/** β_jk, m³/s, pair p = j(j + 1)/2 + k for k ≤ j */
	coalescence: Float64Array;
	/** S_k, 1/s */
	breakageRate: Float64Array;
	/** n_{i,k}: class-i daughters per breakage of a class-k bubble, at [k·n + i], i ≤ k */
	daughters: Float64Array;
	hasCoalescence: boolean;
	hasBreakage: boolean;
}

export interface PopulationBalance {
	grid: PivotGrid;
	/** number of pairs n(n + 1)/2 */
	pairs: number;
	/** lower receiving pivot of pair p; the merged bubble goes to pairTarget and pairTarget + 1 */
	pairTarget: Int32Array;
	pairLow: Float64Array;
	pairHigh: Float64Array;
	/** kernels on this grid; pass `into` to refill a table without allocating */
	tabulate(kernels: Kernels, into?: KernelTable): KernelTable;
	/** dN_i/dt into `out` (overwritten), 1/(m³ s); no allocation */
	rates(N: Float64Array, out: Float64Array, table: KernelTable): void;
}

/** Pair index of (j, k), k ≤ j. */
export function pairIndex(j: number, k: number): number {
	return j >= k ? (j * (j + 1)) / 2 + k : (k * (k + 1)) / 2 + j;
}

/** An empty kernel table for a grid of n classes. */
export function emptyKernelTable(classes: number): KernelTable {
	return {
		coalescence: new Float64Array((classes * (classes + 1)) / 2),
		breakageRate: new Float64Array(classes),
		daughters: new Float64Array(classes * classes),
		hasCoalescence: false,
		hasBreakage: false
	};
}

export function createPopulationBalance(grid: PivotGrid): PopulationBalance {
	const n = grid.classes;
	const x = grid.volumesM3;
	const d = grid.diametersM;
	const pairs = (n * (n + 1)) / 2;
	const pairTarget = new Int32Array(pairs);
	const pairLow = new Float64Array(pairs);
	const pairHigh = new Float64Array(pairs);
	const lump: Lumping = { index: 0, low: 0, high: 0 };
	for (let j = 0; j < n; j++) {
		for (let k = 0; k <= j; k++) {
			const p = (j * (j + 1)) / 2 + k;
			lumpVolume(grid, x[j] + x[k], lump);
			pairTarget[p] = lump.index;
			pairLow[p] = lump.low;
			pairHigh[p] = lump.high;
		}
	}

	function tabulate(kernels: Kernels, into?: KernelTable): KernelTable {
		const t = into ?? emptyKernelTable(n);
		t.coalescence.fill(0);
		t.breakageRate.fill(0);
		t.daughters.fill(0);
		t.hasCoalescence = false;
		t.hasBreakage = false;
		const beta = kernels.coalescence;
		if (beta) {
			for (let j = 0; j < n; j++) {
				for (let k = 0; k <= j; k++) {
					const b = beta(d[j], d[k], x[j], x[k]);
					if (!(b >= 0 && Number.isFinite(b))) throw new Error(`Coalescence kernel gave ${b} for classes ${j}, ${k}`);
					t.coalescence[(j * (j + 1)) / 2 + k] = b;
					if (b > 0) t.hasCoalescence = true;
				}
			}
		}
		const omega = kernels.breakage;
		if (omega) tabulateBreakage(omega, kernels.quadratureNodes ?? 8, t);
		return t;
	}

	function tabulateBreakage(omega: BreakageKernel, m: number, t: KernelTable): void {
		const { nodes, weights } = gaussLegendreUnit(m);
		const cuts: number[] = [];
		for (let k = 1; k < n; k++) {
			const xk = x[k];
			cuts.length = 0;
			cuts.push(0, 0.5);
			for (let i = 0; i < k; i++) {
				const a = x[i] / xk;
				if (a < 0.5) cuts.push(a);
				else if (a > 0.5) cuts.push(1 - a);
			}
			cuts.sort((p, q) => p - q);
			const row = k * n;
			let s = 0;
			for (let c = 0; c + 1 < cuts.length; c++) {
				const f0 = cuts[c];
				const f1 = cuts[c + 1];
				if (!(f1 > f0)) continue;
				for (let q = 0; q < m; q++) {
					let f: number;
					let w: number;
					if (f0 === 0) {
						// f = f1 s², df = 2 f1 s ds
						const u = nodes[q];
						f = f1 * u * u;
						w = weights[q] * 2 * f1 * u;
					} else {
						f = f0 + (f1 - f0) * nodes[q];
						w = weights[q] * (f1 - f0);
					}
					const rate = omega(d[k], xk, f);
					if (!(rate >= 0 && Number.isFinite(rate))) throw new Error(`Breakage kernel gave ${rate} for class ${k}, fraction ${f}`);
					const W = w * rate;
					if (W === 0) continue;
					s += W;
					const small = f * xk;
					lumpVolume(grid, small, lump);
					t.daughters[row + lump.index] += W * lump.low;
					t.daughters[row + lump.index + 1] += W * lump.high;
					lumpVolume(grid, xk - small, lump);
					t.daughters[row + lump.index] += W * lump.low;
					t.daughters[row + lump.index + 1] += W * lump.high;
				}
			}
			if (s > 0) {
				for (let i = 0; i <= k; i++) t.daughters[row + i] /= s;
				t.breakageRate[k] = s;
				t.hasBreakage = true;
			}
		}
	}

	function rates(N: Float64Array, out: Float64Array, t: KernelTable): void {
		out.fill(0, 0, n);
		if (t.hasCoalescence) {
			const beta = t.coalescence;
			let p = 0;
			for (let j = 0; j < n; j++) {
				const nj = N[j];
				if (nj === 0) {
					p += j + 1;
					continue;
				}
				for (let k = 0; k < j; k++, p++) {
					const r = beta[p] * nj * N[k];
					if (r === 0) continue;
					const i = pairTarget[p];
					out[i] += pairLow[p] * r;
					out[i + 1] += pairHigh[p] * r;
					out[j] -= r;
					out[k] -= r;
				}
				// k = j: ½ β_jj N_j² events, each taking two class-j bubbles
				const r = 0.5 * beta[p] * nj * nj;
				const i = pairTarget[p];
				out[i] += pairLow[p] * r;
				out[i + 1] += pairHigh[p] * r;
				out[j] -= 2 * r;
				p++;
			}
		}
		if (t.hasBreakage) {
			const S = t.breakageRate;
			const nik = t.daughters;
			for (let k = 1; k < n; k++) {
				const r = S[k] * N[k];
				if (r === 0) continue;
				out[k] -= r;
				const row = k * n;
				for (let i = 0; i <= k; i++) out[i] += nik[row + i] * r;
			}
		}
	}

	return { grid, pairs, pairTarget, pairLow, pairHigh, tabulate, rates };
}
