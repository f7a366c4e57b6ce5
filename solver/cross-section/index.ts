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
 * drift velocity, capped at cfl·R/u_t.
 *
 * Residuals (dimensionless, after each step; ⟨·⟩ the area average over the section):
 *   gasMassImbalance   |⟨α u_g⟩ − U_g| / U_g
 *   liquidFluxError    |⟨α_l u_l⟩ − U_l| / max(|U_l|, U_g, 1 mm/s); round-off by construction
 *   holdupChangeRate   max |∂α/∂t| × 1 s (as in the height model)
 *   momentumImbalance  Σ V |α_l ρ_l ∂u_l/∂t + α ρ_g ∂u_g/∂t| / Σ V (|α_l (G − ρ_l g)| + |α (G − ρ_g g)|)
 * Steady: all four at or below the case's steady tolerance throughout 2 R/u_t of simulated time.
 */
import type { CaseDocument } from '../case.js';
import type { Checkpoint, DesignNumber, Residuals, Results, RunStatus, Simulation, SimulationState, Snapshot, StepStatus } from '../types.js';
import { dragCoefficient, eotvosNumber, terminalVelocity } from '../closures/drag.js';
import { swarmDragFactor } from '../closures/swarm.js';
import { virtualMassCoefficient } from '../closures/virtual-mass.js';
import { tomiyamaLiftFromWidthEotvos, tomiyamaWidthEotvos } from '../closures/lift.js';
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

/** The numbers the model uses, resolved from a case once. SI units. */
export interface CrossSectionParameters {
	radiusM: number;
	columnDiameterM: number;
	cells: number;
	liquidDensityKgM3: number;
	liquidViscosityPaS: number;
	surfaceTensionNM: number;
	gasDensityKgM3: number;
	bubbleDiameterM: number;
	eotvos: number;
	terminalVelocityMS: number;
	terminalReynolds: number;
	superficialGasVelocityMS: number;
	superficialLiquidVelocityMS: number;
	gravityMS2: number;
	/** R/u_t: the time a bubble takes to rise one radius; sets the steady window and the largest time step */
	referenceTimeS: number;
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
	return {
		radiusM: dCol / 2,
		columnDiameterM: dCol,
		cells: c.numerics.cells,
		liquidDensityKgM3: rl,
		liquidViscosityPaS: mul,
		surfaceTensionNM: sigma,
		gasDensityKgM3: rg,
		bubbleDiameterM: d,
		eotvos: eotvosNumber({ diameterM: d, liquidDensityKgM3: rl, gasDensityKgM3: rg, surfaceTensionNM: sigma, gravityMS2: g }),
		terminalVelocityMS: ut,
		terminalReynolds: (rl * ut * d) / mul,
		superficialGasVelocityMS: ugs,
		superficialLiquidVelocityMS: c.sparging.superficialLiquidVelocityMS,
		gravityMS2: g,
		referenceTimeS: dCol / 2 / ut
	};
}

/** Radial profiles of the forces on the gas and the other derived fields, at cell centres. */
interface Diagnostics {
	effectiveViscosity: Float64Array;
	liftForce: Float64Array;
	wallLubricationForce: Float64Array;
	dispersionForce: Float64Array;
	dragForce: Float64Array;
}

