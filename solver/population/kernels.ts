/**
 * Coalescence and breakage kernels for the class method (`pivot.ts`), SI units.
 *
 * Coalescence kernels return β(d_i, d_j) in m³/s: the rate of coalescences per unit volume between
 * classes i ≠ j is β N_i N_j. Breakage kernels return the binary breakage rate density ω(f) of one
 * bubble, 1/s per unit volume fraction f of the smaller daughter (0 < f ≤ 1/2).
 *
 * Sources and what is confirmed:
 * - Prince & Blanch (1990), AIChE J. 36, 1485–1499: the turbulent collision rate and the
 *   film-drainage efficiency with C = 0.089, h₀ = 1e−4 m, h_f = 1e−8 m, from a secondary restatement of
 *   the formulas (not read in the paper itself). The equivalent radius
 *   is taken as r_ij = (1/d_i + 1/d_j)⁻¹ (= r for equal bubbles; Chesters 1991, from memory); the paper's printed
 *   expression is reported to differ from this.
 * - Luo & Svendsen (1996), AIChE J. 42, 1225–1233: the form of the rate density and λ_min = 11.4 η (the
 *   usual default of the range 11.4–31.4) from a secondary restatement; the constants C = 0.923
 *   and β = 2.05 are from memory.
 * - Ziff & McGrady (1985), J. Phys. A 18, 3027: uniform binary breakage at a rate proportional to volume.
 * - ε ≈ g U_g: power input of the rising gas per unit liquid mass (common practice).
 */
import { GRAVITY_MS2 } from '../fluids.js';
import { gaussLegendreUnit } from './grid.js';
import type { BreakageKernel, CoalescenceKernel } from './pivot.js';

/** Prince & Blanch (1990) turbulent collision coefficient C in θ = C π (d_i + d_j)² ε^⅓ (d_i^⅔ + d_j^⅔)^½. */
export const PRINCE_BLANCH_COLLISION_C = 0.089;
/** Prince & Blanch (1990) initial film thickness h₀, m (air–water). */
export const PRINCE_BLANCH_INITIAL_FILM_M = 1e-4;
/** Prince & Blanch (1990) critical (rupture) film thickness h_f, m (air–water). */
export const PRINCE_BLANCH_CRITICAL_FILM_M = 1e-8;
/** Luo & Svendsen (1996) leading constant (from memory). */
export const LUO_SVENDSEN_C = 0.923;
/** Luo & Svendsen (1996) β of the eddy velocity ū_λ² = β (ελ)^⅔ (from memory). */
export const LUO_SVENDSEN_BETA = 2.05;
/** Luo & Svendsen (1996) smallest breaking eddy λ_min/η (usual default of 11.4–31.4). */
export const LUO_SVENDSEN_MIN_EDDY_RATIO = 11.4;

/** Turbulence dissipation rate in a bubble column, ε ≈ g U_g, m²/s³ = W/kg (common practice). */
export function columnDissipationRateM2S3(o: { superficialGasVelocityMS: number }): number {
	return GRAVITY_MS2 * Math.max(o.superficialGasVelocityMS, 0);
}

/** Constant coalescence kernel β (Smoluchowski 1917; Scott 1968, J. Atmos. Sci. 25, 54 solves it), m³/s. */
export function constantCoalescence(betaM3S: number): CoalescenceKernel {
	if (!(betaM3S >= 0)) throw new Error('Constant coalescence kernel must not be negative');
	return () => betaM3S;
}

/** Prince & Blanch (1990) turbulent collision rate θ^T = 0.089 π (d_i + d_j)² ε^⅓ (d_i^⅔ + d_j^⅔)^½, m³/s. */
export function princeBlanchTurbulentCollisionM3S(o: { diameterIM: number; diameterJM: number; dissipationM2S3: number }): number {
	const di = o.diameterIM;
	const dj = o.diameterJM;
	const s = di + dj;
	return PRINCE_BLANCH_COLLISION_C * Math.PI * s * s * Math.cbrt(Math.max(o.dissipationM2S3, 0)) * Math.sqrt(Math.cbrt(di * di) + Math.cbrt(dj * dj));
}

