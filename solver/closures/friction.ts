/**
 * Wall friction of the liquid on the column wall (single-phase pipe-flow laws applied to the liquid).
 */
import type { CaseDocument } from '../case.js';

export type WallFrictionModel = CaseDocument['closures']['wallFriction'];

/** Darcy friction factor: 64/Re (laminar, Hagen–Poiseuille) below Re = 2000, Blasius (1913) 0.316 Re^−0.25 above. */
export function darcyFrictionFactor(reynolds: number): number {
	if (reynolds <= 0) return 0;
	if (reynolds < 2000) return 64 / reynolds;
	return 0.316 * Math.exp(-0.25 * Math.log(reynolds));
}

/**
 * Coefficient λ (kg m⁻³ s⁻¹) of the liquid wall-friction force per volume F = −λ u_l, with
 * λ = α_l f ρ_l |u_l| / (2 D) (wall shear f ρ u²/8 over the perimeter-to-area ratio 4/D); 0 for "none".
 */
export function wallFrictionCoefficient(o: { model: WallFrictionModel; liquidFraction: number; liquidDensityKgM3: number; liquidViscosityPaS: number; liquidVelocityMS: number; diameterM: number }): number {
	if (o.model === 'none') return 0;
	return blasiusFrictionCoefficient(o.liquidFraction, o.liquidDensityKgM3, o.liquidViscosityPaS, o.liquidVelocityMS, o.diameterM);
}

/** λ of the Blasius/laminar law with plain arguments (no allocation, for the solver's face loop). */
export function blasiusFrictionCoefficient(liquidFraction: number, densityKgM3: number, viscosityPaS: number, velocityMS: number, diameterM: number): number {
	const u = Math.abs(velocityMS);
	const re = (densityKgM3 * u * diameterM) / viscosityPaS;
	if (re < 2000) return (liquidFraction * 32 * viscosityPaS) / (diameterM * diameterM);
	return (liquidFraction * darcyFrictionFactor(re) * densityKgM3 * u) / (2 * diameterM);
}
