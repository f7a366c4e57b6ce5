/**
 * Cross-section (radial) model: a column section far from sparger and surface, axially fully
 * developed, 1-D in the radius r ∈ [0, R], transient to steady state.
 *
 * Unknowns per cell: gas holdup α, axial liquid velocity u_l, axial gas velocity u_g; for the
 * section: G = −dp/dz. Equations (PHYSICS.md §4–§7):
 * - axial momentum of both phases (see `momentum.ts`): liquid with μ_eff = μ_l + Nikuradse mixing
 *   length + Sato bubble-induced viscosity, gas with drag (the height model's drag laws and swarm
 *   factor, K = (3/4) α ρ_l C_D |u_r|/d, i.e. K ∝ α, PHYSICS §1.7) and virtual mass;
 * - radial force balance on the gas: lift + wall lubrication + turbulent dispersion balanced by
 *   drag, giving the radial gas flux α v_g = α (1 − α) (F_L + F_W + F_TD)/K (zero net radial volume
 *   flux, so the radial slip is v_g/(1 − α)); radial pressure gradient and radial inertia are
 *   neglected;
 * - gas continuity in conservative cylindrical form (see `transport.ts`);
 * - section constraints: ⟨α_l u_l⟩ = U_l enforced exactly each step through G, and ⟨α u_g⟩ = U_g
 *   through the section's gas content, relaxed towards it as if the section exchanged the flux
 *   imbalance with a column height H = D: d⟨α⟩/dt = (U_g − ⟨α u_g⟩)/H, with ⟨α u_g⟩ = ū ⟨α⟩ taken
 *   implicitly in ⟨α⟩ (ū the old mean gas velocity), added in proportion to the local holdup (keeps
 *   the profile's shape and α ≥ 0). The radial transport alone conserves the section's gas to
 *   round-off; the only change is this source, which vanishes at steady state.
 *
 * Bubble classes (`bubbles.classes`, PHYSICS §8.8): with `small-large` the gas is two dispersed fields, small and
 * large bubbles, divided as at the sparger of a height profile (`planClasses`: Reilly et al. 1994 transition, the
 * excess gas U_g − U_trans in large bubbles). Each class has its own holdup α_k, axial velocity, drag (the large
 * class: the cap drag with Krishna's wall and acceleration factors, as Krishna and co-workers used it in their
 * Eulerian simulations, from memory), its own Tomiyama lift (C_L < 0 for the large bubbles, so they gather in the
 * core while small bubbles drift to the wall), radial transport and its own flux constraint ⟨α_k u_g,k⟩ = U_g,k. The
 * classes share the liquid, G, the liquid's eddy viscosity (mixing length + Sato's bubble-induced part of every
 * class) and the turbulent dispersion (each class down its own holdup gradient, the one-class form per class). The
 * large class has no wall-lubrication force: Antal et al. (1991) and Tomiyama (1998) describe bubbles of a few
 * millimetres, and the wall's effect on cap bubbles is already their slower rise (Collins' wall factor). With one
 * class every operation is the one-class model's, to the bit.
 *
 * Known behaviour: the mixing-length viscosity vanishes with the shear on the axis, so there only the
 * bubble-induced part remains and the core profiles are peaky; with C_L < 0 and no wall force an
 * inverted circulation (down in the core) is also a steady solution, and which one a run reaches
 * depends on the first push (wall lubrication gives the usual one). Without turbulent dispersion
 * nothing spreads the gas and a run usually fails on the holdup limit.
 *
 * Wall treatment: a wall function (log law, κ = 0.41, E = 9.793, switching to the viscous sublayer
 * below y⁺ ≈ 11.5) at the first cell centre; the near-wall layer is not resolved.
 *
 * Time stepping: holdup transport and both momentum equations implicit; closures (viscosity,
 * forces, the drag linearisation) lagged from the old step. Δt from a Courant number on the radial
 * drift velocity of every class, capped at cfl·R/u_t of the fastest class.
 *
 * Residuals (dimensionless, after each step; ⟨·⟩ the area average over the section):
 *   gasMassImbalance   |⟨α u_g⟩ − U_g| / U_g
 *   liquidFluxError    |⟨α_l u_l⟩ − U_l| / max(|U_l|, U_g, 1 mm/s); round-off by construction
 *   holdupChangeRate   max |∂α/∂t| × 1 s (as in the height model)
 *   momentumImbalance  Σ V |α_l ρ_l ∂u_l/∂t + α ρ_g ∂u_g/∂t| / Σ V (|α_l (G − ρ_l g)| + |α (G − ρ_g g)|)
 * Steady: all four at or below the case's steady tolerance throughout 2 R/u_t of simulated time.
 */
import type { CaseDocument } from '../case.js';
import type { GasClassConfig } from '../height/config.js';
import type { Checkpoint, DesignNumber, Residuals, Results, RunStatus, Simulation, SimulationState, Snapshot, StepStatus } from '../types.js';
import { dragCoefficient, eotvosNumber, terminalVelocity } from '../closures/drag.js';
import { swarmDragFactor } from '../closures/swarm.js';
import { virtualMassCoefficient } from '../closures/virtual-mass.js';
import { tomiyamaLiftFromWidthEotvos, tomiyamaWidthEotvos } from '../closures/lift.js';
import { classFieldSuffix, planClasses } from '../height/classes.js';
import { wallLubricationForce } from '../closures/wall-lubrication.js';
import { dispersionDiffusivityM2S, radialDispersionForce } from '../closures/dispersion.js';
import { logLawWallFunction, nikuradseMixingLengthM, satoViscosityPaS, turbulentKineticEnergyM2S2 } from '../closures/turbulence.js';
import { bubbleDiameter, gasMassFlux, spargerGasDensityAtRest } from '../derived.js';
import { GRAVITY_MS2 } from '../fluids.js';
import { canContinueCheckpoint, SOLVER_VERSION } from '../version.js';
import { createRadialGrid, sectionAverage, sectionAverageProduct, type RadialGrid } from './grid.js';
import { solveAxialMomentum } from './momentum.js';
import { transportHoldup } from './transport.js';

