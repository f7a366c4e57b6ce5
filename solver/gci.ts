/**
 * Grid Convergence Index of a grid study (three grids), after the procedure of Celik, Ghia, Roache,
 * Freitas, Coleman & Raad (2008), J. Fluids Eng. 130, 078001 (PHYSICS §12.3), with Roache's (1994)
 * safety factor 1.25 for three grids:
 *   r21 = h2/h1, r32 = h3/h2 (1 = finest), ε21 = φ2 − φ1, ε32 = φ3 − φ2, s = sign(ε32/ε21);
 *   apparent order p = |ln|ε32/ε21| + q(p)| / ln r21, q(p) = ln[(r21^p − s)/(r32^p − s)] (fixed point);
 *   φ_ext = (r21^p φ1 − φ2)/(r21^p − 1); e_a = |(φ1 − φ2)/φ1|; e_ext = |(φ_ext − φ1)/φ_ext|;
 *   GCI_fine = 1.25 e_a/(r21^p − 1).
 * In one dimension the representative cell size is h = L/N.
 */

export interface GridConvergence {
	/** apparent order of convergence */
	order: number;
	/** Richardson-extrapolated value */
	extrapolated: number;
	/** relative difference of the two finest solutions */
	approximateRelativeError: number;
	/** relative difference of the finest solution and the extrapolated value */
	extrapolatedRelativeError: number;
	/** GCI of the finest grid, as a fraction (0.02 = 2 %) */
	gciFine: number;
	/** true when the differences change sign (oscillatory convergence; the GCI is then less reliable) */
	oscillatory: boolean;
}

/**
 * @param o.cellSizes representative cell sizes, finest first (h1 < h2 < h3)
 * @param o.values the solution quantity on those grids, in the same order
 * @example gridConvergenceIndex({ cellSizes: [1, 1.5, 2], values: [6.063, 5.972, 5.863] }) // order ≈ 1.53 for r = 1.5, 1.333
 */
export function gridConvergenceIndex(o: { cellSizes: readonly [number, number, number]; values: readonly [number, number, number] }): GridConvergence {
	const [h1, h2, h3] = o.cellSizes;
	const [f1, f2, f3] = o.values;
	if (!(h1 < h2 && h2 < h3)) throw new Error('Grid study cell sizes must grow from the first (finest) grid to the third');
	const r21 = h2 / h1;
	const r32 = h3 / h2;
	const e21 = f2 - f1;
	const e32 = f3 - f2;
	if (e21 === 0 || e32 === 0) {
		// no difference between grids: converged to round-off, nothing to extrapolate
		return { order: Number.NaN, extrapolated: f1, approximateRelativeError: Math.abs(e21 / f1), extrapolatedRelativeError: 0, gciFine: 0, oscillatory: false };
	}
	const s = Math.sign(e32 / e21);
	const lnRatio = Math.log(Math.abs(e32 / e21));
	let p = Math.abs(lnRatio) / Math.log(r21);
	for (let k = 0; k < 200; k++) {
		const q = Math.log((Math.pow(r21, p) - s) / (Math.pow(r32, p) - s));
		const next = Math.abs(lnRatio + q) / Math.log(r21);
		if (Math.abs(next - p) < 1e-12) {
			p = next;
			break;
		}
		p = next;
	}
	const rp = Math.pow(r21, p);
	const extrapolated = (rp * f1 - f2) / (rp - 1);
	const ea = Math.abs((f1 - f2) / f1);
	return {
		order: p,
		extrapolated,
		approximateRelativeError: ea,
		extrapolatedRelativeError: Math.abs((extrapolated - f1) / extrapolated),
		gciFine: (1.25 * ea) / (rp - 1),
		oscillatory: s < 0
	};
}