export function createCrossSectionSimulation(caseDoc: CaseDocument): Simulation {
	const c = caseDoc;
	const p = crossSectionParameters(c);
	const grid: RadialGrid = createRadialGrid({ radiusM: p.radiusM, cells: p.cells });
	const n = grid.cells;
	const cl = c.closures;
	const rl = p.liquidDensityKgM3;
	const mul = p.liquidViscosityPaS;
	const d = p.bubbleDiameterM;
	const R = p.radiusM;
	const dr = grid.drM;
	const cfl = c.numerics.cflNumber;
	const tol = c.numerics.steadyTolerance;
	const endTimeS = c.numerics.endTimeS;
	const relaxHeightM = FLUX_RELAXATION_HEIGHT_DIAMETERS * p.columnDiameterM;
	const steadyWindowS = 2 * p.referenceTimeS;
	const dtMaxS = cfl * p.referenceTimeS;

	// state
	const alpha = new Float64Array(n);
	const ul = new Float64Array(n);
	const ug = new Float64Array(n);
	let pressureGradient = 0; // G = −dp/dz, Pa/m
	const st: SimulationState = { step: 0, timeS: 0, dtS: 0, status: 'running' };
	let steadySinceS = -1;
	const res: Residuals = { gasMassImbalance: 0, liquidFluxError: 0, holdupChangeRate: 0, momentumImbalance: 0 };

	// work arrays, allocated once
	const alphaN = new Float64Array(n);
	const ulN = new Float64Array(n);
	const ugN = new Float64Array(n);
	const slip = new Float64Array(n);
	const dragSecant = new Float64Array(n);
	const dragSlope = new Float64Array(n);
	const dragOffset = new Float64Array(n);
	const cvm = new Float64Array(n);
	const faceMu = new Float64Array(n + 1);
	const faceWeight = new Float64Array(n + 1);
	const faceDrift = new Float64Array(n + 1);
	const faceDiff = new Float64Array(n + 1);
	const faceFlux = new Float64Array(n + 1);
	const work = new Float64Array(8 * n);
	let wallCoefficient = 0;

	// initial state: uniform holdup from the single-bubble slip, uniform liquid velocity
	{
		const a0 = p.superficialGasVelocityMS > 0 ? Math.min(p.superficialGasVelocityMS / (Math.max(p.superficialLiquidVelocityMS, 0) + p.terminalVelocityMS), 0.3) : 0;
		const u0 = p.superficialLiquidVelocityMS / (1 - a0);
		alpha.fill(a0);
		ul.fill(u0);
		ug.fill(u0 + p.terminalVelocityMS);
		pressureGradient = (rl * (1 - a0) + p.gasDensityKgM3 * a0) * p.gravityMS2;
	}

	/** C_D·|s|·(3/4)ρ_l/d: drag per unit gas volume and unit slip at slip s ≥ 0 and holdup a. */
	function secant(s: number, a: number): number {
		const re = (rl * s * d) / mul;
		const cd = dragCoefficient({ law: cl.drag, reynolds: re, eotvos: p.eotvos, holdup: a }) * swarmDragFactor({ model: cl.swarm, holdup: a, terminalReynolds: p.terminalReynolds });
		return (0.75 * rl * cd * s) / d;
	}

	const widthEotvos = tomiyamaWidthEotvos({ diameterM: d, liquidDensityKgM3: rl, gasDensityKgM3: p.gasDensityKgM3, surfaceTensionNM: p.surfaceTensionNM, gravityMS2: p.gravityMS2 });
	function liftCoefficient(s: number): number {
		if (cl.lift === 'none') return 0;
		if (cl.lift === 'constant') return cl.liftCoefficient;
		return tomiyamaLiftFromWidthEotvos(widthEotvos, (rl * Math.abs(s) * d) / mul);
	}

	function wallForcePerGas(s: number, y: number): number {
		return wallLubricationForce({
			model: cl.wallLubrication,
			holdup: 1,
			liquidDensityKgM3: rl,
			slipVelocityMS: s,
			diameterM: d,
			wallDistanceM: y,
			columnDiameterM: p.columnDiameterM,
			reynolds: (rl * Math.abs(s) * d) / mul,
			eotvos: p.eotvos
		});
	}

	/** Lagged closures from the current state: drag linearisation, face viscosity, drift and diffusivity, wall coefficient. */
	function evaluateClosures(): void {
		for (let i = 0; i < n; i++) {
			const s = ug[i] - ul[i];
			slip[i] = s;
			// drag per gas volume f(s) = k(s) s, odd in s; its slope by central differences about |s|
			const sa = Math.max(Math.abs(s), 1e-6);
			const k = secant(sa, alpha[i]);
			const eps = 1e-4;
			const fp = (secant(sa * (1 + eps), alpha[i]) * sa * (1 + eps) - secant(sa * (1 - eps), alpha[i]) * sa * (1 - eps)) / (2 * eps * sa);
			// the secant as a floor keeps the linearisation diagonally dominant where C_D falls steeply
			const slope = Math.max(fp, k);
			dragSecant[i] = k;
			dragSlope[i] = slope;
			dragOffset[i] = (s < 0 ? -1 : 1) * (k * sa - slope * sa);
		}
		for (let j = 1; j < n; j++) {
			const aF = 0.5 * (alpha[j - 1] + alpha[j]);
			const sF = 0.5 * (slip[j - 1] + slip[j]);
			const du = (ul[j] - ul[j - 1]) / dr;
			const y = R - grid.facesM[j];
			const l = nikuradseMixingLengthM({ radiusM: R, wallDistanceM: y });
			const muSI = rl * l * l * Math.abs(du);
			const muBI = cl.bubbleInducedTurbulence === 'sato' ? satoViscosityPaS({ liquidDensityKgM3: rl, holdup: aF, diameterM: d, slipVelocityMS: sF }) : 0;
			faceMu[j] = mul + muSI + muBI;
			faceWeight[j] = 1 - aF;
			const kF = 0.5 * (dragSecant[j - 1] + dragSecant[j]);
			const fL = -liftCoefficient(sF) * rl * sF * du;
			const fW = -wallForcePerGas(sF, y);
			faceDrift[j] = ((1 - aF) * (fL + fW)) / kF;
			faceDiff[j] = dispersionDiffusivityM2S({
				model: cl.turbulentDispersion,
				coefficient: cl.turbulentDispersionCoefficient,
				holdup: aF,
				liquidDensityKgM3: rl,
				eddyViscosityM2S: (muSI + muBI) / rl,
				turbulentKineticEnergyM2S2: turbulentKineticEnergyM2S2({ shearEddyViscosityM2S: muSI / rl, shearRateS: du, holdup: aF, slipVelocityMS: sF }),
				dragPerGasVolume: kF
			});
		}
		faceDrift[0] = 0;
		faceDrift[n] = 0;
		faceDiff[0] = 0;
		faceDiff[n] = 0;
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

	function step(): StepStatus {
		if (st.status !== 'running') return { status: st.status, message: st.message };
		evaluateClosures();
		let maxDrift = 0;
		for (let j = 1; j < n; j++) maxDrift = Math.max(maxDrift, Math.abs(faceDrift[j]));
		let dt = maxDrift > 0 ? Math.min(dtMaxS, (cfl * dr) / maxDrift) : dtMaxS;
		const remaining = endTimeS - st.timeS;
		let lands = false;
		if (dt >= remaining) {
			dt = remaining;
			lands = true;
		}

		// 1. radial gas transport, conservative
		transportHoldup({ grid, dtS: dt, holdupOld: alpha, faceDriftMS: faceDrift, faceDiffusivityM2S: faceDiff, holdup: alphaN, faceFlux, work });

		// 2. the section's gas content relaxes towards the gas-flux constraint, implicitly in ⟨α⟩ with the
		//    old mean gas velocity ū = ⟨α u_g⟩/⟨α⟩: ⟨α⟩' = ⟨α⟩* + Δt (U_g − ū ⟨α⟩')/H
		const abarOld = sectionAverage(grid, alpha);
		const ubar = abarOld > 0 ? sectionAverageProduct(grid, alpha, ug) / abarOld : p.terminalVelocityMS + p.superficialLiquidVelocityMS;
		let q = 0;
		for (let i = 0; i < n; i++) q += alphaN[i] * grid.volumes[i];
		const abarStar = q / grid.totalVolume;
		const abarNew = (abarStar + (dt * p.superficialGasVelocityMS) / relaxHeightM) / (1 + (dt * Math.max(ubar, 0)) / relaxHeightM);
		if (abarStar > 1e-12) {
			const factor = abarNew / abarStar;
			for (let i = 0; i < n; i++) alphaN[i] *= factor;
		} else if (abarNew > 0) {
			for (let i = 0; i < n; i++) alphaN[i] += abarNew;
		}
		for (let i = 0; i < n; i++) {
			const a = alphaN[i];
			if (!Number.isFinite(a) || a < -1e-12 || a > MAX_HOLDUP) {
				return fail(`Gas holdup ${Number.isFinite(a) ? a.toPrecision(4) : 'is not a number'} in ${describeCell(i)} at t = ${st.timeS.toFixed(4)} s (allowed 0 to ${MAX_HOLDUP})`);
			}
		}

		// 3. axial momentum with the new holdup
		for (let i = 0; i < n; i++) cvm[i] = virtualMassCoefficient({ model: cl.virtualMass, holdup: alphaN[i], constant: cl.virtualMassCoefficient });
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
			virtualMassCoefficient: cvm,
			dragSlope,
			dragOffset,
			liquidVelocityOld: ul,
			gasVelocityOld: ug,
			superficialLiquidVelocityMS: p.superficialLiquidVelocityMS,
			liquidVelocity: ulN,
			gasVelocity: ugN,
			work
		});
		for (let i = 0; i < n; i++) {
			if (!Number.isFinite(ulN[i]) || Math.abs(ulN[i]) > 50) return fail(`Liquid velocity ${ulN[i].toPrecision(4)} m/s in ${describeCell(i)} at t = ${st.timeS.toFixed(4)} s`);
			if (!Number.isFinite(ugN[i]) || Math.abs(ugN[i]) > 50) return fail(`Gas velocity ${ugN[i].toPrecision(4)} m/s in ${describeCell(i)} at t = ${st.timeS.toFixed(4)} s`);
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
			imb += v * Math.abs(((1 - a) * rl * (ulN[i] - ul[i]) + a * p.gasDensityKgM3 * (ugN[i] - ug[i])) / dt);
			ref += v * (Math.abs((1 - a) * (G - rl * p.gravityMS2)) + Math.abs(a * (G - p.gasDensityKgM3 * p.gravityMS2)));
		}
		const ug0 = p.superficialGasVelocityMS;
		res.gasMassImbalance = ug0 > 0 ? Math.abs(sectionAverageProduct(grid, alphaN, ugN) - ug0) / ug0 : abar;
		let ql = 0;
		for (let i = 0; i < n; i++) ql += (1 - alphaN[i]) * ulN[i] * grid.volumes[i];
		res.liquidFluxError = Math.abs(ql / grid.totalVolume - p.superficialLiquidVelocityMS) / Math.max(Math.abs(p.superficialLiquidVelocityMS), ug0, 1e-3);
		// as in the height model: the largest local |∂α/∂t| times 1 s
		res.holdupChangeRate = maxDa / dt;
		res.momentumImbalance = ref > 0 ? imb / ref : 0;

		// 5. commit
		alpha.set(alphaN);
		ul.set(ulN);
		ug.set(ugN);
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
		const flux = new Float64Array(n + 1);
		for (let j = 1; j < n; j++) {
			const w = faceDrift[j];
			flux[j] = Math.max(w, 0) * alpha[j - 1] + Math.min(w, 0) * alpha[j] - (faceDiff[j] * (alpha[j] - alpha[j - 1])) / dr;
		}
		for (let i = 0; i < n; i++) {
			const a = alpha[i];
			const s = slip[i];
			// central differences, with a mirror cell across the axis and one-sided at the wall cell
			const iL = i > 0 ? i - 1 : 0;
			const iR = i < n - 1 ? i + 1 : i;
			const span = (iR - iL + (i === 0 ? 1 : 0)) * dr;
			const du = (ul[iR] - ul[iL]) / span;
			const da = (alpha[iR] - alpha[iL]) / span;
			const y = R - grid.centresM[i];
			const l = nikuradseMixingLengthM({ radiusM: R, wallDistanceM: y });
			const muSI = rl * l * l * Math.abs(du);
			const muBI = cl.bubbleInducedTurbulence === 'sato' ? satoViscosityPaS({ liquidDensityKgM3: rl, holdup: a, diameterM: d, slipVelocityMS: s }) : 0;
			out.effectiveViscosity[i] = mul + muSI + muBI;
			out.liftForce[i] = -liftCoefficient(s) * a * rl * s * du;
			out.wallLubricationForce[i] = -a * wallForcePerGas(s, y);
			out.dispersionForce[i] = radialDispersionForce({
				model: cl.turbulentDispersion,
				coefficient: cl.turbulentDispersionCoefficient,
				holdup: a,
				liquidDensityKgM3: rl,
				eddyViscosityM2S: (muSI + muBI) / rl,
				turbulentKineticEnergyM2S2: turbulentKineticEnergyM2S2({ shearEddyViscosityM2S: muSI / rl, shearRateS: du, holdup: a, slipVelocityMS: s }),
				dragPerGasVolume: dragSecant[i],
				holdupGradientPerM: da
			});
			const fc = 0.5 * (flux[i] + flux[i + 1]);
			out.dragForce[i] = (-dragSecant[i] * fc) / Math.max(1 - a, 1e-12);
		}
		return out;
	}

	function snapshot(): Snapshot {
		const dg = diagnostics();
		return {
			step: st.step,
			timeS: st.timeS,
			x: Float64Array.from(grid.centresM),
			fields: {
				holdup: Float64Array.from(alpha),
				liquidVelocity: Float64Array.from(ul),
				gasVelocity: Float64Array.from(ug),
				...dg
			}
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
		let imax = 0;
		let amin = alpha[0];
		for (let i = 1; i < n; i++) {
			if (alpha[i] > alpha[imax]) imax = i;
			amin = Math.min(amin, alpha[i]);
		}
		// a profile flat to 1e-6 of its mean has no peak worth naming
		const hasPeak = abar > 0 && alpha[imax] - amin > 1e-6 * abar;
		const wallPeak = grid.centresM[imax] / R > 0.5;
		return {
			sectionHoldup: { value: abar, unit: '1', label: 'Section-average gas holdup' },
			centrelineLiquidVelocityMS: { value: uc, unit: 'm/s', label: 'Centreline liquid velocity' },
			reversalRadiusRatio: {
				value: reversal,
				unit: '1',
				label: Number.isNaN(reversal) ? 'Liquid flow reversal radius r/R: no reversal' : 'Liquid flow reversal radius r/R'
			},
			peakLocation: {
				value: hasPeak ? (wallPeak ? 1 : 0) : Number.NaN,
				unit: '1',
				label: hasPeak ? (wallPeak ? 'Holdup peak: wall-peaked' : 'Holdup peak: core-peaked') : abar > 0 ? 'Holdup peak: none (flat profile)' : 'Holdup peak: no gas'
			},
			axialPressureGradientPaM: { value: -pressureGradient, unit: 'Pa/m', label: 'Axial pressure gradient dp/dz' }
		};
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
			return {
				kind: 'cross-section',
				solverVersion: CROSS_SECTION_MODEL_VERSION,
				step: st.step,
				timeS: st.timeS,
				data: {
					holdup: Float64Array.from(alpha),
					liquidVelocity: Float64Array.from(ul),
					gasVelocity: Float64Array.from(ug),
					pressureGradientPaM: pressureGradient,
					dtS: st.dtS,
					steadySinceS,
					status: st.status,
					message: st.message ?? '',
					residuals: CROSS_SECTION_RESIDUALS.map((k) => res[k])
				}
			};
		},
		restore(cp: Checkpoint): void {
			if (cp.kind !== 'cross-section') throw new Error(`A ${cp.kind} checkpoint cannot restore a cross-section run`);
			// continuing bit-identically needs the very same numerics
			if (!canContinueCheckpoint(cp.solverVersion, true)) throw new Error(`Checkpoint of solver ${cp.solverVersion} cannot continue with solver ${SOLVER_VERSION}`);
			const dd = cp.data;
			const arr = (k: string): Float64Array => {
				const raw: unknown = dd[k];
				let v: Float64Array;
				if (raw instanceof Float64Array) v = raw;
				else if (Array.isArray(raw)) v = Float64Array.from(raw as number[]);
				else if (raw instanceof Uint8Array && raw.byteLength % 8 === 0) {
					// a msgpack decoder without typed-array support hands back the raw bytes
					v = new Float64Array(raw.buffer.slice(raw.byteOffset, raw.byteOffset + raw.byteLength));
				} else throw new Error(`Checkpoint field ${k} is missing`);
				if (v.length !== n) throw new Error(`Checkpoint field ${k} has ${v.length} cells, the case has ${n}`);
				return v;
			};
			alpha.set(arr('holdup'));
			ul.set(arr('liquidVelocity'));
			ug.set(arr('gasVelocity'));
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