export { createRadialGrid, sectionAverage, sectionAverageProduct, solveTridiagonal } from './grid.js';
export type { RadialGrid } from './grid.js';
export { solveAxialMomentum } from './momentum.js';
export { transportHoldup } from './transport.js';

/** Version written into checkpoints: the one solver version shared with the height-profile model. */
export const CROSS_SECTION_MODEL_VERSION = SOLVER_VERSION;
/** Height of the column slice that exchanges the gas-flux imbalance, in column diameters. */
export const FLUX_RELAXATION_HEIGHT_DIAMETERS = 1;
/** Holdup above which the bubbly closures are meaningless: a run that reaches it fails. */
export const MAX_HOLDUP = 0.8;
/** Residual ids, in the order kept in a checkpoint. */
export const CROSS_SECTION_RESIDUALS = ['gasMassImbalance', 'liquidFluxError', 'holdupChangeRate', 'momentumImbalance'] as const;

/**
 * One bubble class of the section (PHYSICS §8.8): the one size of the one-class model (id `gas`), or small or large
 * bubbles, as the height profile's class with what the radial model needs besides.
 */
export interface CrossSectionClass extends Omit<GasClassConfig, 'inflowShare'> {
	eotvos: number;
	/** Eötvös number of the bubble width (Tomiyama's lift) */
	widthEotvos: number;
	/** rise velocity in still liquid with the class's own drag, m/s */
	terminalVelocityMS: number;
	terminalReynolds: number;
	/** the class's share of the superficial gas velocity, m/s */
	superficialGasVelocityMS: number;
	/**
	 * whether the case's wall-lubrication force acts on the class: not on cap bubbles, since Antal et al. (1991) and
	 * Tomiyama (1998) describe bubbles of a few millimetres and the wall's effect on caps is their slower rise
	 * (Collins' wall factor in their drag)
	 */
	wallLubrication: boolean;
}

/** The numbers the model uses, resolved from a case once. SI units. */
export interface CrossSectionParameters {
	radiusM: number;
	columnDiameterM: number;
	cells: number;
	liquidDensityKgM3: number;
	liquidViscosityPaS: number;
	surfaceTensionNM: number;
	gasDensityKgM3: number;
	/** the (small) bubbles: the first class */
	bubbleDiameterM: number;
	eotvos: number;
	terminalVelocityMS: number;
	terminalReynolds: number;
	superficialGasVelocityMS: number;
	superficialLiquidVelocityMS: number;
	gravityMS2: number;
	/** R/u_t of the first class: the time a bubble takes to rise one radius; sets the steady window */
	referenceTimeS: number;
	/** the bubble classes: one, or small and large bubbles divided as at the sparger (`planClasses`) */
	classes: CrossSectionClass[];
}

