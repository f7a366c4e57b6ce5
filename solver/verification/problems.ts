/**
 * Set-ups and reference solutions of the verification problems, shared by the solver tests
 * (tests/solver/*.test.ts) and the verification cases (`./cases.ts`), so the verification page and
 * the tests compute exactly the same numbers. Each function states its problem, its reference and
 * the source of the reference; none of them asserts anything.
 */
import { oneClassCase, defaultCase, type CaseDocument } from '../case.js';
import { createHeightSimulation, createHeightSimulationFromConfig, type HeightSimulation } from '../height/simulation.js';
import { faucetConfig } from '../height/problems.js';
import { createRadialGrid, createCrossSectionSimulation, solveAxialMomentum } from '../cross-section/index.js';
import { eotvosNumber } from '../closures/drag.js';
import { tomiyamaLiftCoefficient } from '../closures/lift.js';
import { akitaYoshidaHoldup } from '../correlations/holdup.js';
import { hikitaHoldup } from '../correlations/churn.js';
import { GAS_CONSTANT_J_MOL_K, GRAVITY_MS2 } from '../fluids.js';
import type { Results, Simulation } from '../types.js';

/** Water and air at 20 °C, 1 atm (the reference property set of the closure checks). */
export const AIR_WATER = { liquidDensityKgM3: 998.2, gasDensityKgM3: 1.204, liquidViscosityPaS: 1.002e-3, surfaceTensionNM: 0.0727 } as const;

/** Step a simulation until it ends (or `maxSteps`, a guard against a run that never ends). */
export function runSimulation<S extends Simulation>(sim: S, maxSteps = Number.POSITIVE_INFINITY): S {
	for (let k = 0; sim.state.status === 'running' && k < maxSteps; k++) sim.step();
	return sim;
}

// ------------------------------------------------------------------ Ransom's water faucet

/**
 * Analytical gas holdup of Ransom's water faucet (Ransom 1987) for massless gas without interfacial
 * friction: below the front x_f = v₀t + g t²/2, α_g = 1 − α_l0 v₀ / √(v₀² + 2 g x); beyond it α_g = 0.2
 * (v₀ = 10 m/s, α_l0 = 0.8, x downwards from the inlet).
 * @example faucetExactHoldup(4, 0.5) // 0.40118
 */
export function faucetExactHoldup(xM: number, timeS: number): number {
	const g = 9.81;
	const xf = 10 * timeS + 0.5 * g * timeS * timeS;
	return xM <= xf ? 1 - (0.8 * 10) / Math.sqrt(100 + 2 * g * xM) : 0.2;
}

/** The faucet on `cells` cells, run to `endTimeS`. */
export function runFaucet(o: { cells: number; endTimeS: number; scheme?: 'donor-cell' | 'van-leer' | 'minmod' }): HeightSimulation {
	return runSimulation(createHeightSimulationFromConfig(defaultCase(), faucetConfig({ cells: o.cells, endTimeS: o.endTimeS, scheme: o.scheme ?? 'donor-cell' })));
}

/** Exact cell averages of the faucet holdup (midpoint rule, 400 points per cell) on a 12 m pipe of `cells` cells. */
export function faucetExactCellAverages(cells: number, timeS: number): Float64Array {
	const dz = 12 / cells;
	const out = new Float64Array(cells);
	for (let i = 0; i < cells; i++) {
		let avg = 0;
		for (let q = 0; q < 400; q++) avg += faucetExactHoldup((i + (q + 0.5) / 400) * dz, timeS);
		out[i] = avg / 400;
	}
	return out;
}

/** Mean absolute error of a finished faucet run's cell holdups against the exact cell averages at its time. */
export function faucetL1Error(sim: HeightSimulation): number {
	const cells = sim.model.n;
	const exact = faucetExactCellAverages(cells, sim.state.timeS);
	let sum = 0;
	for (let i = 0; i < cells; i++) sum += Math.abs(1 - sim.model.liquidFraction[i] - exact[i]);
	return sum / cells;
}

// ------------------------------------------------------------------ column at rest

