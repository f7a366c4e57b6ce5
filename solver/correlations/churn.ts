/**
 * The churn-turbulent (heterogeneous) regime as two bubble classes (PHYSICS §8.8): below the transition
 * all gas rises as small bubbles; above it the small bubbles carry the transition gas rate and the excess
 * U_G − U_trans rises as large bubbles (Krishna & Ellenberger 1996, AIChE J. 42, 2627).
 */
import { GRAVITY_MS2 } from '../fluids.js';

export interface TransitionPoint {
	/** superficial gas velocity at the regime transition, m/s */
	velocityMS: number;
	/** gas holdup at the transition */
	holdup: number;
}

/**
 * Reilly, Scott, de Bruijn & MacIntyre (1994), Can. J. Chem. Eng. 72, 3: ε_trans = 0.59 B^1.5 √(ρ_G^0.96 σ^0.12/ρ_L),
 * B = 3.85, SI units; U_trans = ε_trans (1 − ε_trans) U_sb with the small-bubble swarm velocity
 * U_sb = (1/2.84) ρ_G^−0.04 σ^0.12 (as used by Krishna & Ellenberger 1996). Forms and SI units from memory, not
 * read in the paper; they give ε_trans 0.13 and U_trans 0.029 m/s for air–water, as PHYSICS §8.6 expects.
 */
export function reillyTransition(o: { gasDensityKgM3: number; liquidDensityKgM3: number; surfaceTensionNM: number }): TransitionPoint {
	const b = 3.85;
	const holdup = 0.59 * Math.pow(b, 1.5) * Math.sqrt((Math.pow(o.gasDensityKgM3, 0.96) * Math.pow(o.surfaceTensionNM, 0.12)) / o.liquidDensityKgM3);
	const swarm = (1 / 2.84) * Math.pow(o.gasDensityKgM3, -0.04) * Math.pow(o.surfaceTensionNM, 0.12);
	return { velocityMS: holdup * (1 - holdup) * swarm, holdup };
}

/** Large-bubble diameter above the transition, d_b = 0.069 (U_G − U_trans)^0.376 m (Krishna & Ellenberger 1996; from memory). */
export function krishnaLargeBubbleDiameter(excessVelocityMS: number): number {
	return 0.069 * Math.pow(Math.max(excessVelocityMS, 1e-4), 0.376);
}

/**
 * Wall factor on the spherical-cap rise velocity, Collins (1967), J. Fluid Mech. 28, 97: 1 for d_b/D < 0.125,
 * 1.13 exp(−d_b/D) up to 0.6, 0.496 √(D/d_b) beyond (as used by Krishna et al. 1999; from memory, continuous at 0.125).
 */
export function collinsWallFactor(bubbleDiameterM: number, columnDiameterM: number): number {
	const r = bubbleDiameterM / columnDiameterM;
	if (r < 0.125) return 1;
	if (r < 0.6) return 1.13 * Math.exp(-r);
	return 0.496 * Math.sqrt(1 / r);
}

/**
 * Acceleration factor of a large-bubble swarm over one bubble, AF = 2.73 + 4.505 (U_G − U_trans) (m/s)
 * (Krishna, Urseanu, van Baten & Ellenberger 1999, Chem. Eng. Sci. 54, 171; from memory).
 */
export function krishnaAccelerationFactor(excessVelocityMS: number): number {
	return 2.73 + 4.505 * Math.max(excessVelocityMS, 0);
}

/**
 * Hikita, Asai, Tanigawa, Segawa & Kitao (1980), Chem. Eng. J. 20, 59: ε = 0.672 f (U_G μ_L/σ)^0.578
 * (μ_L⁴ g/(ρ_L σ³))^−0.131 (ρ_G/ρ_L)^0.062 (μ_G/μ_L)^0.107, f = 1 for non-electrolytes (constants from memory;
 * fitted on a 0.10 m column with a single nozzle).
 */
export function hikitaHoldup(o: {
	superficialGasVelocityMS: number;
	liquidDensityKgM3: number;
	liquidViscosityPaS: number;
	surfaceTensionNM: number;
	gasDensityKgM3: number;
	gasViscosityPaS: number;
	gravityMS2?: number;
}): number {
	if (o.superficialGasVelocityMS <= 0) return 0;
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	const ml = o.liquidViscosityPaS;
	const s = o.surfaceTensionNM;
	return (
		0.672 *
		Math.pow((o.superficialGasVelocityMS * ml) / s, 0.578) *
		Math.pow((ml * ml * ml * ml * g) / (o.liquidDensityKgM3 * s * s * s), -0.131) *
		Math.pow(o.gasDensityKgM3 / o.liquidDensityKgM3, 0.062) *
		Math.pow(o.gasViscosityPaS / ml, 0.107)
	);
}