export function crossSectionParameters(c: CaseDocument): CrossSectionParameters {
	const g = GRAVITY_MS2;
	const rl = c.fluids.liquid.densityKgM3;
	const mul = c.fluids.liquid.viscosityPaS;
	const sigma = c.fluids.liquid.surfaceTensionNM;
	// gas conditions of the section: those at the sparger with the column at rest, the basis on which the
	// analyst quotes U_g (a 'normal' basis is converted by mass flux), the same as the height model's inlet
	const rg = spargerGasDensityAtRest(c);
	const ugs = c.sparging.gasVelocityBasis === 'sparger' ? c.sparging.superficialGasVelocityMS : gasMassFlux(c) / rg;
	const dCol = c.geometry.diameterM;
	const d = bubbleDiameter(c);
	const ut = terminalVelocity({ law: c.closures.drag, diameterM: d, liquidDensityKgM3: rl, gasDensityKgM3: rg, liquidViscosityPaS: mul, surfaceTensionNM: sigma, gravityMS2: g });
	const eo = eotvosNumber({ diameterM: d, liquidDensityKgM3: rl, gasDensityKgM3: rg, surfaceTensionNM: sigma, gravityMS2: g });
	const sizeOf = (dk: number) => ({ liquidDensityKgM3: rl, gasDensityKgM3: rg, surfaceTensionNM: sigma, gravityMS2: g, diameterM: dk });
	const first: CrossSectionClass = {
		id: 'gas',
		label: 'Bubbles',
		diameterM: d,
		drag: c.closures.drag,
		swarm: c.closures.swarm,
		dragFactor: 1,
		eotvos: eo,
		widthEotvos: tomiyamaWidthEotvos(sizeOf(d)),
		terminalVelocityMS: ut,
		terminalReynolds: (rl * ut * d) / mul,
		superficialGasVelocityMS: ugs,
		wallLubrication: true
	};
	let classes: CrossSectionClass[] = [first];
	if (c.bubbles.classes === 'small-large') {
		// the same division of the gas as at the sparger of a height profile: the transition's share in small bubbles
		const plan = planClasses(c);
		classes = plan.classes.map((k, i) => {
			if (i === 0) return { ...first, id: k.id, label: k.label, superficialGasVelocityMS: ugs * k.inflowShare };
			const dk = k.diameterM;
			const cap = k.drag === 'spherical-cap';
			// a cap bubble's rise velocity from its drag: (4/3) g d Δρ = F C_D ρ_l u², C_D = 8/3 (Eo → ∞, Tomiyama et al. 1998)
			const utk = k.drag === 'spherical-cap' ? Math.sqrt(((4 / 3) * g * dk * (rl - rg)) / ((8 / 3) * k.dragFactor * rl)) : terminalVelocity({ ...sizeOf(dk), law: k.drag, liquidViscosityPaS: mul });
			return {
				id: k.id,
				label: k.label,
				diameterM: dk,
				drag: k.drag,
				swarm: k.swarm,
				dragFactor: k.dragFactor,
				eotvos: eotvosNumber(sizeOf(dk)),
				widthEotvos: tomiyamaWidthEotvos(sizeOf(dk)),
				terminalVelocityMS: utk,
				terminalReynolds: (rl * utk * dk) / mul,
				superficialGasVelocityMS: ugs * k.inflowShare,
				wallLubrication: !cap
			};
		});
	}
	return {
		radiusM: dCol / 2,
		columnDiameterM: dCol,
		cells: c.numerics.cells,
		liquidDensityKgM3: rl,
		liquidViscosityPaS: mul,
		surfaceTensionNM: sigma,
		gasDensityKgM3: rg,
		bubbleDiameterM: d,
		eotvos: eo,
		terminalVelocityMS: ut,
		terminalReynolds: (rl * ut * d) / mul,
		superficialGasVelocityMS: ugs,
		superficialLiquidVelocityMS: c.sparging.superficialLiquidVelocityMS,
		gravityMS2: g,
		referenceTimeS: dCol / 2 / ut,
		classes
	};
}

/** Radial profiles of the forces on the gas (summed over the classes) and the other derived fields, at cell centres. */
interface Diagnostics {
	effectiveViscosity: Float64Array;
	liftForce: Float64Array;
	wallLubricationForce: Float64Array;
	dispersionForce: Float64Array;
	dragForce: Float64Array;
}

/** The state and the lagged closures of one bubble class. */
interface ClassState {
	spec: CrossSectionClass;
	/** field-name suffix: `Small`, `Large` */
	suffix: string;
	alpha: Float64Array;
	ug: Float64Array;
	alphaN: Float64Array;
	ugN: Float64Array;
	slip: Float64Array;
	dragSecant: Float64Array;
	dragSlope: Float64Array;
	dragOffset: Float64Array;
	cvm: Float64Array;
	faceDrift: Float64Array;
	faceDiff: Float64Array;
}

