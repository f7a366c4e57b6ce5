/**
 * Drag of a single bubble and the interfacial drag coefficient per unit volume.
 *
 * Re = ρ_l |u_r| d / μ_l, Eo = g Δρ d² / σ (PHYSICS §0). Every law is also available as the
 * product C_D·Re, which stays finite as Re → 0; the solver uses that form so a bubble at rest
 * (u_r = 0) has a well-defined drag coefficient per volume.
 */
import type { DragLaw } from '../case.js';
import { GRAVITY_MS2 } from '../fluids.js';

export interface DragInput {
	law: DragLaw;
	reynolds: number;
	eotvos: number;
	holdup: number;
}

/** x^0.687 without Math.pow (V8's pow is slow; exp/log is exact enough here). */
function pow0687(x: number): number {
	return x > 0 ? Math.exp(0.687 * Math.log(x)) : 0;
}

/** Numeric codes of the drag laws, for hot loops that must not allocate. */
export const DRAG_LAW_CODES: Record<DragLaw, number> = {
	stokes: 0,
	'schiller-naumann': 1,
	'ishii-zuber': 2,
	'tomiyama-pure': 3,
	'tomiyama-slightly-contaminated': 4,
	'tomiyama-contaminated': 5
};

/**
 * C_D·Re of one bubble for the given law (finite at Re = 0).
 * Stokes (1851): 24. Schiller & Naumann (1933): 24(1 + 0.15 Re^0.687), 0.44 Re above Re = 1000.
 * Ishii & Zuber (1979): viscous 24(1 + 0.1 Re_m^0.75)/(1 − α), distorted (2/3)√Eo·[(1 + 17.67 f^(6/7))/(18.67 f)]²,
 * cap (8/3)(1 − α)², with μ_m = μ_l/(1 − α), f = (1 − α)^1.5.
 * (Stokes, Schiller–Naumann and Ishii–Zuber constants from memory, PHYSICS §1.1–1.4.)
 * Tomiyama, Kataoka, Zun & Sakaguchi (1998), JSME Int. J. B 41, 472: pure / slightly contaminated / contaminated:
 *   max{min[(16/Re)(1 + 0.15 Re^0.687), 48/Re], (8/3) Eo/(Eo + 4)}, the same with 24 and 72, and
 *   max{(24/Re)(1 + 0.15 Re^0.687), (8/3) Eo/(Eo + 4)} (PHYSICS §1.5).
 */
export function dragCoefficientTimesReynolds(input: DragInput): number {
	return dragCdRe(DRAG_LAW_CODES[input.law], input.reynolds, input.eotvos, input.holdup);
}

/** `dragCoefficientTimesReynolds` with the law as its numeric code and plain arguments (no allocation). */
export function dragCdRe(law: number, reynolds: number, eotvos: number, holdup: number): number {
	const re = reynolds > 0 ? reynolds : 0;
	switch (law) {
		case 0:
			return 24;
		case 1:
			return re <= 1000 ? 24 * (1 + 0.15 * pow0687(re)) : 0.44 * re;
		case 3:
			return Math.max(Math.min(16 * (1 + 0.15 * pow0687(re)), 48), ((8 / 3) * eotvos * re) / (eotvos + 4));
		case 4:
			return Math.max(Math.min(24 * (1 + 0.15 * pow0687(re)), 72), ((8 / 3) * eotvos * re) / (eotvos + 4));
		case 5:
			return Math.max(24 * (1 + 0.15 * pow0687(re)), ((8 / 3) * eotvos * re) / (eotvos + 4));
		case 2: {
			const al = Math.min(Math.max(1 - holdup, 1e-6), 1);
			// mixture viscosity μ_m = μ_l/(1 − α) for bubbles (α_max = 1, μ_g ≪ μ_l), so Re_m = Re (1 − α)
			const reM = re * al;
			const visTimesRe = (24 / al) * (1 + 0.1 * (reM > 0 ? Math.exp(0.75 * Math.log(reM)) : 0));
			const f = al * Math.sqrt(al);
			const e = (1 + 17.67 * Math.exp((6 / 7) * Math.log(f))) / (18.67 * f);
			const dis = (2 / 3) * Math.sqrt(eotvos) * e * e;
			const cap = (8 / 3) * al * al;
			// regime selection as commonly implemented for bubbles (PHYSICS §1.4)
			if (visTimesRe >= dis * re) return visTimesRe;
			return Math.min(dis, cap) * re;
		}
		default:
			throw new Error(`Unknown drag law code ${law}`);
	}
}

