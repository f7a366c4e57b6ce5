/**
 * Gas–liquid mass transfer: liquid-side coefficient, interfacial area and k_L a.
 */
import { columnGroups, type ColumnInput } from './groups.js';

/** Higbie (1935), Trans. AIChE 31, 365: k_L = 2 √(D_L/(π t_c)), m/s; contact time t_c = d/u_r for bubbles (common practice). */
export function higbieMassTransferCoefficient(o: { diffusivityM2S: number; diameterM: number; slipMS: number }): number {
	const tc = o.diameterM / Math.abs(o.slipMS);
	return 2 * Math.sqrt(o.diffusivityM2S / (Math.PI * tc));
}

/** Interfacial area per unit volume of spheres a = 6 α/d₃₂, 1/m. */
export function interfacialArea(o: { holdup: number; diameterM: number }): number {
	return (6 * o.holdup) / o.diameterM;
}

/**
 * Akita & Yoshida (1973), Ind. Eng. Chem. Process Des. Dev. 12(1), 76–80: k_L a D²/D_L = 0.6 Sc^0.5 Bo^0.62 Ga^0.31 ε^1.1,
 * Sc = ν_l/D_L, Ga = g D³/ν_l², 1/s (form and constants agree with a secondary transcription of the paper; the paper
 * itself not seen). No diameter limit is applied here: their data reach 0.6 m (from memory).
 */
export function akitaYoshidaKLa(o: ColumnInput & { holdup: number; diffusivityM2S: number }): number {
	const { bond, galilei } = columnGroups(o);
	const sc = o.liquidViscosityPaS / o.liquidDensityKgM3 / o.diffusivityM2S;
	const rhs = 0.6 * Math.sqrt(sc) * Math.pow(bond, 0.62) * Math.pow(galilei, 0.31) * Math.pow(o.holdup, 1.1);
	return (rhs * o.diffusivityM2S) / (o.diameterM * o.diameterM);
}

/**
 * Frössling (1938), Gerlands Beitr. Geophys. 52: Sh = k_L d/D_L = 2 + 0.552 Re^(1/2) Sc^(1/3) for a rigid sphere
 * (Re = ρ_l |u_r| d/μ_l, Sc = μ_l/(ρ_l D_L)); used for bubbles whose interface is immobilised by contaminants
 * (common practice), m/s.
 */
export function frosslingMassTransferCoefficient(o: { diffusivityM2S: number; diameterM: number; slipMS: number; liquidDensityKgM3: number; liquidViscosityPaS: number }): number {
	const re = (o.liquidDensityKgM3 * Math.abs(o.slipMS) * o.diameterM) / o.liquidViscosityPaS;
	const sc = o.liquidViscosityPaS / (o.liquidDensityKgM3 * o.diffusivityM2S);
	return ((2 + 0.552 * Math.sqrt(re) * Math.cbrt(sc)) * o.diffusivityM2S) / o.diameterM;
}