/** Prince & Blanch (1990) rise velocity u = (2.14 σ/(ρ d) + 0.505 g d)^½ used in their buoyancy collisions, m/s. */
export function princeBlanchRiseVelocityMS(o: { diameterM: number; liquidDensityKgM3: number; surfaceTensionNM: number }): number {
	return Math.sqrt((2.14 * o.surfaceTensionNM) / (o.liquidDensityKgM3 * o.diameterM) + 0.505 * GRAVITY_MS2 * o.diameterM);
}

/** Prince & Blanch (1990) buoyancy-driven collision rate θ^B = (π/4)(d_i + d_j)² |u_i − u_j|, m³/s. */
export function princeBlanchBuoyancyCollisionM3S(o: { diameterIM: number; diameterJM: number; liquidDensityKgM3: number; surfaceTensionNM: number }): number {
	const s = o.diameterIM + o.diameterJM;
	const ui = princeBlanchRiseVelocityMS({ diameterM: o.diameterIM, liquidDensityKgM3: o.liquidDensityKgM3, surfaceTensionNM: o.surfaceTensionNM });
	const uj = princeBlanchRiseVelocityMS({ diameterM: o.diameterJM, liquidDensityKgM3: o.liquidDensityKgM3, surfaceTensionNM: o.surfaceTensionNM });
	return (Math.PI / 4) * s * s * Math.abs(ui - uj);
}

/**
 * Prince & Blanch (1990) film-drainage efficiency λ = exp(−t_ij/τ_ij), t_ij = (r_ij³ ρ/(16 σ))^½ ln(h₀/h_f),
 * τ_ij = r_ij^⅔ / ε^⅓, r_ij = (1/d_i + 1/d_j)⁻¹.
 */
export function princeBlanchEfficiency(o: {
	diameterIM: number;
	diameterJM: number;
	dissipationM2S3: number;
	liquidDensityKgM3: number;
	surfaceTensionNM: number;
	initialFilmM?: number;
	criticalFilmM?: number;
}): number {
	const r = 1 / (1 / o.diameterIM + 1 / o.diameterJM);
	const h0 = o.initialFilmM ?? PRINCE_BLANCH_INITIAL_FILM_M;
	const hf = o.criticalFilmM ?? PRINCE_BLANCH_CRITICAL_FILM_M;
	const drainage = Math.sqrt((r * r * r * o.liquidDensityKgM3) / (16 * o.surfaceTensionNM)) * Math.log(h0 / hf);
	const contact = Math.cbrt(r * r) / Math.cbrt(Math.max(o.dissipationM2S3, 1e-300));
	return Math.exp(-drainage / contact);
}

export interface PrinceBlanchOptions {
	dissipationM2S3: number;
	liquidDensityKgM3: number;
	surfaceTensionNM: number;
	initialFilmM?: number;
	criticalFilmM?: number;
	/** add the buoyancy-driven collisions (default false: turbulent collisions only) */
	buoyancy?: boolean;
}

/** Prince & Blanch (1990) coalescence kernel (θ^T [+ θ^B]) λ, m³/s; laminar-shear collisions left out. */
export function princeBlanchCoalescence(o: PrinceBlanchOptions): CoalescenceKernel {
	return (di, dj) => {
		const pair = { diameterIM: di, diameterJM: dj, ...o };
		let theta = princeBlanchTurbulentCollisionM3S(pair);
		if (o.buoyancy) theta += princeBlanchBuoyancyCollisionM3S(pair);
		return theta * princeBlanchEfficiency(pair);
	};
}

/**
 * The eddy integral of Luo & Svendsen (1996), I(b, ξ_min) = ∫_{ξ_min}^1 (1 + ξ)² ξ^(−11/3) exp(−b ξ^(−11/3)) dξ,
 * by composite Gauss–Legendre in ln ξ (8 nodes per panel of width ≤ 0.25).
 */
