/**
 * Liquid circulation in a bubble column (PHYSICS §8.7).
 */
import { GRAVITY_MS2 } from '../fluids.js';

/** Riquarts (1981), Chem.-Ing.-Tech. 53, 60 (formula from memory): u_L(0) = 0.21 √(g D) (U_G³/(g ν_l))^(1/8), m/s. */
export function riquartsCentrelineVelocityMS(o: { diameterM: number; superficialGasVelocityMS: number; liquidKinematicViscosityM2S: number; gravityMS2?: number }): number {
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	return 0.21 * Math.sqrt(g * o.diameterM) * Math.pow(o.superficialGasVelocityMS ** 3 / (g * o.liquidKinematicViscosityM2S), 1 / 8);
}