/**
 * Exact pressure at the sparger of a column at rest: the top pressure, the isothermal ideal-gas column
 * above the clear level, and the liquid weight (hydrostatics).
 */
export function restingColumnSpargerPressurePa(c: CaseDocument): number {
	const rhoTop = (c.fluids.topPressurePa * c.fluids.gas.molarMassKgMol) / (GAS_CONSTANT_J_MOL_K * c.fluids.temperatureK);
	const pLevel = c.fluids.topPressurePa * Math.exp((rhoTop / c.fluids.topPressurePa) * GRAVITY_MS2 * (c.geometry.heightM - c.geometry.clearLiquidLevelM));
	return pLevel + c.fluids.liquid.densityKgM3 * GRAVITY_MS2 * c.geometry.clearLiquidLevelM;
}

/** Exact hydrostatic pressure at height z of a column at rest (isothermal ideal gas above the clear level). */
export function restingColumnPressurePa(c: CaseDocument, zM: number): number {
	const level = c.geometry.clearLiquidLevelM;
	const pTop = c.fluids.topPressurePa;
	const k = (c.fluids.gas.molarMassKgMol * GRAVITY_MS2) / (GAS_CONSTANT_J_MOL_K * c.fluids.temperatureK);
	if (zM >= level) return pTop * Math.exp(k * (c.geometry.heightM - zM));
	return pTop * Math.exp(k * (c.geometry.heightM - level)) + c.fluids.liquid.densityKgM3 * GRAVITY_MS2 * (level - zM);
}

/** The one-class reference column with no gas, run for 5 s without steady detection. */
export function restingColumnCase(): CaseDocument {
	const c = oneClassCase();
	c.sparging.superficialGasVelocityMS = 0;
	c.numerics.endTimeS = 5;
	return c;
}

// ------------------------------------------------------------------ dilute limit

/** Slip at the cell centre at height `zM` in the bubbly region of a dilute run, with the local holdup and gas density. */
export function diluteSlip(c: CaseDocument, zM: number): { slip: number; holdup: number; gasDensity: number; sim: HeightSimulation } {
	const sim = runSimulation(createHeightSimulation(c, { detectSteady: false }));
	const m = sim.model;
	const i = Math.floor(zM / m.dz);
	const slip = 0.5 * (m.gasVelocity[i] + m.gasVelocity[i + 1]) - 0.5 * (m.liquidVelocity[i] + m.liquidVelocity[i + 1]);
	return { slip, holdup: 1 - m.liquidFraction[i], gasDensity: m.gasDensity[i], sim };
}

/**
 * Terminal velocities of air bubbles in contaminated water read from the curves of Clift, Grace & Weber
 * (1978), Bubbles, Drops and Particles, Fig. 7.3 — readings from memory, uncertain by about ±15 %; where the
 * reading is a range its midpoint. Pairs of [volume-equivalent diameter m, velocity m/s].
 */
export const CLIFT_GRACE_WEBER_CONTAMINATED: readonly (readonly [number, number])[] = [
	[0.5e-3, 0.06],
	[1e-3, 0.11],
	[2e-3, 0.185],
	[3e-3, 0.23],
	[5e-3, 0.23],
	[10e-3, 0.25]
];

/**
 * A sparse swarm of one bubble size in the 2 m one-class reference column (U_G = 0.2 mm/s), long enough
 * for the slowest bubbles of the readings (0.5 mm, ~0.06 m/s) to fill the lower column.
 */
export function diluteColumnCase(o: { diameterM: number; drag: CaseDocument['closures']['drag']; endTimeS?: number }): CaseDocument {
	const c = oneClassCase();
	c.sparging.superficialGasVelocityMS = 2e-4;
	c.bubbles.diameterM = o.diameterM;
	c.closures.drag = o.drag;
	c.numerics.endTimeS = o.endTimeS ?? 20;
	return c;
}

