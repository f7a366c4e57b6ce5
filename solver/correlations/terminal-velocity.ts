/**
 * Single-bubble terminal-velocity correlations used for comparison (not as drag laws in the solver).
 */
import { GRAVITY_MS2 } from '../fluids.js';

/** Mendelson (1967), AIChE J. 13, 250, wave analogy: U = √(2σ/(ρ_l d) + g d/2), for d ≳ 1.5 mm in pure low-viscosity liquids (from memory). */
export function mendelsonVelocity(o: { diameterM: number; liquidDensityKgM3: number; surfaceTensionNM: number; gravityMS2?: number }): number {
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	return Math.sqrt((2 * o.surfaceTensionNM) / (o.liquidDensityKgM3 * o.diameterM) + (g * o.diameterM) / 2);
}

/**
 * Grace, Wairegi & Nguyen (1976), Trans. IChemE 54, 167 (contaminated, ellipsoidal; constants from memory):
 * H = (4/3) Eo Mo^−0.149 (μ_l/0.0009)^−0.14, J = 0.94 H^0.757 (H ≤ 59.3) or 3.42 H^0.441,
 * U = μ_l/(ρ_l d) Mo^−0.149 (J − 0.857). Valid for Mo < 1e-3, Eo < 40, Re > 0.1.
 */
export function graceVelocity(o: { diameterM: number; liquidDensityKgM3: number; gasDensityKgM3: number; liquidViscosityPaS: number; surfaceTensionNM: number; gravityMS2?: number }): number {
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	const dRho = o.liquidDensityKgM3 - o.gasDensityKgM3;
	const eo = (g * dRho * o.diameterM * o.diameterM) / o.surfaceTensionNM;
	const mo = (g * Math.pow(o.liquidViscosityPaS, 4) * dRho) / (o.liquidDensityKgM3 * o.liquidDensityKgM3 * Math.pow(o.surfaceTensionNM, 3));
	const h = (4 / 3) * eo * Math.pow(mo, -0.149) * Math.pow(o.liquidViscosityPaS / 0.0009, -0.14);
	const j = h <= 59.3 ? 0.94 * Math.pow(h, 0.757) : 3.42 * Math.pow(h, 0.441);
	return (o.liquidViscosityPaS / (o.liquidDensityKgM3 * o.diameterM)) * Math.pow(mo, -0.149) * (j - 0.857);
}
