/**
 * One-dimensional drift-flux holdup: ⟨α⟩ = j_g/(C₀ j + V_gj) (Zuber & Findlay 1965, J. Heat Transfer 87, 453).
 * j = j_g + j_l; j_l = 0 for a batch column.
 */
import { GRAVITY_MS2 } from '../fluids.js';
import { bisect } from './groups.js';

export interface DriftFluxInput {
	superficialGasVelocityMS: number;
	superficialLiquidVelocityMS?: number;
	liquidDensityKgM3: number;
	gasDensityKgM3: number;
	surfaceTensionNM: number;
	gravityMS2?: number;
}

/** (σ g Δρ/ρ_l²)^(1/4), m/s — 0.1634 m/s for air–water at 20 °C. */
export function bubbleVelocityScale(o: DriftFluxInput): number {
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	return Math.pow((o.surfaceTensionNM * g * (o.liquidDensityKgM3 - o.gasDensityKgM3)) / (o.liquidDensityKgM3 * o.liquidDensityKgM3), 0.25);
}

/** Zuber & Findlay (1965) with C₀ = 1.2 and the bubbly drift velocity 1.53 (σgΔρ/ρ_l²)^(1/4) of Harmathy (1960) (constants from memory). */
export function zuberFindlayHoldup(o: DriftFluxInput & { distributionParameter?: number; driftCoefficient?: number }): number {
	const c0 = o.distributionParameter ?? 1.2;
	const vgj = (o.driftCoefficient ?? 1.53) * bubbleVelocityScale(o);
	const j = o.superficialGasVelocityMS + (o.superficialLiquidVelocityMS ?? 0);
	return o.superficialGasVelocityMS / (c0 * j + vgj);
}

/** Ishii (1977), ANL-77-47, round tube: C₀ = 1.2 − 0.2 √(ρ_g/ρ_l) (from memory). */
export function ishiiDistributionParameter(o: { liquidDensityKgM3: number; gasDensityKgM3: number }): number {
	return 1.2 - 0.2 * Math.sqrt(o.gasDensityKgM3 / o.liquidDensityKgM3);
}

/** Ishii (1977) bubbly flow: V_gj = √2 (σgΔρ/ρ_l²)^(1/4) (1 − α)^1.75; the holdup is the root of α = j_g/(C₀ j + V_gj(α)). */
export function ishiiBubblyHoldup(o: DriftFluxInput): number {
	const c0 = ishiiDistributionParameter(o);
	const u = Math.SQRT2 * bubbleVelocityScale(o);
	const jg = o.superficialGasVelocityMS;
	const j = jg + (o.superficialLiquidVelocityMS ?? 0);
	if (jg <= 0) return 0;
	return bisect((a) => a * (c0 * j + u * Math.pow(1 - a, 1.75)) - jg, 0, 1);
}

/** Ishii (1977) churn-turbulent flow: V_gj = √2 (σgΔρ/ρ_l²)^(1/4). */
export function ishiiChurnHoldup(o: DriftFluxInput): number {
	const c0 = ishiiDistributionParameter(o);
	const j = o.superficialGasVelocityMS + (o.superficialLiquidVelocityMS ?? 0);
	return o.superficialGasVelocityMS / (c0 * j + Math.SQRT2 * bubbleVelocityScale(o));
}

/**
 * Wallis (1969): drift flux j_gl = (1 − α) j_g − α j_l = U_∞ α (1 − α)^n (from memory); the lower root (bubbly branch).
 * Returns NaN when the operating line misses the curve (flooding).
 */
export function wallisHoldup(o: { superficialGasVelocityMS: number; superficialLiquidVelocityMS?: number; swarmVelocityMS: number; exponent: number }): number {
	const jg = o.superficialGasVelocityMS;
	const jl = o.superficialLiquidVelocityMS ?? 0;
	const g = (a: number) => o.swarmVelocityMS * a * Math.pow(1 - a, o.exponent) - ((1 - a) * jg - a * jl);
	// g(0) = −j_g ≤ 0; scan upward for the first sign change, then bisect
	const steps = 2000;
	let prev = 0;
	for (let k = 1; k <= steps; k++) {
		const a = k / steps;
		if (g(a) >= 0) return bisect(g, prev, a);
		prev = a;
	}
	return Number.NaN;
}