/**
 * A sparse swarm of 0.5 mm bubbles with Stokes drag in glycerol–water 80 wt % (ρ 1208 kg/m³, μ 0.0609 Pa·s after
 * Cheng 2008): Re ≈ 0.03, well inside the Stokes range; a 0.3 m column with 0.2 m of liquid on 30 cells.
 */
export function diluteStokesCase(): CaseDocument {
	const c = oneClassCase();
	c.geometry.heightM = 0.3;
	c.geometry.clearLiquidLevelM = 0.2;
	c.numerics.cells = 30;
	c.fluids.liquid = { name: 'glycerol–water 80 wt %', densityKgM3: 1208, viscosityPaS: 0.0609, surfaceTensionNM: 0.065 };
	c.closures.drag = 'stokes';
	c.bubbles.diameterM = 5e-4;
	c.sparging.superficialGasVelocityMS = 2e-6;
	c.numerics.endTimeS = 20;
	return c;
}

// ------------------------------------------------------------------ grid study of the reference case

/** The one-class reference case (2 m column, 1.5 m of water, air at 0.05 m/s, 4 mm bubbles) on `cells` cells. */
export function referenceCase(cells: number): CaseDocument {
	const c = oneClassCase();
	c.numerics.cells = cells;
	return c;
}

// ------------------------------------------------------------------ lift

/**
 * Volume-equivalent diameter at which the Tomiyama et al. (2002) lift coefficient (with the Wellek et al.
 * 1966 bubble width) changes sign for air–water, by bisection between 5 and 7 mm at Re = 1000.
 */
export function liftSignChangeDiameterM(reynolds = 1000): number {
	const lift = (d: number) => tomiyamaLiftCoefficient({ diameterM: d, reynolds, ...AIR_WATER });
	let lo = 5e-3;
	let hi = 7e-3;
	for (let k = 0; k < 60; k++) {
		const mid = 0.5 * (lo + hi);
		if (lift(mid) > 0) lo = mid;
		else hi = mid;
	}
	return lo;
}

/** Eötvös number of air–water bubbles of diameter d (reference property set). */
export function airWaterEotvos(diameterM: number): number {
	return eotvosNumber({ diameterM, ...AIR_WATER });
}

// ------------------------------------------------------------------ cross-section

/** Blasius (1913) smooth-pipe friction factor, f = 0.3164 Re^−0.25 (Re < 1e5). */
export function blasiusFrictionFactor(reynolds: number): number {
	return 0.3164 * Math.pow(reynolds, -0.25);
}

/** Colebrook (1939) friction factor of a smooth pipe (zero roughness), by fixed-point iteration. */
export function colebrookFrictionFactor(reynolds: number): number {
	let f = 0.02;
	for (let k = 0; k < 60; k++) f = Math.pow(-2 * Math.log10(2.51 / (reynolds * Math.sqrt(f))), -2);
	return f;
}

/** A cross-section case of single-phase water flow in a pipe (no gas): the cross-section defaults otherwise. */
export function pipeCase(o: { diameterM: number; velocityMS: number; cells: number }): CaseDocument {
	const c = defaultCase('cross-section');
	// no gas: the one-class model, whose pipe-flow numbers the verification page has always shown
	c.bubbles.classes = 'single';
	c.geometry.diameterM = o.diameterM;
	c.sparging.superficialGasVelocityMS = 0;
	c.sparging.superficialLiquidVelocityMS = o.velocityMS;
	c.numerics.cells = o.cells;
	return c;
}

/** Run a cross-section case to steady state (at most `maxSteps`). */
export function runCrossSection(c: CaseDocument, maxSteps = 20000): { sim: Simulation; results: Results } {
	const sim = createCrossSectionSimulation(c);
	for (let k = 0; k < maxSteps; k++) if (sim.step().status !== 'running') break;
	return { sim, results: sim.results() };
}

