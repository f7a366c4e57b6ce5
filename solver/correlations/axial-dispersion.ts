/**
 * Axial dispersion coefficient of the liquid in a bubble column, SI (D column diameter in m, U_G superficial gas
 * velocity in m/s, D_L in m²/s).
 */
import { GRAVITY_MS2 } from '../fluids.js';

/**
 * Deckwer, Burckhart & Zoll (1974), Chem. Eng. Sci. 29, 2177: D_L = 2.7 D^1.4 U_G^0.3 in cm²/s with D in cm and U_G in
 * cm/s, i.e. 2.7 · 100^1.7 · 10⁻⁴ = 0.678 D^1.4 U_G^0.3 in SI (form and constant from memory; the SI constant converted here).
 */
export function deckwerLiquidDispersion(o: { columnDiameterM: number; superficialGasVelocityMS: number }): number {
	return DECKWER_SI * Math.pow(o.columnDiameterM, 1.4) * Math.pow(Math.max(o.superficialGasVelocityMS, 0), 0.3);
}

/** 2.7 cm²/s · (cm)^−1.4 (cm/s)^−0.3 in SI: 2.7e-4 · 100^1.4 · 100^0.3 = 0.6782. */
const DECKWER_SI = 2.7e-4 * Math.pow(100, 1.7);

/** Baird & Rice (1975), Chem. Eng. J. 9, 171: D_L = 0.35 D^(4/3) (g U_G)^(1/3), SI (isotropic turbulence; from memory). */
export function bairdRiceLiquidDispersion(o: { columnDiameterM: number; superficialGasVelocityMS: number; gravityMS2?: number }): number {
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	return 0.35 * Math.pow(o.columnDiameterM, 4 / 3) * Math.cbrt(g * Math.max(o.superficialGasVelocityMS, 0));
}
