/**
 * Column groups used by the bubble-column correlations (PHYSICS §8):
 * Bo = g D² ρ_l/σ, Ga = g D³/ν_l², Fr = U_G/√(g D).
 */
import { GRAVITY_MS2 } from '../fluids.js';

export interface ColumnInput {
	diameterM: number;
	superficialGasVelocityMS: number;
	liquidDensityKgM3: number;
	liquidViscosityPaS: number;
	surfaceTensionNM: number;
	gravityMS2?: number;
}

export function columnGroups(o: ColumnInput): { bond: number; galilei: number; froude: number } {
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	const nu = o.liquidViscosityPaS / o.liquidDensityKgM3;
	const d = o.diameterM;
	return {
		bond: (g * d * d * o.liquidDensityKgM3) / o.surfaceTensionNM,
		galilei: (g * d * d * d) / (nu * nu),
		froude: o.superficialGasVelocityMS / Math.sqrt(g * d)
	};
}

/** Root of an increasing function on [lo, hi] by bisection (used for implicit holdup correlations). */
export function bisect(f: (x: number) => number, lo: number, hi: number): number {
	for (let k = 0; k < 200; k++) {
		const mid = 0.5 * (lo + hi);
		if (f(mid) > 0) hi = mid;
		else lo = mid;
		if (hi - lo < 1e-15) break;
	}
	return 0.5 * (lo + hi);
}