export function luoSvendsenEddyIntegral(b: number, xiMin: number): number {
	if (!(xiMin < 1)) return 0;
	const { nodes, weights } = gaussLegendreUnit(8);
	const u0 = Math.log(xiMin);
	const panels = Math.max(8, Math.ceil(-u0 / 0.25));
	const h = -u0 / panels;
	let sum = 0;
	for (let p = 0; p < panels; p++) {
		const a = u0 + p * h;
		for (let q = 0; q < 8; q++) {
			const u = a + h * nodes[q];
			const xi = Math.exp(u);
			const x113 = Math.exp((-11 / 3) * u); // ξ^(−11/3)
			const onePlus = 1 + xi;
			// dξ = ξ du
			sum += weights[q] * h * onePlus * onePlus * x113 * xi * Math.exp(-b * x113);
		}
	}
	return sum;
}

/** Luo & Svendsen (1996) surface-increase coefficient c_f = f^⅔ + (1 − f)^⅔ − 1. */
export function luoSvendsenSurfaceIncrease(fraction: number): number {
	const f = Math.min(Math.max(fraction, 0), 1);
	return Math.cbrt(f * f) + Math.cbrt((1 - f) * (1 - f)) - 1;
}

export interface LuoSvendsenOptions {
	dissipationM2S3: number;
	liquidDensityKgM3: number;
	liquidViscosityPaS: number;
	surfaceTensionNM: number;
	/** liquid volume fraction 1 − α multiplying the rate (default 1) */
	liquidFraction?: number;
}

/**
 * Luo & Svendsen (1996) binary breakup rate density of one bubble of diameter d into f v and (1 − f) v, 1/s per unit f:
 * ω = 0.923 (1 − α) (ε/d²)^⅓ ∫_{ξ_min}^1 (1 + ξ)² ξ^(−11/3) exp[−12 c_f σ/(β ρ ε^⅔ d^(5/3) ξ^(11/3))] dξ,
 * ξ_min = 11.4 η/d, η = (ν³/ε)^¼. Constants 0.923 and β = 2.05 from memory.
 */
export function luoSvendsenBreakupDensity(o: LuoSvendsenOptions & { diameterM: number; fraction: number }): number {
	const eps = o.dissipationM2S3;
	if (!(eps > 0)) return 0;
	const d = o.diameterM;
	const nu = o.liquidViscosityPaS / o.liquidDensityKgM3;
	const eta = Math.sqrt(Math.sqrt((nu * nu * nu) / eps));
	const xiMin = (LUO_SVENDSEN_MIN_EDDY_RATIO * eta) / d;
	if (!(xiMin < 1)) return 0;
	const cf = luoSvendsenSurfaceIncrease(o.fraction);
	const b = (12 * cf * o.surfaceTensionNM) / (LUO_SVENDSEN_BETA * o.liquidDensityKgM3 * Math.cbrt(eps * eps) * Math.cbrt(d * d * d * d * d));
	return LUO_SVENDSEN_C * (o.liquidFraction ?? 1) * Math.cbrt(eps / (d * d)) * luoSvendsenEddyIntegral(b, xiMin);
}

/** Luo & Svendsen (1996) breakage kernel for the class method (evaluated at tabulation only). */
export function luoSvendsenBreakage(o: LuoSvendsenOptions): BreakageKernel {
	return (d, _v, f) => luoSvendsenBreakupDensity({ ...o, diameterM: d, fraction: f });
}

/**
 * Ziff & McGrady (1985), J. Phys. A 18, 3027: binary breakage at the frequency a(v) = k v with uniformly
 * distributed daughters, ω(f) = 2 k v on 0 < f ≤ 1/2; k in 1/(m³ s).
 */
export function uniformBinaryBreakage(o: { rateConstantPerM3S: number }): BreakageKernel {
	const k = o.rateConstantPerM3S;
	if (!(k >= 0)) throw new Error('Breakage rate constant must not be negative');
	return (_d, v) => 2 * k * v;
}
