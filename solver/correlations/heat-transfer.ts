/**
 * Heat transfer between a bubble column and its wall.
 */
import { GRAVITY_MS2 } from '../fluids.js';

/**
 * Deckwer (1980), Chem. Eng. Sci. 35, 1341: St = h/(ρ_l c_p U_G) = 0.1 (Re Fr Pr²)^(−1/4) with Re Fr = U_G³ ρ_l/(μ_l g),
 * i.e. h = 0.1 ρ_l c_p (U_G g μ_l/ρ_l)^(1/4) Pr^(−1/2), Pr = c_p μ_l/λ_l, W/(m² K) (form from memory; derived from
 * Kolmogorov's isotropic turbulence with the energy input g U_G per unit mass).
 */
export function deckwerWallHeatTransfer(o: {
	superficialGasVelocityMS: number;
	liquidDensityKgM3: number;
	liquidViscosityPaS: number;
	heatCapacityJKgK: number;
	thermalConductivityWMK: number;
	gravityMS2?: number;
}): number {
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	const ug = Math.max(o.superficialGasVelocityMS, 0);
	const pr = (o.heatCapacityJKgK * o.liquidViscosityPaS) / o.thermalConductivityWMK;
	return 0.1 * o.liquidDensityKgM3 * o.heatCapacityJKgK * Math.pow((ug * g * o.liquidViscosityPaS) / o.liquidDensityKgM3, 0.25) / Math.sqrt(pr);
}