/**
 * The liquid's axial momentum against the analytic recirculation profile (constant eddy viscosity ν_t,
 * α = 2ᾱ(1 − ξ²), no slip, zero net liquid flow; PHYSICS §7): u(ξ) = u(0)(1 − 4ξ² + 3ξ⁴) with
 * u(0) = ᾱ g R²/(24 ν_t), ξ = r/R. ᾱ = 1e-8 makes the O(ᾱ) difference between the model's constraint
 * ⟨α_l u_l⟩ = 0 and the analytic ⟨u⟩ = 0 negligible (the equations are linear in ᾱ).
 * Returns the profile and its volume-weighted L1 error relative to u(0).
 */
export function recirculationProfile(cells: number): { xi: number[]; velocity: number[]; exact: number[]; error: number } {
	const R = 0.1;
	const nuT = 2e-3;
	const abar = 1e-8;
	const rhoL = 998.2;
	const g = 9.81;
	const n = cells;
	const grid = createRadialGrid({ radiusM: R, cells: n });
	const ul = new Float64Array(n);
	solveAxialMomentum({
		grid,
		dtS: Infinity,
		liquidDensityKgM3: rhoL,
		gasDensityKgM3: 0,
		gravityMS2: g,
		holdup: grid.centresM.map((r) => 2 * abar * (1 - (r / R) ** 2)),
		stressWeight: new Float64Array(n + 1).fill(1),
		faceViscosityPaS: new Float64Array(n + 1).fill(rhoL * nuT),
		wallCoefficientPaSM: (rhoL * nuT) / (0.5 * grid.drM),
		virtualMassCoefficient: new Float64Array(n),
		dragSlope: new Float64Array(n).fill(1e4),
		dragOffset: new Float64Array(n),
		liquidVelocityOld: new Float64Array(n),
		gasVelocityOld: new Float64Array(n),
		superficialLiquidVelocityMS: 0,
		liquidVelocity: ul,
		gasVelocity: new Float64Array(n),
		work: new Float64Array(8 * n)
	});
	const scale = (abar * g * R * R) / (24 * nuT);
	let l1 = 0;
	const xi: number[] = [];
	const velocity: number[] = [];
	const exact: number[] = [];
	for (let i = 0; i < n; i++) {
		const x = grid.centresM[i] / R;
		const e = scale * (1 - 4 * x * x + 3 * x ** 4);
		l1 += Math.abs(ul[i] - e) * grid.volumes[i];
		xi.push(x);
		velocity.push(ul[i] / scale);
		exact.push(e / scale);
	}
	return { xi, velocity, exact, error: l1 / grid.totalVolume / scale };
}

// ------------------------------------------------------------------ bubble classes

/** Air–water batch column, 6 m tall with 3 m of clear liquid (tall enough for the swell at 0.35 m/s), default small + large bubbles. */
export function churnColumnCase(diameterM: number, ugMS: number, edit: (c: CaseDocument) => void = () => {}): CaseDocument {
	const c = defaultCase();
	c.geometry = { heightM: 6, diameterM, clearLiquidLevelM: 3 };
	c.sparging.superficialGasVelocityMS = ugMS;
	c.numerics.endTimeS = 300;
	edit(c);
	return c;
}

/** Mean of Akita & Yoshida (1973) and Hikita et al. (1980) for air–water at the sparger gas density. */
export function churnCorrelationMean(diameterM: number, ugMS: number, gasDensityKgM3: number): { akitaYoshida: number; hikita: number; mean: number } {
	const water = { liquidDensityKgM3: 998.2, liquidViscosityPaS: 1.002e-3, surfaceTensionNM: 0.0727 };
	const akitaYoshida = akitaYoshidaHoldup({ diameterM, superficialGasVelocityMS: ugMS, ...water });
	const hikita = hikitaHoldup({ superficialGasVelocityMS: ugMS, ...water, gasDensityKgM3, gasViscosityPaS: 1.81e-5 });
	return { akitaYoshida, hikita, mean: 0.5 * (akitaYoshida + hikita) };
}

/** Band of the churn-flow holdup check: ±30 %, ±35 % in columns narrower than 0.2 m above 0.25 m/s (Collins wall factor). */
export function churnHoldupBand(diameterM: number, ugMS: number): number {
	return diameterM < 0.2 && ugMS > 0.25 ? 0.35 : 0.3;
}