/** C_D of one bubble (Ishii–Zuber uses holdup for its mixture viscosity) */
export function dragCoefficient(input: DragInput): number {
	return dragCoefficientTimesReynolds(input) / input.reynolds;
}

/** Eo = g Δρ d² / σ. */
export function eotvosNumber(o: { diameterM: number; liquidDensityKgM3: number; gasDensityKgM3: number; surfaceTensionNM: number; gravityMS2?: number }): number {
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	return (g * (o.liquidDensityKgM3 - o.gasDensityKgM3) * o.diameterM * o.diameterM) / o.surfaceTensionNM;
}

/** terminal rise velocity of a single bubble, m/s, by an independent root solve of (4/3) g d Δρ = C_D ρ_l U² */
export function terminalVelocity(o: {
	law: DragLaw;
	diameterM: number;
	liquidDensityKgM3: number;
	gasDensityKgM3: number;
	liquidViscosityPaS: number;
	surfaceTensionNM: number;
	gravityMS2?: number;
}): number {
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	const d = o.diameterM;
	const dRho = o.liquidDensityKgM3 - o.gasDensityKgM3;
	const eo = eotvosNumber(o);
	const buoyancy = (4 / 3) * g * d * dRho;
	// residual of the force balance; C_D·U² = (C_D·Re)·μ U/(ρ d) rises with U for every law here
	const residual = (u: number) => {
		const re = (o.liquidDensityKgM3 * u * d) / o.liquidViscosityPaS;
		const cdRe = dragCoefficientTimesReynolds({ law: o.law, reynolds: re, eotvos: eo, holdup: 0 });
		return (cdRe * o.liquidViscosityPaS * u) / d - buoyancy;
	};
	// bisection on log U: slow but independent of the drag law's smoothness, and this is not in a hot loop
	let lo = 1e-14;
	let hi = 100;
	if (residual(hi) < 0) return hi;
	for (let k = 0; k < 200; k++) {
		const mid = Math.sqrt(lo * hi);
		if (residual(mid) > 0) hi = mid;
		else lo = mid;
		if (hi - lo <= 1e-15 * hi) break;
	}
	return 0.5 * (lo + hi);
}

/** Stokes (1851) terminal velocity U = Δρ g d² / (18 μ_l), m/s. */
export function stokesVelocity(o: { diameterM: number; liquidDensityKgM3: number; gasDensityKgM3: number; liquidViscosityPaS: number; gravityMS2?: number }): number {
	const g = o.gravityMS2 ?? GRAVITY_MS2;
	return ((o.liquidDensityKgM3 - o.gasDensityKgM3) * g * o.diameterM * o.diameterM) / (18 * o.liquidViscosityPaS);
}

/** Hadamard (1911) – Rybczynski (1911) clean-bubble creeping-flow velocity Δρ g d² / (12 μ_l), m/s (κ → 0). */
export function hadamardRybczynskiVelocity(o: { diameterM: number; liquidDensityKgM3: number; gasDensityKgM3: number; liquidViscosityPaS: number; gravityMS2?: number }): number {
	return 1.5 * stokesVelocity(o);
}

/** K = (3/4) α ρ_l C_D |u_r| / d, kg m⁻³ s⁻¹: single-bubble drag times number density 6α/(π d³) (PHYSICS §1.7). */
export function dragPerVolume(o: { holdup: number; liquidDensityKgM3: number; dragCoefficient: number; slipMS: number; diameterM: number }): number {
	return (0.75 * o.holdup * o.liquidDensityKgM3 * o.dragCoefficient * Math.abs(o.slipMS)) / o.diameterM;
}