export function createCrossSectionSimulation(caseDoc: CaseDocument): Simulation {
	const c = caseDoc;
	const p = crossSectionParameters(c);
	const grid: RadialGrid = createRadialGrid({ radiusM: p.radiusM, cells: p.cells });
	const n = grid.cells;
	const cl = c.closures;
	const rl = p.liquidDensityKgM3;
	const mul = p.liquidViscosityPaS;
	const R = p.radiusM;
	const dr = grid.drM;
	const cfl = c.numerics.cflNumber;
	const tol = c.numerics.steadyTolerance;
	const endTimeS = c.numerics.endTimeS;
	const relaxHeightM = FLUX_RELAXATION_HEIGHT_DIAMETERS * p.columnDiameterM;
	const steadyWindowS = 2 * p.referenceTimeS;
	const nc = p.classes.length;
	// the fastest class rises one radius in the shortest time
	let fastest = p.terminalVelocityMS;
	for (const k of p.classes) fastest = Math.max(fastest, k.terminalVelocityMS);
	const dtMaxS = cfl * (R / fastest);

	// state: the total holdup and, for one class, the class's own arrays are the same
	const alpha = new Float64Array(n);
	const ul = new Float64Array(n);
	let pressureGradient = 0; // G = −dp/dz, Pa/m
	const st: SimulationState = { step: 0, timeS: 0, dtS: 0, status: 'running' };
	let steadySinceS = -1;
	const res: Residuals = { gasMassImbalance: 0, liquidFluxError: 0, holdupChangeRate: 0, momentumImbalance: 0 };

	// work arrays, allocated once
	const alphaN = new Float64Array(n);
	const ulN = new Float64Array(n);
	const faceMu = new Float64Array(n + 1);
	const faceWeight = new Float64Array(n + 1);
	const faceFlux = new Float64Array(n + 1);
	const work = new Float64Array(8 * n);
	let wallCoefficient = 0;
	const cls: ClassState[] = p.classes.map((spec) => ({
		spec,
		suffix: classFieldSuffix(spec.id),
		alpha: nc === 1 ? alpha : new Float64Array(n),
		ug: new Float64Array(n),
		alphaN: nc === 1 ? alphaN : new Float64Array(n),
		ugN: new Float64Array(n),
		slip: new Float64Array(n),
		dragSecant: new Float64Array(n),
		dragSlope: new Float64Array(n),
		dragOffset: new Float64Array(n),
		cvm: new Float64Array(n),
		faceDrift: new Float64Array(n + 1),
		faceDiff: new Float64Array(n + 1)
	}));
	const momentumClasses = cls.map((k) => ({ holdup: k.alphaN, virtualMassCoefficient: k.cvm, dragSlope: k.dragSlope, dragOffset: k.dragOffset, gasVelocityOld: k.ug, gasVelocity: k.ugN }));

	// initial state: uniform holdup of each class from its single-bubble slip, uniform liquid velocity
	{
		let a0 = 0;
		for (const k of cls) {
			const ugk = k.spec.superficialGasVelocityMS;
			const ak = ugk > 0 ? Math.min(ugk / (Math.max(p.superficialLiquidVelocityMS, 0) + k.spec.terminalVelocityMS), 0.3) : 0;
			k.alpha.fill(ak);
			a0 += ak;
		}
		const u0 = p.superficialLiquidVelocityMS / (1 - a0);
		alpha.fill(a0);
		ul.fill(u0);
		for (const k of cls) k.ug.fill(u0 + k.spec.terminalVelocityMS);
		pressureGradient = (rl * (1 - a0) + p.gasDensityKgM3 * a0) * p.gravityMS2;
	}

	/** C_D·|s|·(3/4)ρ_l/d of class k: drag per unit gas volume and unit slip at slip s ≥ 0 and (total) holdup a. */
	function secant(k: CrossSectionClass, s: number, a: number): number {
		const d = k.diameterM;
		const re = (rl * s * d) / mul;
		const single = k.drag === 'spherical-cap' ? 8 / 3 : dragCoefficient({ law: k.drag, reynolds: re, eotvos: k.eotvos, holdup: a });
		const cd = single * swarmDragFactor({ model: k.swarm, holdup: a, terminalReynolds: k.terminalReynolds }) * k.dragFactor;
		return (0.75 * rl * cd * s) / d;
	}

	function liftCoefficient(k: CrossSectionClass, s: number): number {
		if (cl.lift === 'none') return 0;
		if (cl.lift === 'constant') return cl.liftCoefficient;
		return tomiyamaLiftFromWidthEotvos(k.widthEotvos, (rl * Math.abs(s) * k.diameterM) / mul);
	}

	function wallForcePerGas(k: CrossSectionClass, s: number, y: number): number {
		if (!k.wallLubrication) return 0;
		return wallLubricationForce({
			model: cl.wallLubrication,
			holdup: 1,
			liquidDensityKgM3: rl,
			slipVelocityMS: s,
			diameterM: k.diameterM,
			wallDistanceM: y,
			columnDiameterM: p.columnDiameterM,
			reynolds: (rl * Math.abs(s) * k.diameterM) / mul,
			eotvos: k.eotvos
		});
	}

	const sato = cl.bubbleInducedTurbulence === 'sato';

	/**
	 * Sato's bubble-induced viscosity of all classes, Pa·s, with each class's holdup and slip the mean of cells iL and
	 * iR (a face between them, or a cell with iL = iR: ½(x + x) = x exactly).
	 */
	function bubbleInducedViscosity(iL: number, iR: number): number {
		if (!sato) return 0;
		let mu = 0;
		for (let m = 0; m < nc; m++) {
			const k = cls[m];
			mu += satoViscosityPaS({ liquidDensityKgM3: rl, holdup: 0.5 * (k.alpha[iL] + k.alpha[iR]), diameterM: k.spec.diameterM, slipVelocityMS: 0.5 * (k.slip[iL] + k.slip[iR]) });
		}
		return mu;
	}

	/** Turbulent kinetic energy: the shear part and the pseudo-turbulence of every class (holdup and slip as above). */
	function kineticEnergy(muSI: number, du: number, iL: number, iR: number): number {
		let kt = 0;
		for (let m = 0; m < nc; m++) {
			const k = cls[m];
			const holdup = 0.5 * (k.alpha[iL] + k.alpha[iR]);
			const slipVelocityMS = 0.5 * (k.slip[iL] + k.slip[iR]);
			kt += m === 0 ? turbulentKineticEnergyM2S2({ shearEddyViscosityM2S: muSI / rl, shearRateS: du, holdup, slipVelocityMS }) : turbulentKineticEnergyM2S2({ shearEddyViscosityM2S: 0, shearRateS: 0, holdup, slipVelocityMS });
		}
		return kt;
	}

	/** Lagged closures from the current state: drag linearisation, face viscosity, drift and diffusivity, wall coefficient. */
	function evaluateClosures(): void {
		for (const k of cls) {
			for (let i = 0; i < n; i++) {
				const s = k.ug[i] - ul[i];
				k.slip[i] = s;
				// drag per gas volume f(s) = k(s) s, odd in s; its slope by central differences about |s|
				const sa = Math.max(Math.abs(s), 1e-6);
				const kk = secant(k.spec, sa, alpha[i]);
				const eps = 1e-4;
				const fp = (secant(k.spec, sa * (1 + eps), alpha[i]) * sa * (1 + eps) - secant(k.spec, sa * (1 - eps), alpha[i]) * sa * (1 - eps)) / (2 * eps * sa);
				// the secant as a floor keeps the linearisation diagonally dominant where C_D falls steeply
				const slope = Math.max(fp, kk);
				k.dragSecant[i] = kk;
				k.dragSlope[i] = slope;
				k.dragOffset[i] = (s < 0 ? -1 : 1) * (kk * sa - slope * sa);
			}
		}
		for (let j = 1; j < n; j++) {
			const aF = 0.5 * (alpha[j - 1] + alpha[j]);
			const du = (ul[j] - ul[j - 1]) / dr;
			const y = R - grid.facesM[j];
			const l = nikuradseMixingLengthM({ radiusM: R, wallDistanceM: y });
			const muSI = rl * l * l * Math.abs(du);
			const muBI = bubbleInducedViscosity(j - 1, j);
			faceMu[j] = mul + muSI + muBI;
			faceWeight[j] = 1 - aF;
			const kinetic = cl.turbulentDispersion === 'lopez-de-bertodano' ? kineticEnergy(muSI, du, j - 1, j) : 0;
			for (const k of cls) {
				const sF = 0.5 * (k.slip[j - 1] + k.slip[j]);
				const kF = 0.5 * (k.dragSecant[j - 1] + k.dragSecant[j]);
				const fL = -liftCoefficient(k.spec, sF) * rl * sF * du;
				const fW = -wallForcePerGas(k.spec, sF, y);
				k.faceDrift[j] = ((1 - aF) * (fL + fW)) / kF;
				k.faceDiff[j] = dispersionDiffusivityM2S({
					model: cl.turbulentDispersion,
					coefficient: cl.turbulentDispersionCoefficient,
					holdup: aF,
					liquidDensityKgM3: rl,
					eddyViscosityM2S: (muSI + muBI) / rl,
					turbulentKineticEnergyM2S2: kinetic,
					dragPerGasVolume: kF
				});
			}
		}
		for (const k of cls) {
			k.faceDrift[0] = 0;
			k.faceDrift[n] = 0;
			k.faceDiff[0] = 0;
			k.faceDiff[n] = 0;
		}
		faceMu[0] = mul;
		faceMu[n] = mul;
		faceWeight[0] = 1;
		faceWeight[n] = 1;
		wallCoefficient = logLawWallFunction({ speedMS: ul[n - 1], wallDistanceM: 0.5 * dr, densityKgM3: rl, viscosityPaS: mul }).coefficientPaSM;
	}

	function fail(message: string): StepStatus {
		st.status = 'failed';
		st.message = message;
		return { status: 'failed', message };
	}

	function describeCell(i: number): string {
		return `cell ${i + 1} of ${n} (r = ${(grid.centresM[i] * 1000).toPrecision(4)} mm)`;
	}

	/** `of the large bubbles` for a class of several, nothing for the one-class model. */
	function ofClass(k: ClassState): string {
		return nc === 1 ? '' : ` of the ${k.spec.label.toLowerCase()}`;
	}

	function step(): StepStatus {
		if (st.status !== 'running') return { status: st.status, message: st.message };
		evaluateClosures();
		let maxDrift = 0;
		for (const k of cls) for (let j = 1; j < n; j++) maxDrift = Math.max(maxDrift, Math.abs(k.faceDrift[j]));
		let dt = maxDrift > 0 ? Math.min(dtMaxS, (cfl * dr) / maxDrift) : dtMaxS;
		const remaining = endTimeS - st.timeS;
		let lands = false;
		if (dt >= remaining) {
			dt = remaining;
			lands = true;
		}

		for (const k of cls) {
			const ugk = k.spec.superficialGasVelocityMS;
			// 1. radial gas transport of the class, conservative
			transportHoldup({ grid, dtS: dt, holdupOld: k.alpha, faceDriftMS: k.faceDrift, faceDiffusivityM2S: k.faceDiff, holdup: k.alphaN, faceFlux, work });

			// 2. the section's content of the class relaxes towards its gas-flux constraint, implicitly in ⟨α_k⟩ with the
			//    old mean velocity ū_k = ⟨α_k u_g,k⟩/⟨α_k⟩: ⟨α_k⟩' = ⟨α_k⟩* + Δt (U_g,k − ū_k ⟨α_k⟩')/H
			const abarOld = sectionAverage(grid, k.alpha);
			const ubar = abarOld > 0 ? sectionAverageProduct(grid, k.alpha, k.ug) / abarOld : k.spec.terminalVelocityMS + p.superficialLiquidVelocityMS;
			let q = 0;
			for (let i = 0; i < n; i++) q += k.alphaN[i] * grid.volumes[i];
			const abarStar = q / grid.totalVolume;
			const abarNew = (abarStar + (dt * ugk) / relaxHeightM) / (1 + (dt * Math.max(ubar, 0)) / relaxHeightM);
			if (abarStar > 1e-12) {
				const factor = abarNew / abarStar;
				for (let i = 0; i < n; i++) k.alphaN[i] *= factor;
			} else if (abarNew > 0) {
				for (let i = 0; i < n; i++) k.alphaN[i] += abarNew;
			}
			for (let i = 0; i < n; i++) {
				const a = k.alphaN[i];
				if (!Number.isFinite(a) || a < -1e-12 || a > MAX_HOLDUP) {
					return fail(`Gas holdup${ofClass(k)} ${Number.isFinite(a) ? a.toPrecision(4) : 'is not a number'} in ${describeCell(i)} at t = ${st.timeS.toFixed(4)} s (allowed 0 to ${MAX_HOLDUP})`);
				}
			}
		}
		// α = Σ α_k (with one class the class's array is α itself)
		if (nc > 1) {
			alphaN.fill(0);
			for (const k of cls) for (let i = 0; i < n; i++) alphaN[i] += k.alphaN[i];
		}
		for (let i = 0; i < n; i++) {
			if (alphaN[i] > MAX_HOLDUP) {
				// with classes the usual cause is the large bubbles gathering on the axis (README, cross-section bubble classes)
				const split = nc > 1 ? `; ${cls.map((k) => `${k.spec.label.toLowerCase()} ${k.alphaN[i].toPrecision(3)}`).join(', ')}: the large bubbles gather on the axis faster than the turbulence spreads them` : '';
				return fail(`Gas holdup ${alphaN[i].toPrecision(4)} in ${describeCell(i)} at t = ${st.timeS.toFixed(4)} s (allowed 0 to ${MAX_HOLDUP})${split}`);
			}
		}

		// 3. axial momentum with the new holdup
		for (const k of cls) for (let i = 0; i < n; i++) k.cvm[i] = virtualMassCoefficient({ model: cl.virtualMass, holdup: k.alphaN[i], constant: cl.virtualMassCoefficient });
		for (let j = 1; j < n; j++) faceWeight[j] = 1 - 0.5 * (alphaN[j - 1] + alphaN[j]);
		const G = solveAxialMomentum({
			grid,
			dtS: dt,
			liquidDensityKgM3: rl,
			gasDensityKgM3: p.gasDensityKgM3,
			gravityMS2: p.gravityMS2,
			holdup: alphaN,
			stressWeight: faceWeight,
			faceViscosityPaS: faceMu,
			wallCoefficientPaSM: wallCoefficient,
			virtualMassCoefficient: cls[0].cvm,
			dragSlope: cls[0].dragSlope,
			dragOffset: cls[0].dragOffset,
			liquidVelocityOld: ul,
			gasVelocityOld: cls[0].ug,
			superficialLiquidVelocityMS: p.superficialLiquidVelocityMS,
			liquidVelocity: ulN,
			gasVelocity: cls[0].ugN,
			work,
			classes: momentumClasses
		});
		for (let i = 0; i < n; i++) {
			if (!Number.isFinite(ulN[i]) || Math.abs(ulN[i]) > 50) return fail(`Liquid velocity ${ulN[i].toPrecision(4)} m/s in ${describeCell(i)} at t = ${st.timeS.toFixed(4)} s`);
			for (const k of cls) {
				const u = k.ugN[i];
				if (!Number.isFinite(u) || Math.abs(u) > 50) return fail(`Gas velocity${ofClass(k)} ${u.toPrecision(4)} m/s in ${describeCell(i)} at t = ${st.timeS.toFixed(4)} s`);
			}
		}
		if (!Number.isFinite(G)) return fail(`Axial pressure gradient is not a number at t = ${st.timeS.toFixed(4)} s`);

		// 4. residuals
		const abar = sectionAverage(grid, alphaN);
		let maxDa = 0;
		let imb = 0;
		let ref = 0;
		for (let i = 0; i < n; i++) {
			const a = alphaN[i];
			maxDa = Math.max(maxDa, Math.abs(a - alpha[i]));
			const v = grid.volumes[i];
			let inertia = (1 - a) * rl * (ulN[i] - ul[i]);
			for (const k of cls) inertia += k.alphaN[i] * p.gasDensityKgM3 * (k.ugN[i] - k.ug[i]);
			imb += v * Math.abs(inertia / dt);
			ref += v * (Math.abs((1 - a) * (G - rl * p.gravityMS2)) + Math.abs(a * (G - p.gasDensityKgM3 * p.gravityMS2)));
		}
		const ug0 = p.superficialGasVelocityMS;
		// each class meets its own share of the gas flux
		let fluxError = 0;
		for (const k of cls) fluxError += Math.abs(sectionAverageProduct(grid, k.alphaN, k.ugN) - k.spec.superficialGasVelocityMS);
		res.gasMassImbalance = ug0 > 0 ? fluxError / ug0 : abar;
		let ql = 0;
		for (let i = 0; i < n; i++) ql += (1 - alphaN[i]) * ulN[i] * grid.volumes[i];
		res.liquidFluxError = Math.abs(ql / grid.totalVolume - p.superficialLiquidVelocityMS) / Math.max(Math.abs(p.superficialLiquidVelocityMS), ug0, 1e-3);
		// as in the height model: the largest local |∂α/∂t| times 1 s
		res.holdupChangeRate = maxDa / dt;
		res.momentumImbalance = ref > 0 ? imb / ref : 0;

		// 5. commit
		for (const k of cls) {
			if (nc > 1) k.alpha.set(k.alphaN);
			k.ug.set(k.ugN);
		}
		alpha.set(alphaN);
		ul.set(ulN);
		pressureGradient = G;
		st.step += 1;
		st.timeS = lands ? endTimeS : st.timeS + dt;
		st.dtS = dt;

		const worst = Math.max(res.gasMassImbalance, res.liquidFluxError, res.holdupChangeRate, res.momentumImbalance);
		if (worst < tol) {
			if (steadySinceS < 0) steadySinceS = st.timeS;
			if (st.timeS - steadySinceS >= steadyWindowS) {
				st.status = 'converged';
				return { status: 'converged' };
			}
		} else steadySinceS = -1;
		if (lands) {
			st.status = 'finished';
			return { status: 'finished' };
		}
		return { status: 'running' };
	}

	/** Holdup-weighted mean gas velocity Σ α_k u_g,k / α (the class's own velocity for one class). */
	function meanGasVelocity(): Float64Array {
		if (nc === 1) return Float64Array.from(cls[0].ug);
		const u = new Float64Array(n);
		for (let i = 0; i < n; i++) {
			let q = 0;
			let w = 0;
			for (const k of cls) {
				q += k.alpha[i] * k.ug[i];
				w += k.alpha[i];
			}
			u[i] = w > 0 ? q / w : cls[0].ug[i];
		}
		return u;
	}

	function diagnostics(): Diagnostics {
		evaluateClosures();
		const out: Diagnostics = {
			effectiveViscosity: new Float64Array(n),
			liftForce: new Float64Array(n),
			wallLubricationForce: new Float64Array(n),
			dispersionForce: new Float64Array(n),
			dragForce: new Float64Array(n)
		};
		// radial drag = −K × radial slip, from the face fluxes the next step would start from
		const flux = cls.map(() => new Float64Array(n + 1));
		cls.forEach((k, m) => {
			for (let j = 1; j < n; j++) {
				const w = k.faceDrift[j];
				flux[m][j] = Math.max(w, 0) * k.alpha[j - 1] + Math.min(w, 0) * k.alpha[j] - (k.faceDiff[j] * (k.alpha[j] - k.alpha[j - 1])) / dr;
			}
		});
		for (let i = 0; i < n; i++) {
			const a = alpha[i];
			// central differences, with a mirror cell across the axis and one-sided at the wall cell
			const iL = i > 0 ? i - 1 : 0;
			const iR = i < n - 1 ? i + 1 : i;
			const span = (iR - iL + (i === 0 ? 1 : 0)) * dr;
			const du = (ul[iR] - ul[iL]) / span;
			const y = R - grid.centresM[i];
			const l = nikuradseMixingLengthM({ radiusM: R, wallDistanceM: y });
			const muSI = rl * l * l * Math.abs(du);
			const muBI = bubbleInducedViscosity(i, i);
			out.effectiveViscosity[i] = mul + muSI + muBI;
			const kinetic = kineticEnergy(muSI, du, i, i);
			cls.forEach((k, m) => {
				const ak = k.alpha[i];
				const s = k.slip[i];
				const da = (k.alpha[iR] - k.alpha[iL]) / span;
				out.liftForce[i] += -liftCoefficient(k.spec, s) * ak * rl * s * du;
				out.wallLubricationForce[i] += -ak * wallForcePerGas(k.spec, s, y);
				out.dispersionForce[i] += radialDispersionForce({
					model: cl.turbulentDispersion,
					coefficient: cl.turbulentDispersionCoefficient,
					holdup: nc === 1 ? a : ak,
					liquidDensityKgM3: rl,
					eddyViscosityM2S: (muSI + muBI) / rl,
					turbulentKineticEnergyM2S2: kinetic,
					dragPerGasVolume: k.dragSecant[i],
					holdupGradientPerM: da
				});
				const fc = 0.5 * (flux[m][i] + flux[m][i + 1]);
				out.dragForce[i] += (-k.dragSecant[i] * fc) / Math.max(1 - a, 1e-12);
			});
		}
		return out;
	}

	function snapshot(): Snapshot {
		const dg = diagnostics();
		const fields: Record<string, Float64Array> = {
			holdup: Float64Array.from(alpha),
			liquidVelocity: Float64Array.from(ul),
			gasVelocity: meanGasVelocity(),
			...dg
		};
		if (nc > 1) {
			const sauter = new Float64Array(n);
			for (let i = 0; i < n; i++) {
				// d32 = Σ α_k / Σ (α_k/d_k); the small bubbles' size where there is no gas
				let inv = 0;
				for (const k of cls) inv += k.alpha[i] / k.spec.diameterM;
				sauter[i] = inv > 0 ? alpha[i] / inv : cls[0].spec.diameterM;
			}
			fields.sauterDiameter = sauter;
			for (const k of cls) {
				fields[`holdup${k.suffix}`] = Float64Array.from(k.alpha);
				fields[`gasVelocity${k.suffix}`] = Float64Array.from(k.ug);
			}
		}
		return { step: st.step, timeS: st.timeS, x: Float64Array.from(grid.centresM), fields };
	}

	/** Holdup peak of a profile: 1 wall-peaked, 0 core-peaked, NaN flat or empty, with its label. */
	function peakOf(a: Float64Array, what: string): DesignNumber {
		const abar = sectionAverage(grid, a);
		let imax = 0;
		let amin = a[0];
		for (let i = 1; i < n; i++) {
			if (a[i] > a[imax]) imax = i;
			amin = Math.min(amin, a[i]);
		}
		// a profile flat to 1e-6 of its mean has no peak worth naming
		const hasPeak = abar > 0 && a[imax] - amin > 1e-6 * abar;
		const wallPeak = grid.centresM[imax] / R > 0.5;
		return {
			value: hasPeak ? (wallPeak ? 1 : 0) : Number.NaN,
			unit: '1',
			label: hasPeak ? `${what}: ${wallPeak ? 'wall-peaked' : 'core-peaked'}` : abar > 0 ? `${what}: none (flat profile)` : `${what}: no gas`
		};
	}

	function designNumbers(): Record<string, DesignNumber> {
		const abar = sectionAverage(grid, alpha);
		// u = a + b r² through the two cells nearest the axis
		const uc = n > 1 ? (9 * ul[0] - ul[1]) / 8 : ul[0];
		let reversal = Number.NaN;
		let umax = 0;
		for (let i = 0; i < n; i++) umax = Math.max(umax, Math.abs(ul[i]));
		// a liquid at rest (to round-off) has no reversal, only sign noise
		for (let i = 0; umax > 1e-9 && i < n - 1; i++) {
			if (ul[i] !== 0 && ul[i] * ul[i + 1] <= 0) {
				reversal = (grid.centresM[i] + (dr * ul[i]) / (ul[i] - ul[i + 1])) / R;
				break;
			}
		}
		const design: Record<string, DesignNumber> = {
			sectionHoldup: { value: abar, unit: '1', label: 'Section-average gas holdup' },
			centrelineLiquidVelocityMS: { value: uc, unit: 'm/s', label: 'Centreline liquid velocity' },
			reversalRadiusRatio: {
				value: reversal,
				unit: '1',
				label: Number.isNaN(reversal) ? 'Liquid flow reversal radius r/R: no reversal' : 'Liquid flow reversal radius r/R'
			},
			peakLocation: peakOf(alpha, 'Holdup peak'),
			axialPressureGradientPaM: { value: -pressureGradient, unit: 'Pa/m', label: 'Axial pressure gradient dp/dz' }
		};
		if (nc > 1) {
			for (const k of cls) {
				const what = k.spec.label.toLowerCase();
				design[`sectionHoldup${k.suffix}`] = { value: sectionAverage(grid, k.alpha), unit: '1', label: `Section-average holdup of the ${what}` };
				design[`diameter${k.suffix}M`] = { value: k.spec.diameterM, unit: 'm', label: `Diameter of the ${what}` };
				design[`peakLocation${k.suffix}`] = peakOf(k.alpha, `Holdup peak of the ${what}`);
			}
			design.largeGasShare = { value: cls[1].spec.superficialGasVelocityMS / Math.max(p.superficialGasVelocityMS, 1e-300), unit: '1', label: 'Share of the gas in large bubbles' };
		}
		return design;
	}

	const sim: Simulation = {
		caseDoc,
		get state() {
			return st;
		},
		step,
		residuals: () => ({ ...res }),
		snapshot,
		checkpoint(): Checkpoint {
			const data: Checkpoint['data'] = {
				holdup: Float64Array.from(alpha),
				liquidVelocity: Float64Array.from(ul),
				gasVelocity: Float64Array.from(cls[0].ug),
				pressureGradientPaM: pressureGradient,
				dtS: st.dtS,
				steadySinceS,
				status: st.status,
				message: st.message ?? '',
				residuals: CROSS_SECTION_RESIDUALS.map((k) => res[k])
			};
			if (nc > 1) {
				for (const k of cls) {
					data[`holdup${k.suffix}`] = Float64Array.from(k.alpha);
					data[`gasVelocity${k.suffix}`] = Float64Array.from(k.ug);
				}
			}
			return { kind: 'cross-section', solverVersion: CROSS_SECTION_MODEL_VERSION, step: st.step, timeS: st.timeS, data };
		},
		restore(cp: Checkpoint): void {
			if (cp.kind !== 'cross-section') throw new Error(`A ${cp.kind} checkpoint cannot restore a cross-section run`);
			// continuing bit-identically needs the very same numerics
			if (!canContinueCheckpoint(cp.solverVersion, nc === 1, false, 'cross-section')) throw new Error(`Checkpoint of solver ${cp.solverVersion} cannot continue with solver ${SOLVER_VERSION}`);
			const dd = cp.data;
			const arr = (key: string): Float64Array => {
				const raw: unknown = dd[key];
				let v: Float64Array;
				if (raw instanceof Float64Array) v = raw;
				else if (Array.isArray(raw)) v = Float64Array.from(raw as number[]);
				else if (raw instanceof Uint8Array && raw.byteLength % 8 === 0) {
					// a msgpack decoder without typed-array support hands back the raw bytes
					v = new Float64Array(raw.buffer.slice(raw.byteOffset, raw.byteOffset + raw.byteLength));
				} else throw new Error(`Checkpoint field ${key} is missing`);
				if (v.length !== n) throw new Error(`Checkpoint field ${key} has ${v.length} cells, the case has ${n}`);
				return v;
			};
			alpha.set(arr('holdup'));
			ul.set(arr('liquidVelocity'));
			if (nc === 1) cls[0].ug.set(arr('gasVelocity'));
			else
				for (const k of cls) {
					k.alpha.set(arr(`holdup${k.suffix}`));
					k.ug.set(arr(`gasVelocity${k.suffix}`));
				}
			pressureGradient = Number(dd.pressureGradientPaM);
			st.step = cp.step;
			st.timeS = cp.timeS;
			st.dtS = Number(dd.dtS);
			steadySinceS = Number(dd.steadySinceS);
			st.status = String(dd.status) as RunStatus;
			st.message = dd.message ? String(dd.message) : undefined;
			const r = dd.residuals as number[];
			CROSS_SECTION_RESIDUALS.forEach((k, i) => (res[k] = r[i]));
		},
		results(): Results {
			return {
				kind: 'cross-section',
				status: st.status,
				message: st.message,
				step: st.step,
				timeS: st.timeS,
				design: designNumbers(),
				profiles: snapshot()
			};
		}
	};
	return sim;
}
