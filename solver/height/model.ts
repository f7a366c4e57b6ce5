/**
 * The height-profile model: a 1-D transient two-fluid (gas–liquid) column.
 *
 * Equations (z upward for a column, g_z the signed axial gravity; α gas holdup, α_l = 1 − α):
 *   ∂(α ρ_g)/∂t + ∂(α ρ_g u_g)/∂z = 0,             ρ_g = p M/(R T) (ideal gas) or constant
 *   ∂α_l/∂t + ∂(α_l u_l)/∂z = 0                       (incompressible liquid)
 *   α ρ_g D_g u_g/Dt = −α ∂p/∂z + α ρ_g g_z − K(u_g − u_l) + F_VM − Δp_i ∂α/∂z
 *   α_l ρ_l D_l u_l/Dt = −α_l ∂p/∂z + α_l ρ_l g_z + K(u_g − u_l) − F_VM + Δp_i ∂α/∂z − λ u_l
 * with F_VM = C_VM α ρ_l (D_l u_l/Dt − D_g u_g/Dt), Δp_i = C_p ρ_l (u_g − u_l)² (PHYSICS §2, §3) and
 * K = (3/4) α ρ_l C_D |u_r|/d, blended above the level into a droplet drag ∝ α_l (PHYSICS §18.1).
 *
 * Numerics (Liles & Reed 1978 style, PHYSICS §12): staggered grid (α, p, ρ_g at cell centres, u_g, u_l
 * at faces); per face the momentum pair is linear in the new velocities and the new pressure difference,
 * with drag, virtual-mass accelerations, wall friction and (where it acts as a drag) the interfacial
 * pressure implicit, solved by the exact 2×2 elimination (PHYSICS §12.2); convection explicit upwind,
 * weighted by the donor cell's content of the phase. Substituting the face velocities into the volume balance
 * Σ_k (mass_k / ρ_k), linearised in the gas density, gives one tridiagonal system for the pressure change.
 * Then the liquid fraction is advanced conservatively with donor-cell (optionally TVD-limited) fluxes
 * built from the old-time velocity direction, over-drained cells are repaired conservatively, and ρ_g
 * follows from the new pressure. The liquid is conserved to round-off; the gas to the linearisation error.
 * The time step follows a material Courant number over the phases present in each cell.
 *
 * Bubble classes (`cfg.classes`, PHYSICS §8.8): the gas may be N dispersed fields k with holdup α_k = α y_k, each
 * with the gas momentum equation above (its own drag, virtual mass and share of the interfacial pressure) and its
 * own continuity; they share the pressure. Per face the (N+1)×(N+1) block is an arrow (each class couples only
 * to the liquid) and is eliminated in O(N) (`classFaceMomentum`); the pressure step stays one tridiagonal solve.
 * One difference from the one-class face loop: a class's interfacial pressure may cancel its drag but not reverse
 * it (`classFaceMomentum`), where the one-class loop leaves a net negative coupling explicit; the one-class
 * arithmetic itself is unchanged.
 *
 * Boundaries: bottom inflow (gas mass flux, liquid volume flux) or wall; top pressure outlet (gas leaves
 * or enters as pure gas; liquid closed, open or fed) or a wall with a pinned pressure.
 * No allocation per step: every array is allocated once in the constructor.
 */
import { DRAG_LAW_CODES, dragCdRe, eotvosNumber, terminalVelocity } from '../closures/drag.js';
import { swarmExponent } from '../closures/swarm.js';
import { blasiusFrictionCoefficient } from '../closures/friction.js';
import type { GasClassConfig, HeightModelConfig } from './config.js';
import { gasCompressibility } from './config.js';
import type { RunStatus } from '../types.js';

/** Holdup floor inside the momentum coefficients: keeps the velocity of an absent phase defined (its would-be slip). */
const PRESENT_EPS = 1e-12;
/** A phase limits the time step only in cells where its fraction exceeds this (PHYSICS §18.1: dilute drops). */
const CFL_PRESENCE = 1e-4;
/** A liquid donor below this fraction, facing a cell fuller than SWITCH_FULL, hands the donation to that cell. */
const SWITCH_DONOR = 0.02;
const SWITCH_FULL = 0.95;
/** Drag-law code of the spherical-cap class (C_D = 8/3), next to the case's laws in DRAG_LAW_CODES. */
const SPHERICAL_CAP_CODE = 6;

/**
 * Above the level the gas is continuous and its classes lose their identity: there each class is drawn to the
 * old-time mean gas velocity with an implicit coupling of CLASS_LOCK·w·α_k ρ_g per step (w the separated-flow
 * weight), so a class that is absent from the freeboard cannot run away under the freeboard's pressure gradient.
 */
const CLASS_LOCK = 10;

/** Largest growth of the time step from one step to the next. */
const DT_GROWTH = 1.2;
/** A time step below this (s) with time left to run is reported as a collapse. */
const DT_COLLAPSE_S = 1e-9;

export interface StepDiagnostics {
	/** gas mass flux in at the bottom and out at the top, kg/(m² s) */
	gasInKgM2S: number;
	gasOutKgM2S: number;
	/** liquid volume flux in at the bottom and out at the top, m/s */
	liquidInMS: number;
	liquidOutMS: number;
}

export class HeightModel {
	readonly cfg: HeightModelConfig;
	readonly n: number;
	readonly dz: number;
	readonly zCentre: Float64Array;
	// state
	readonly liquidFraction: Float64Array;
	readonly pressure: Float64Array;
	readonly gasDensity: Float64Array;
	/** gas velocity at the faces; with several classes their holdup-weighted mean */
	readonly gasVelocity: Float64Array;
	readonly liquidVelocity: Float64Array;
	/** the bubble classes (one entry for the one-class model) */
	readonly classes: readonly GasClassConfig[];
	/** number of bubble classes */
	readonly nc: number;
	/** share of the cell's gas held by each class, `classShare[k][i]` (all 1 for one class) */
	readonly classShare: Float64Array[];
	/** face velocity of each class (class 0 is `gasVelocity` itself for one class) */
	readonly classVelocity: Float64Array[];
	/** gas mass flux of each class through each face of the last step, kg/(m² s) */
	readonly classFlux: Float64Array[];
	timeS = 0;
	stepCount = 0;
	dtS = 0;
	status: RunStatus = 'running';
	message: string | undefined = undefined;
	// scratch (face coefficients, tridiagonal system, fluxes)
	private readonly ug0: Float64Array;
	private readonly dg: Float64Array;
	private readonly ul0: Float64Array;
	private readonly dl: Float64Array;
	private readonly wg: Float64Array;
	private readonly wl: Float64Array;
	private readonly hf: Float64Array;
	private readonly dpOld: Float64Array;
	private readonly solved: Uint8Array;
	private readonly triLo: Float64Array;
	private readonly triDi: Float64Array;
	private readonly triUp: Float64Array;
	private readonly triRhs: Float64Array;
	private readonly triC: Float64Array;
	private readonly dp: Float64Array;
	readonly gasFlux: Float64Array;
	readonly liquidFlux: Float64Array;
	private readonly lfOld: Float64Array;
	private readonly classU0: Float64Array[];
	private readonly classD: Float64Array[];
	private readonly classW: Float64Array[];
	private readonly classMass: Float64Array;
	private readonly flatShare: Float64Array;
	private readonly flatVelocity: Float64Array;
	private readonly flatU0: Float64Array;
	private readonly flatD: Float64Array;
	/**
	 * Several classes, scratch of n + 1 values reused within a step: per face Σ_k w_k D_k (pressure step), then the
	 * face pressure gradient (velocity update), then the weights of the mean gas velocity (`mixGasVelocity`)
	 */
	private readonly gasE: Float64Array;
	/** per face Σ_k w_k (u0_k − D_k Δp/h) (pressure step), then the weighted sums of the mean gas velocity */
	private readonly gasF: Float64Array;
	/** per face w_l D_l and w_l (u0_l − D_l Δp/h) (pressure step), then per cell the gas mass and the sum of the class masses */
	private readonly liqE: Float64Array;
	private readonly liqF: Float64Array;
	/** per face Δp/h of the old pressure */
	private readonly gradOld: Float64Array;
	// per-face scratch of the class elimination
	private readonly kB: Float64Array;
	private readonly kR: Float64Array;
	private readonly kAg: Float64Array;
	private readonly kInv: Float64Array;
	// constants
	private readonly psi: number;
	private readonly eotvos: number;
	private readonly lawIndex: number;
	private readonly swarmN: number;
	private readonly classEotvos: Float64Array;
	private readonly classLaw: Int32Array;
	private readonly classSwarmPow: Float64Array;
	/** 0.75 μ_l (drag factor)/d² of each class: K = α_k C_D·Re times this */
	private readonly classDragScale: Float64Array;
	/** ρ_l d/μ_l of each class: Re = |u_r| times this */
	private readonly reScale: Float64Array;
	/** spherical-cap classes: K = α_k |u_r| times this, (8/3)·Re/|u_r|·classDragScale */
	private readonly capScale: Float64Array;
	private readonly outsideGasDensity: number;
	readonly diag: StepDiagnostics = { gasInKgM2S: 0, gasOutKgM2S: 0, liquidInMS: 0, liquidOutMS: 0 };
	/** max |Δα_l|/Δt of the last step, 1/s */
	lastMaxHoldupRate = 0;
	/** cell whose outflow set the last time step: i for the gas, −1 − i for the liquid */
	private limitingCell = 0;

	constructor(cfg: HeightModelConfig) {
		this.cfg = cfg;
		const n = cfg.cells;
		this.n = n;
		this.dz = cfg.heightM / n;
		this.zCentre = new Float64Array(n);
		for (let i = 0; i < n; i++) this.zCentre[i] = (i + 0.5) * this.dz;
		this.liquidFraction = new Float64Array(n);
		this.pressure = new Float64Array(n);
		this.gasDensity = new Float64Array(n);
		this.gasVelocity = new Float64Array(n + 1);
		this.liquidVelocity = new Float64Array(n + 1);
		this.ug0 = new Float64Array(n + 1);
		this.dg = new Float64Array(n + 1);
		this.ul0 = new Float64Array(n + 1);
		this.dl = new Float64Array(n + 1);
		this.wg = new Float64Array(n + 1);
		this.wl = new Float64Array(n + 1);
		this.hf = new Float64Array(n + 1);
		this.dpOld = new Float64Array(n + 1);
		this.solved = new Uint8Array(n + 1);
		this.triLo = new Float64Array(n);
		this.triDi = new Float64Array(n);
		this.triUp = new Float64Array(n);
		this.triRhs = new Float64Array(n);
		this.triC = new Float64Array(n);
		this.dp = new Float64Array(n);
		this.gasFlux = new Float64Array(n + 1);
		this.liquidFlux = new Float64Array(n + 1);
		this.lfOld = new Float64Array(n);
		this.classes = cfg.classes && cfg.classes.length > 0
			? cfg.classes
			: [{ id: 'gas', label: 'Bubbles', diameterM: cfg.bubbleDiameterM, drag: cfg.drag === 'none' ? 'schiller-naumann' : cfg.drag, swarm: cfg.swarm, dragFactor: 1, inflowShare: 1 }];
		const nc = this.classes.length;
		this.nc = nc;
		this.classShare = [];
		this.classVelocity = [];
		this.classFlux = [];
		this.classU0 = [];
		this.classD = [];
		this.classW = [];
		// several classes: shares, velocities and face coefficients of all classes in one array each, class k's
		// values at offset k n (cells) or k (n + 1) (faces); the per-class arrays are views into them
		this.flatShare = new Float64Array(nc > 1 ? nc * n : 0);
		this.flatVelocity = new Float64Array(nc > 1 ? nc * (n + 1) : 0);
		this.flatU0 = new Float64Array(nc > 1 ? nc * (n + 1) : 0);
		this.flatD = new Float64Array(nc > 1 ? nc * (n + 1) : 0);
		for (let k = 0; k < nc; k++) {
			const share = nc === 1 ? new Float64Array(n) : this.flatShare.subarray(k * n, (k + 1) * n);
			share.fill(nc === 1 || k === 0 ? 1 : 0);
			this.classShare.push(share);
			const faces = (a: Float64Array) => a.subarray(k * (n + 1), (k + 1) * (n + 1));
			this.classVelocity.push(nc === 1 ? this.gasVelocity : faces(this.flatVelocity));
			this.classFlux.push(nc === 1 ? this.gasFlux : new Float64Array(n + 1));
			this.classU0.push(nc === 1 ? this.ug0 : faces(this.flatU0));
			this.classD.push(nc === 1 ? this.dg : faces(this.flatD));
			this.classW.push(nc === 1 ? this.wg : new Float64Array(n + 1));
		}
		this.classMass = new Float64Array(nc * n);
		this.gasE = new Float64Array(nc > 1 ? n + 1 : 0);
		this.gasF = new Float64Array(nc > 1 ? n + 1 : 0);
		this.liqE = new Float64Array(nc > 1 ? n + 1 : 0);
		this.liqF = new Float64Array(nc > 1 ? n + 1 : 0);
		this.gradOld = new Float64Array(nc > 1 ? n + 1 : 0);
		this.kB = new Float64Array(nc);
		this.kR = new Float64Array(nc);
		this.kAg = new Float64Array(nc);
		this.kInv = new Float64Array(nc);
		this.psi = gasCompressibility(cfg);
		this.outsideGasDensity = cfg.gasDensityKgM3 ?? this.psi * cfg.top.pressurePa;
		const rhoRef = cfg.gasDensityKgM3 ?? cfg.referenceGasDensityKgM3;
		this.eotvos = eotvosNumber({ diameterM: cfg.bubbleDiameterM, liquidDensityKgM3: cfg.liquidDensityKgM3, gasDensityKgM3: rhoRef, surfaceTensionNM: cfg.surfaceTensionNM, gravityMS2: Math.abs(cfg.gravityAxialMS2) });
		this.lawIndex = cfg.drag === 'none' ? -1 : DRAG_LAW_CODES[cfg.drag];
		let reT = 0;
		if (cfg.drag !== 'none' && cfg.swarm !== 'none') {
			const ut = terminalVelocity({ law: cfg.drag, diameterM: cfg.bubbleDiameterM, liquidDensityKgM3: cfg.liquidDensityKgM3, gasDensityKgM3: rhoRef, liquidViscosityPaS: cfg.liquidViscosityPaS, surfaceTensionNM: cfg.surfaceTensionNM, gravityMS2: Math.abs(cfg.gravityAxialMS2) });
			reT = (cfg.liquidDensityKgM3 * ut * cfg.bubbleDiameterM) / cfg.liquidViscosityPaS;
		}
		this.swarmN = swarmExponent({ model: cfg.swarm, terminalReynolds: reT });
		this.classEotvos = new Float64Array(nc);
		this.classLaw = new Int32Array(nc);
		this.classSwarmPow = new Float64Array(nc);
		this.classDragScale = new Float64Array(nc);
		this.reScale = new Float64Array(nc);
		this.capScale = new Float64Array(nc);
		for (let k = 0; k < nc; k++) {
			const c = this.classes[k];
			this.classDragScale[k] = (0.75 * cfg.liquidViscosityPaS * c.dragFactor) / (c.diameterM * c.diameterM);
			this.reScale[k] = (cfg.liquidDensityKgM3 * c.diameterM) / cfg.liquidViscosityPaS;
			this.capScale[k] = (8 / 3) * this.reScale[k] * this.classDragScale[k];
			const gAbs = Math.abs(cfg.gravityAxialMS2);
			this.classEotvos[k] = eotvosNumber({ diameterM: c.diameterM, liquidDensityKgM3: cfg.liquidDensityKgM3, gasDensityKgM3: rhoRef, surfaceTensionNM: cfg.surfaceTensionNM, gravityMS2: gAbs });
			this.classLaw[k] = c.drag === 'spherical-cap' ? SPHERICAL_CAP_CODE : DRAG_LAW_CODES[c.drag];
			let re = 0;
			if (c.swarm !== 'none' && c.drag !== 'spherical-cap') {
				const ut = terminalVelocity({ law: c.drag, diameterM: c.diameterM, liquidDensityKgM3: cfg.liquidDensityKgM3, gasDensityKgM3: rhoRef, liquidViscosityPaS: cfg.liquidViscosityPaS, surfaceTensionNM: cfg.surfaceTensionNM, gravityMS2: gAbs });
				re = (cfg.liquidDensityKgM3 * ut * c.diameterM) / cfg.liquidViscosityPaS;
			}
			this.classSwarmPow[k] = -2 * (swarmExponent({ model: c.swarm, terminalReynolds: re }) - 1);
		}
		this.initialise();
	}

	private initialise(): void {
		const { cfg, n, dz } = this;
		for (let i = 0; i < n; i++) {
			const a = cfg.initial.holdup(i * dz, (i + 1) * dz);
			this.liquidFraction[i] = 1 - Math.min(1, Math.max(0, a));
		}
		for (let j = 0; j <= n; j++) {
			this.gasVelocity[j] = cfg.initial.gasVelocityMS;
			this.liquidVelocity[j] = cfg.initial.liquidVelocityMS;
			for (let k = 0; k < this.nc; k++) this.classVelocity[k][j] = cfg.initial.gasVelocityMS;
		}
		this.applyBoundaryVelocities();
		this.hydrostaticPressure();
	}

	/** Discrete hydrostatic pressure consistent with the face momentum balance at rest, integrated from the top. */
	hydrostaticPressure(): void {
		const { cfg, n, dz, psi } = this;
		const g = cfg.gravityAxialMS2;
		const rl = cfg.liquidDensityKgM3;
		const rc = cfg.gasDensityKgM3;
		const p = this.pressure;
		const lf = this.liquidFraction;
		// top cell: p_top − p = g (Δz/2) ρ_m, with ρ_g = ψ p (ideal) or constant
		{
			const a = 1 - lf[n - 1];
			const h = 0.5 * dz;
			p[n - 1] = rc === undefined ? (cfg.top.pressurePa - g * h * lf[n - 1] * rl) / (1 + g * h * a * psi) : cfg.top.pressurePa - g * h * (a * rc + lf[n - 1] * rl);
		}
		for (let i = n - 2; i >= 0; i--) {
			const af = 1 - 0.5 * (lf[i] + lf[i + 1]);
			const lff = 1 - af;
			if (rc === undefined) {
				// p_i − p_{i+1} = −g Δz (α_f ψ (p_i + p_{i+1})/2 + α_l,f ρ_l), solved for p_i
				const k = 0.5 * g * dz * af * psi;
				p[i] = (p[i + 1] * (1 - k) - g * dz * lff * rl) / (1 + k);
			} else {
				p[i] = p[i + 1] - g * dz * (af * rc + lff * rl);
			}
		}
		for (let i = 0; i < n; i++) this.gasDensity[i] = rc ?? psi * p[i];
	}

	private applyBoundaryVelocities(): void {
		const { cfg, n } = this;
		const ul = this.liquidVelocity;
		const b = cfg.bottom;
		for (let k = 0; k < this.nc; k++) {
			const ug = this.classVelocity[k];
			if (b.kind === 'wall') ug[0] = 0;
			else ug[0] = b.gasVelocityMS ?? ug[1];
			if (cfg.top.kind === 'wall') ug[n] = 0;
		}
		if (b.kind === 'wall') {
			ul[0] = 0;
		} else {
			ul[0] = b.liquidVelocityMS ?? b.liquidVolumeFluxMS / Math.max(this.liquidFraction[0], 0.01);
		}
		if (this.nc > 1) this.mixGasVelocity();
		if (cfg.top.kind === 'wall') {
			ul[n] = 0;
		} else if (cfg.top.liquid === 'closed') {
			ul[n] = 0;
		} else if (cfg.top.liquid === 'feed') {
			ul[n] = -(cfg.top.liquidFeedMS ?? 0) / Math.max(this.liquidFraction[n - 1], 0.01);
		}
	}

	/** Holdup of class k in cell i. */
	classHoldup(k: number, i: number): number {
		return (1 - this.liquidFraction[i]) * this.classShare[k][i];
	}

	/** `gasVelocity` as the holdup-weighted mean of the class velocities at each face (several classes). */
	mixGasVelocity(): void {
		const { n, nc } = this;
		const lf = this.liquidFraction;
		// class by class over the faces (sums in class order); weights in `gasE`, weighted sums in `gasF`
		const sw = this.gasE;
		const su = this.gasF;
		for (let k = 0; k < nc; k++) {
			const y = this.classShare[k];
			const uk = this.classVelocity[k];
			const first = k === 0;
			// negative round-off holdups weigh nothing: two of opposite sign once cancelled to 0/0
			let gLo = (1 - lf[0]) * y[0];
			let a = gLo + gLo;
			let aw = (a > 0 ? a : 0) + 1e-30;
			sw[0] = first ? aw : sw[0] + aw;
			su[0] = first ? aw * uk[0] : su[0] + aw * uk[0];
			for (let j = 1; j < n; j++) {
				const gHi = (1 - lf[j]) * y[j];
				a = gLo + gHi;
				aw = (a > 0 ? a : 0) + 1e-30;
				sw[j] = first ? aw : sw[j] + aw;
				su[j] = first ? aw * uk[j] : su[j] + aw * uk[j];
				gLo = gHi;
			}
			a = gLo + gLo;
			aw = (a > 0 ? a : 0) + 1e-30;
			sw[n] = first ? aw : sw[n] + aw;
			su[n] = first ? aw * uk[n] : su[n] + aw * uk[n];
		}
		for (let j = 0; j <= n; j++) this.gasVelocity[j] = su[j] / sw[j];
	}

	/** Time step from the material Courant number, counting only phases present in a cell (positivity form). */
	private chooseTimeStep(): number {
		const { cfg, n, dz } = this;
		const ul = this.liquidVelocity;
		const lf = this.liquidFraction;
		let speed = 0;
		if (this.nc > 1) speed = this.classSpeed();
		else for (let i = 0; i < n; i++) {
			for (let k = 0; k < this.nc; k++) {
				const ug = this.classVelocity[k];
				if ((1 - lf[i]) * this.classShare[k][i] > CFL_PRESENCE) {
					const s = (ug[i + 1] > 0 ? ug[i + 1] : 0) - (ug[i] < 0 ? ug[i] : 0);
					if (s > speed) {
						speed = s;
						this.limitingCell = i;
					}
				}
			}
			if (lf[i] > CFL_PRESENCE) {
				const s = (ul[i + 1] > 0 ? ul[i + 1] : 0) - (ul[i] < 0 ? ul[i] : 0);
				if (s > speed) {
					speed = s;
					this.limitingCell = -1 - i;
				}
			}
		}
		let dt = speed > 0 ? (cfg.cflNumber * dz) / speed : cfg.maxTimeStepS;
		if (this.dtS > 0) dt = Math.min(dt, DT_GROWTH * this.dtS);
		else dt = Math.min(dt, (cfg.cflNumber * dz) / Math.max(cfg.velocityScaleMS, 1e-6));
		dt = Math.min(dt, cfg.maxTimeStepS);
		const left = cfg.endTimeS - this.timeS;
		if (dt >= left * (1 - 1e-9)) dt = left;
		return dt;
	}

	/**
	 * `chooseTimeStep`'s largest outflow speed with several classes, class by class over the cells. The limiting
	 * cell is the one the cell-by-cell loop would name: the first, in cell order (classes, then the liquid), to
	 * reach the largest speed.
	 */
	private classSpeed(): number {
		const { n, nc } = this;
		const ul = this.liquidVelocity;
		const lf = this.liquidFraction;
		let speed = 0;
		let key = 0;
		let limit = this.limitingCell;
		for (let k = 0; k < nc; k++) {
			const ug = this.classVelocity[k];
			const y = this.classShare[k];
			for (let i = 0; i < n; i++) {
				if ((1 - lf[i]) * y[i] > CFL_PRESENCE) {
					const s = (ug[i + 1] > 0 ? ug[i + 1] : 0) - (ug[i] < 0 ? ug[i] : 0);
					if (s > speed || (s === speed && s > 0 && i * (nc + 1) + k < key)) {
						speed = s;
						key = i * (nc + 1) + k;
						limit = i;
					}
				}
			}
		}
		for (let i = 0; i < n; i++) {
			if (lf[i] > CFL_PRESENCE) {
				const s = (ul[i + 1] > 0 ? ul[i + 1] : 0) - (ul[i] < 0 ? ul[i] : 0);
				if (s > speed || (s === speed && s > 0 && i * (nc + 1) + nc < key)) {
					speed = s;
					key = i * (nc + 1) + nc;
					limit = -1 - i;
				}
			}
		}
		this.limitingCell = limit;
		return speed;
	}

	/** Face value of a cell field for the donor flux, with the optional TVD limiter. */
	private faceValue(f: Float64Array, donor: number, acceptor: number, far: number, courant: number, useField: boolean): number {
		const vd = useField ? f[donor] : 1 - f[donor];
		if (this.cfg.scheme === 'donor-cell' || acceptor < 0 || acceptor >= this.n || far < 0 || far >= this.n) return vd;
		const va = useField ? f[acceptor] : 1 - f[acceptor];
		const vf = useField ? f[far] : 1 - f[far];
		const den = va - vd;
		if (den === 0) return vd;
		const r = (vd - vf) / den;
		let phi: number;
		if (this.cfg.scheme === 'van-leer') {
			const ar = r < 0 ? -r : r;
			phi = (r + ar) / (1 + ar);
		} else phi = r <= 0 ? 0 : r < 1 ? r : 1;
		const nu = courant < 1 ? courant : 1;
		return vd + 0.5 * phi * (1 - nu) * den;
	}

	/** Advance one time step. Returns the status after the step. */
	advance(): RunStatus {
		if (this.status !== 'running') return this.status;
		const { cfg, n, dz, psi } = this;
		const dt = this.chooseTimeStep();
		if (!(dt > DT_COLLAPSE_S)) {
			if (this.timeS >= cfg.endTimeS) {
				this.status = 'finished';
				return this.status;
			}
			const i = this.limitingCell >= 0 ? this.limitingCell : -1 - this.limitingCell;
			const phase = this.limitingCell >= 0 ? 'gas' : 'liquid';
			return this.fail(`time step collapsed to ${dt.toExponential(3)} s at t = ${this.timeS.toFixed(4)} s: the ${phase} velocity in cell ${i} (z = ${this.zCentre[i].toFixed(3)} m) limits it`);
		}
		const lf = this.liquidFraction;
		const p = this.pressure;
		const rg = this.gasDensity;
		const ug = this.gasVelocity;
		const ul = this.liquidVelocity;
		const { ug0, dg, ul0, dl, wg, wl, hf, dpOld, solved } = this;
		const rl = cfg.liquidDensityKgM3;
		const mul = cfg.liquidViscosityPaS;
		const mug = cfg.gasViscosityPaS;
		const g = cfg.gravityAxialMS2;
		const d = cfg.bubbleDiameterM;
		const invD2 = 1 / (d * d);
		const cp = cfg.interfacialPressureCoefficient;
		const vmModel = cfg.virtualMass;
		const vmConst = cfg.virtualMassCoefficient;
		const blend = cfg.dropletBlend;
		const dd = blend ? blend.dropDiameterM : 1;
		const swarmPow = -2 * (this.swarmN - 1);
		const frictionOn = cfg.wallFriction !== 'none';
		const courantScale = dt / dz;

		// 1. face momentum: new velocity = u0 − D·(pressure difference)/h
		const nc = this.nc;
		if (nc > 1) {
			// `classFaceMomentum` sets every face it solves: only the two ends start from zero
			solved[0] = solved[n] = 0;
			ul0[0] = ul0[n] = dl[0] = dl[n] = 0;
			for (let k = 0; k < nc; k++) {
				this.classU0[k][0] = this.classU0[k][n] = 0;
				this.classD[k][0] = this.classD[k][n] = 0;
			}
		} else {
			solved.fill(0);
			ul0.fill(0);
			dl.fill(0);
			this.classU0[0].fill(0);
			this.classD[0].fill(0);
		}
		const top = cfg.top;
		const jMax = top.kind === 'pressure' ? n : n - 1;
		if (nc > 1) this.classFaceMomentum(dt, jMax);
		else for (let j = 1; j <= jMax; j++) {
			const below = j - 1;
			const isTop = j === n;
			const af = isTop ? 1 - lf[below] : 1 - 0.5 * (lf[below] + lf[j]);
			const lff = 1 - af;
			const ag = af > PRESENT_EPS ? af : PRESENT_EPS;
			const alq = lff > PRESENT_EPS ? lff : PRESENT_EPS;
			const rgf = isTop ? rg[below] : 0.5 * (rg[below] + rg[j]);
			const ugj = ug[j];
			const ulj = ul[j];
			const ur = ugj - ulj;
			const aur = ur < 0 ? -ur : ur;
			// explicit upwind convection, α_k ρ_k u ∂u/∂z ≈ (α_k ρ_k u)_donor cell (u_j − u_upwind)/Δz: momentum
			// arrives with the mass that carries it, so the would-be velocity of an absent phase upstream (drops
			// in a clean freeboard) brings none. The Courant number is clipped at 1 so a dilute phase's velocity
			// stays bounded instead of setting the time step.
			const dnG = ugj >= 0 ? below : isTop ? below : j;
			const dnL = ulj >= 0 ? below : isTop ? below : j;
			let up = ugj >= 0 ? ug[j - 1] : j < n ? ug[j + 1] : ugj;
			const shareG = (1 - lf[dnG]) / ag;
			let nu = (ugj < 0 ? -ugj : ugj) * courantScale * (shareG < 1 ? shareG : 1);
			const ugs = ugj - (nu < 1 ? nu : 1) * (ugj - up);
			up = ulj >= 0 ? ul[j - 1] : j < n ? ul[j + 1] : ulj;
			const shareL = lf[dnL] / alq;
			nu = (ulj < 0 ? -ulj : ulj) * courantScale * (shareL < 1 ? shareL : 1);
			const uls = ulj - (nu < 1 ? nu : 1) * (ulj - up);
			// interfacial drag per volume, K (kg m⁻³ s⁻¹)
			let k = 0;
			let w = 0;
			if (this.lawIndex >= 0) {
				const re = (rl * aur * d) / mul;
				let kb = 0.75 * ag * mul * dragCdRe(this.lawIndex, re, this.eotvos, af) * invD2;
				if (swarmPow !== 0) kb *= Math.exp(swarmPow * Math.log(alq > 1e-6 ? alq : 1e-6));
				k = kb;
				if (blend && af > blend.fromHoldup) {
					const x = af >= blend.toHoldup ? 1 : (af - blend.fromHoldup) / (blend.toHoldup - blend.fromHoldup);
					w = x * x * (3 - 2 * x);
					const red = (rgf * aur * dd) / mug;
					const cdRed = red <= 1000 ? 24 * (1 + 0.15 * (red > 0 ? Math.exp(0.687 * Math.log(red)) : 0)) : 0.44 * red;
					const kd = (0.75 * alq * mug * cdRed) / (dd * dd);
					k = (1 - w) * kb + w * kd;
				}
			}
			// virtual mass: bubbles below the level, drops above it
			let cvm = 0;
			if (vmModel === 'constant') cvm = vmConst;
			else if (vmModel === 'zuber') {
				const ac = af < 0.9 ? af : 0.9;
				cvm = (0.5 * (1 + 2 * ac)) / (1 - ac);
			}
			const v = cvm * ((1 - w) * ag * rl + w * alq * rgf);
			// interfacial pressure Δp_i = C_p ρ_l u_r² (PHYSICS §3.2) and the wall friction of the liquid
			const dadz = isTop ? 0 : (lf[below] - lf[j]) / dz;
			const dpi = cp * rl * ur * ur;
			const lam = frictionOn
				? blasiusFrictionCoefficient(lff, rl, mul, ulj, cfg.diameterM)
				: 0;
			// Δp_i ∂α/∂z = C_p ρ_l |u_r| u_r ∂α/∂z acts like a drag with coefficient C_p ρ_l |u_r| ∂α/∂z·sgn(u_r).
			// It is taken implicitly together with the drag (|u_r| old, u_r new) whenever the sum stays a drag:
			// explicit, it flips the slip between two values at a sharp level and destabilises steep bubble
			// fronts on fine grids. Only a net negative coupling is left explicit.
			const kip = cp * rl * ur * dadz;
			const implicitIp = k + kip > 0;
			const mg = ag * rgf;
			const ml = alq * rl;
			const c = (implicitIp ? k + kip : k) * dt;
			const sg = ag * rgf * g - (implicitIp ? 0 : dpi * dadz);
			const sl = alq * rl * g + (implicitIp ? 0 : dpi * dadz);
			const rgRhs = (mg + v) * ugs - v * uls + dt * sg;
			const rlRhs = (ml + v) * uls - v * ugs + dt * sl;
			const b = v + c;
			const a11 = mg + b;
			hf[j] = isTop ? 0.5 * dz : dz;
			dpOld[j] = isTop ? top.pressurePa - p[below] : p[j] - p[below];
			solved[j] = 1;
			if (isTop && top.kind === 'pressure' && top.liquid !== 'open') {
				// liquid velocity held at the outlet: the gas equation alone, with u_l' = 0
				ug0[j] = rgRhs / a11;
				dg[j] = (dt * ag) / a11;
				ul0[j] = 0;
				dl[j] = 0;
				continue;
			}
			const mlf = ml + lam * dt;
			const a22 = mlf + b;
			// det = a11 a22 − b², written without the cancellation
			const det = mg * a22 + b * mlf;
			ug0[j] = (a22 * rgRhs + b * rlRhs) / det;
			dg[j] = (dt * (a22 * ag + b * alq)) / det;
			ul0[j] = (b * rgRhs + a11 * rlRhs) / det;
			dl[j] = (dt * (b * ag + a11 * alq)) / det;
		}

		// 2. donor weights from the old-time velocity direction (PHYSICS §18: a predicted direction can block the level face)
		const donorCell = cfg.scheme === 'donor-cell';
		// several classes with donor-cell weights: those are taken in the face sums of the pressure step below
		const weighClasses = nc === 1 || !donorCell;
		for (let j = 1; j < n; j++) {
			const cl = ul[j] * courantScale;
			if (weighClasses) for (let k = 0; k < nc; k++) {
				// each class is carried by its own velocity; its weight is the donor's gas times the class's share of it
				const uk = this.classVelocity[k];
				const w = this.classW[k];
				const y = this.classShare[k];
				const ukj = uk[j];
				const dn = ukj >= 0 ? j - 1 : j;
				// donor-cell: the donor's gas fraction itself (what `faceValue` returns for that scheme)
				const base = donorCell
					? (1 - lf[dn]) * rg[dn]
					: ukj >= 0
						? this.faceValue(lf, j - 1, j, j - 2, ukj * courantScale, false) * rg[dn]
						: this.faceValue(lf, j, j - 1, j + 1, -(ukj * courantScale), false) * rg[dn];
				w[j] = nc === 1 ? base : base * y[dn];
			}
			// liquid whose upwind cell is (nearly) empty while the other side is (nearly) full takes the other side
			// as donor: at a level crossing a face the bubbles' velocity points up and the drops' velocity down, and
			// with neither side donating, the filling cell must push its last gas out at u = j/α (unbounded) or
			// the incompressible liquid below is cut from the pressure above (a singular matrix)
			const dn = ul[j] >= 0 ? j - 1 : j;
			const ac = ul[j] >= 0 ? j : j - 1;
			if (lf[ac] > SWITCH_FULL && lf[dn] < SWITCH_DONOR) wl[j] = lf[ac];
			else if (ul[j] >= 0) wl[j] = this.faceValue(lf, j - 1, j, j - 2, cl, true);
			else wl[j] = this.faceValue(lf, j, j - 1, j + 1, -cl, true);
		}
		const bottom = cfg.bottom;
		if (bottom.kind === 'inflow') {
			// prescribed fluxes: weight 1, "velocity" = the flux itself, divided among the classes
			for (let k = 0; k < nc; k++) {
				this.classW[k][0] = 1;
				this.classU0[k][0] = nc === 1 ? bottom.gasMassFluxKgM2S : bottom.gasMassFluxKgM2S * this.classes[k].inflowShare;
			}
			wl[0] = 1;
			ul0[0] = bottom.liquidVolumeFluxMS;
		} else {
			for (let k = 0; k < nc; k++) this.classW[k][0] = 0;
			wl[0] = 0;
		}
		hf[0] = dz;
		if (top.kind === 'pressure') {
			for (let k = 0; k < nc; k++) {
				const y = nc === 1 ? 1 : this.classShare[k][n - 1];
				this.classW[k][n] = this.classVelocity[k][n] >= 0 ? (1 - lf[n - 1]) * rg[n - 1] * y : this.outsideGasDensity * y;
			}
			// a (nearly) full top cell donates whatever the old direction: a liquid-full column must keep an outlet
			if (top.liquid === 'open') wl[n] = ul[n] >= 0 || lf[n - 1] > SWITCH_FULL ? lf[n - 1] : 0;
			else if (top.liquid === 'feed') {
				wl[n] = 1;
				ul0[n] = -(top.liquidFeedMS ?? 0);
				dl[n] = 0;
			} else wl[n] = 0;
		} else {
			for (let k = 0; k < nc; k++) this.classW[k][n] = 0;
			wl[n] = 0;
			hf[n] = dz;
		}

		// several classes: their gas mass flux coefficients summed once per face, E_j = Σ_k w_k D_k and
		// F_j = Σ_k w_k (u0_k − D_k Δp_j/h_j), shared by the two cells of the face
		const gasE = this.gasE;
		const gasF = this.gasF;
		const liqE = this.liqE;
		const liqF = this.liqF;
		const gradOld = this.gradOld;
		if (nc > 1) {
			for (let j = 0; j <= n; j++) {
				const q = dpOld[j] / hf[j];
				gradOld[j] = q;
				liqE[j] = wl[j] * dl[j];
				liqF[j] = wl[j] * (ul0[j] - dl[j] * q);
				gasE[j] = 0;
				gasF[j] = 0;
			}
			for (let k = 0; k < nc; k++) {
				const w = this.classW[k];
				const d0 = this.classD[k];
				const u0 = this.classU0[k];
				if (!weighClasses) {
					// donor-cell: the donor's gas times the class's share of it
					const uk = this.classVelocity[k];
					const y = this.classShare[k];
					for (let j = 1; j < n; j++) {
						const dn = uk[j] >= 0 ? j - 1 : j;
						w[j] = (1 - lf[dn]) * rg[dn] * y[dn];
					}
				}
				for (let j = 0; j <= n; j++) {
					gasE[j] += w[j] * d0[j];
					gasF[j] += w[j] * (u0[j] - d0[j] * gradOld[j]);
				}
			}
		}

		// 3. pressure: α ψ Δz/(ρ_g Δt) δp_i + Σ_faces (gas volume flux + liquid volume flux) = 0
		const lo = this.triLo;
		const di = this.triDi;
		const upr = this.triUp;
		const rhs = this.triRhs;
		for (let i = 0; i < n; i++) {
			const inv = rg[i] > 0 ? 1 / rg[i] : 0;
			const jt = i + 1;
			const jb = i;
			let eTop: number;
			let eBot: number;
			let fTop: number;
			let fBot: number;
			if (nc === 1) {
				eTop = (wg[jt] * dg[jt] * inv + wl[jt] * dl[jt]) / hf[jt];
				eBot = (wg[jb] * dg[jb] * inv + wl[jb] * dl[jb]) / hf[jb];
				fTop = wg[jt] * (ug0[jt] - (dg[jt] * dpOld[jt]) / hf[jt]) * inv + wl[jt] * (ul0[jt] - (dl[jt] * dpOld[jt]) / hf[jt]);
				fBot = wg[jb] * (ug0[jb] - (dg[jb] * dpOld[jb]) / hf[jb]) * inv + wl[jb] * (ul0[jb] - (dl[jb] * dpOld[jb]) / hf[jb]);
			} else {
				// the gas volume flux of every class through each face
				eTop = (liqE[jt] + gasE[jt] * inv) / hf[jt];
				eBot = (liqE[jb] + gasE[jb] * inv) / hf[jb];
				fTop = liqF[jt] + gasF[jt] * inv;
				fBot = liqF[jb] + gasF[jb] * inv;
			}
			const ci = rg[i] > 0 ? ((1 - lf[i]) * psi * dz) / (rg[i] * dt) : 0;
			di[i] = ci + eTop + eBot;
			upr[i] = i < n - 1 ? -eTop : 0;
			lo[i] = i > 0 ? -eBot : 0;
			rhs[i] = -(fTop - fBot);
		}
		if (top.kind === 'wall') {
			// closed tube of incompressible phases: pin the pressure at the top wall (the system is otherwise singular)
			const a = 1 - lf[n - 1];
			const target = top.pressurePa - g * 0.5 * dz * (a * (cfg.gasDensityKgM3 ?? rg[n - 1]) + lf[n - 1] * rl);
			di[n - 1] = 1;
			lo[n - 1] = 0;
			rhs[n - 1] = target - p[n - 1];
		}
		// Thomas algorithm
		const cc = this.triC;
		const x = this.dp;
		cc[0] = upr[0] / di[0];
		x[0] = rhs[0] / di[0];
		for (let i = 1; i < n; i++) {
			const m = di[i] - lo[i] * cc[i - 1];
			cc[i] = upr[i] / m;
			x[i] = (rhs[i] - lo[i] * x[i - 1]) / m;
		}
		for (let i = n - 2; i >= 0; i--) x[i] -= cc[i] * x[i + 1];

		// 4. new pressure, face velocities and fluxes
		for (let i = 0; i < n; i++) p[i] += x[i];
		const gf = this.gasFlux;
		const lfx = this.liquidFlux;
		// several classes: the face's pressure gradient kept (in gasE, no longer needed) for the class loops below
		const gradF = gasE;
		for (let j = 1; j <= n; j++) {
			if (!solved[j]) {
				gf[j] = 0;
				if (nc > 1) gradF[j] = 0;
				lfx[j] = wl[j] * ul0[j];
				continue;
			}
			const above = j < n ? x[j] : 0;
			const grad = (dpOld[j] + above - x[j - 1]) / hf[j];
			ul[j] = ul0[j] - dl[j] * grad;
			lfx[j] = wl[j] * ul[j];
			if (nc === 1) {
				ug[j] = ug0[j] - dg[j] * grad;
				gf[j] = wg[j] * ug[j];
			} else {
				gradF[j] = grad;
				gf[j] = 0;
			}
		}
		const r = dt / dz;
		if (nc > 1) {
			// class velocities and fluxes, and with them each class's gas mass after the step (`updateClassShares`):
			// the cell's gas (old) in `liqE`, the sum of its class masses in `liqF`, both free by now
			const gas = liqE;
			const sum = liqF;
			for (let i = 0; i < n; i++) gas[i] = (1 - lf[i]) * rg[i];
			const m = this.classMass;
			for (let k = 0; k < nc; k++) {
				const uk = this.classVelocity[k];
				const u0 = this.classU0[k];
				const d0 = this.classD[k];
				const w = this.classW[k];
				const fl = this.classFlux[k];
				const y = this.classShare[k];
				const o = k * n;
				fl[0] = bottom.kind === 'inflow' ? bottom.gasMassFluxKgM2S * this.classes[k].inflowShare : 0;
				for (let j = 1; j <= n; j++) {
					let fk = 0;
					if (solved[j]) {
						const u = u0[j] - d0[j] * gradF[j];
						uk[j] = u;
						fk = w[j] * u;
						gf[j] += fk;
					}
					fl[j] = fk;
					const i = j - 1;
					let v = gas[i] * y[i] - r * (fk - fl[i]);
					if (v < 0) v = 0;
					m[o + i] = v;
					sum[i] = k === 0 ? v : sum[i] + v;
				}
			}
		}
		if (top.kind === 'pressure' && top.liquid === 'feed') {
			lfx[n] = -(top.liquidFeedMS ?? 0);
		}
		gf[0] = bottom.kind === 'inflow' ? bottom.gasMassFluxKgM2S : 0;
		lfx[0] = bottom.kind === 'inflow' ? bottom.liquidVolumeFluxMS : 0;
		if (nc > 1) this.updateClassShares(liqF);

		// 5. liquid fraction, conservative; over-drained cells repaired from the neighbour that took the liquid
		const old = this.lfOld;
		for (let i = 0; i < n; i++) {
			old[i] = lf[i];
			lf[i] = lf[i] - r * (lfx[i + 1] - lfx[i]);
		}
		this.repair(lf, lfx, gf, r);

		// 6. gas density from the new pressure, boundary velocities, diagnostics
		const rc = cfg.gasDensityKgM3;
		let maxRate = 0;
		for (let i = 0; i < n; i++) {
			rg[i] = rc ?? psi * p[i];
			const rate = Math.abs(lf[i] - old[i]);
			if (rate > maxRate) maxRate = rate;
		}
		this.lastMaxHoldupRate = maxRate / dt;
		this.applyBoundaryVelocities();
		this.diag.gasInKgM2S = gf[0] + (gf[n] < 0 ? -gf[n] : 0);
		this.diag.gasOutKgM2S = gf[n] > 0 ? gf[n] : 0;
		this.diag.liquidInMS = lfx[0] - (lfx[n] < 0 ? lfx[n] : 0);
		this.diag.liquidOutMS = lfx[n] > 0 ? lfx[n] : 0;
		this.timeS += dt;
		this.dtS = dt;
		this.stepCount++;
		const bad = this.check() ?? this.overflow();
		if (bad) return this.fail(bad);
		if (this.timeS >= cfg.endTimeS) this.status = 'finished';
		return this.status;
	}

	/**
	 * Face momentum of the liquid and N bubble classes sharing the pressure. Each class couples to the liquid
	 * only (drag, virtual mass, interfacial pressure), so the (N+1)×(N+1) block is an arrow: each class equation
	 * gives u_k in terms of u_l and the pressure difference, and the liquid equation then closes in u_l, O(N).
	 * The terms are those of the one-class loop in `advance`, per class, with the class holdup α_k = α y_k.
	 */
	private classFaceMomentum(dt: number, jMax: number): void {
		const { cfg, n, dz, nc, ul0, dl, hf, dpOld, solved, kB, kR, kAg, kInv } = this;
		const Y = this.flatShare;
		const V = this.flatVelocity;
		const U0 = this.flatU0;
		const D = this.flatD;
		const nf = n + 1;
		const { classLaw, classEotvos, classDragScale, classSwarmPow, reScale, capScale } = this;
		const invDz = 1 / dz;
		const lf = this.liquidFraction;
		const p = this.pressure;
		const rg = this.gasDensity;
		const ul = this.liquidVelocity;
		const rl = cfg.liquidDensityKgM3;
		const mul = cfg.liquidViscosityPaS;
		const mug = cfg.gasViscosityPaS;
		const g = cfg.gravityAxialMS2;
		const cp = cfg.interfacialPressureCoefficient;
		const vmModel = cfg.virtualMass;
		const vmConst = cfg.virtualMassCoefficient;
		const blend = cfg.dropletBlend;
		const dd = blend ? blend.dropDiameterM : 1;
		const frictionOn = cfg.wallFriction !== 'none';
		const courantScale = dt / dz;
		const top = cfg.top;
		const dragOn = this.lawIndex >= 0;
		// droplet Reynolds number per ρ_g |u_r| and droplet drag per α_l C_D·Re
		const redPerRhoG = dd / mug;
		const kdPerAlq = (0.75 * mug) / (dd * dd);
		for (let j = 1; j <= jMax; j++) {
			const below = j - 1;
			const isTop = j === n;
			const af = isTop ? 1 - lf[below] : 1 - 0.5 * (lf[below] + lf[j]);
			const lff = 1 - af;
			const ag = af > PRESENT_EPS ? af : PRESENT_EPS;
			const alq = lff > PRESENT_EPS ? lff : PRESENT_EPS;
			const rgf = isTop ? rg[below] : 0.5 * (rg[below] + rg[j]);
			const ulj = ul[j];
			const dnL = ulj >= 0 ? below : isTop ? below : j;
			let up = ulj >= 0 ? ul[j - 1] : j < n ? ul[j + 1] : ulj;
			const shareL = lf[dnL] / alq;
			let nu = (ulj < 0 ? -ulj : ulj) * courantScale * (shareL < 1 ? shareL : 1);
			const uls = ulj - (nu < 1 ? nu : 1) * (ulj - up);
			let w = 0;
			if (dragOn && blend && af > blend.fromHoldup) {
				const xb = af >= blend.toHoldup ? 1 : (af - blend.fromHoldup) / (blend.toHoldup - blend.fromHoldup);
				w = xb * xb * (3 - 2 * xb);
			}
			let cvm = 0;
			if (vmModel === 'constant') cvm = vmConst;
			else if (vmModel === 'zuber') {
				const ac = af < 0.9 ? af : 0.9;
				cvm = (0.5 * (1 + 2 * ac)) / (1 - ac);
			}
			const lam = frictionOn ? blasiusFrictionCoefficient(lff, rl, mul, ulj, cfg.diameterM) : 0;
			// Fine grids, two classes (the 5000-cell failure): the interfacial pressure is a force
			// C_p ρ_l u_r² (α_k/α) ∂α/∂z, quadratic in the slip like the drag, and at a dilute bubble front the
			// relative gradient ∂ln α/∂z of the donor-cell profile grows as 1/Δz. Once C_p |∂ln α/∂z| exceeds the
			// drag's (3/4) C_D/d (a holdup varying over less than a bubble size, outside the averaged model) the
			// net coupling is an anti-drag and the slip has no equilibrium: du_r/dt ∝ u_r² runs away within a few
			// hundred steps whatever the time step (large bubbles at 20-30 m/s at the front of the first gas at
			// 0.4 mm cells; cap bubbles with the Davies-Taylor factor have a quarter of the small bubbles' drag per
			// u_r², so they cross first). So per class the interfacial pressure may cancel the drag, never reverse
			// it: the coupling is max(K + K_ip, 0), implicit. Where the face holds no gas (mean fraction at the
			// floor) the gradient is round-off of holdups near zero divided by the floor and is dropped; negative
			// round-off holdups count as zero.
			// Each class takes its share of the gradient of the whole gas fraction: the gradient of a trace class's
			// own fraction, against the fast slip of drops in the freeboard, would be a spurious force per unit mass.
			const gb = 1 - lf[below];
			const ga = 1 - lf[j];
			const dadzGas = isTop || af <= PRESENT_EPS ? 0 : ((ga > 0 ? ga : 0) - (gb > 0 ? gb : 0)) * invDz;
			const ipScale = cp * rl * dadzGas;
			// face factors shared by the classes: the class's share of the face gas α_k/α times these
			const invAg = 1 / ag;
			const vScale = cvm * ((1 - w) * rl + w * alq * rgf * invAg);
			const redScale = rgf * redPerRhoG;
			const kdScale = alq * kdPerAlq;
			const lockScale = w > 0 ? CLASS_LOCK * w : 0;
			const ugMean = this.gasVelocity[j];
			let sumV = 0;
			let sumVug = 0;
			// the liquid equation's elimination of the classes, Σ_k q_k (m_k + lock_k), Σ_k q_k r_k, Σ_k q_k α_k with
			// q_k = b_k/a_k, gathered in the same pass
			const ml = alq * rl;
			let sMat = ml + lam * dt;
			let numK = 0;
			let dnum = alq;
			for (let k = 0; k < nc; k++) {
				const yo = k * n;
				const vo = k * nf + j;
				const ab = gb * Y[yo + below];
				const aa = isTop ? ab : ga * Y[yo + j];
				const akf = isTop ? ab : 0.5 * (ab + aa);
				const agk = akf > PRESENT_EPS ? akf : PRESENT_EPS;
				const ratio = agk * invAg;
				const ugj = V[vo];
				const ur = ugj - ulj;
				const aur = ur < 0 ? -ur : ur;
				const upG = ugj >= 0 ? V[vo - 1] : j < n ? V[vo + 1] : ugj;
				const shareG = (ugj >= 0 || isTop ? ab : aa) / agk;
				const nuG = (ugj < 0 ? -ugj : ugj) * courantScale * (shareG < 1 ? shareG : 1);
				const ugs = ugj - (nuG < 1 ? nuG : 1) * (ugj - upG);
				let kk = 0;
				if (dragOn) {
					const law = classLaw[k];
					let kb = law === SPHERICAL_CAP_CODE ? agk * aur * capScale[k] : agk * dragCdRe(law, aur * reScale[k], classEotvos[k], af) * classDragScale[k];
					const sp = classSwarmPow[k];
					if (sp !== 0) kb *= Math.exp(sp * Math.log(alq > 1e-6 ? alq : 1e-6));
					kk = kb;
					if (w > 0) {
						// above the level the gas is continuous: the droplet drag, shared among the classes by their holdup
						const red = redScale * aur;
						const cdRed = red <= 1000 ? 24 * (1 + 0.15 * (red > 0 ? Math.exp(0.687 * Math.log(red)) : 0)) : 0.44 * red;
						kk = (1 - w) * kb + w * (kdScale * cdRed * ratio);
					}
				}
				const v = vScale * agk;
				const kipRaw = ipScale * ur * ratio;
				const kip = kk + kipRaw > 0 ? kipRaw : -kk;
				const mg = agk * rgf;
				const b = v + (kk + kip) * dt;
				const lock = lockScale * mg;
				const inv = 1 / (mg + b + lock);
				const r = (mg + v) * ugs - v * uls + dt * mg * g + lock * ugMean;
				const q = b * inv;
				kInv[k] = inv;
				kB[k] = b;
				kR[k] = r;
				kAg[k] = agk;
				sMat += q * (mg + lock);
				numK += q * r;
				dnum += q * agk;
				sumV += v;
				sumVug += v * ugs;
			}
			const rlRhs = (ml + sumV) * uls - sumVug + dt * alq * rl * g;
			hf[j] = isTop ? 0.5 * dz : dz;
			dpOld[j] = isTop ? top.pressurePa - p[below] : p[j] - p[below];
			solved[j] = 1;
			if (isTop && top.kind === 'pressure' && top.liquid !== 'open') {
				for (let k = 0; k < nc; k++) {
					U0[k * nf + j] = kR[k] * kInv[k];
					D[k * nf + j] = dt * kAg[k] * kInv[k];
				}
				ul0[j] = 0;
				dl[j] = 0;
				continue;
			}
			const num = rlRhs + numK;
			const invS = 1 / sMat;
			const u0 = num * invS;
			const d0 = dt * dnum * invS;
			ul0[j] = u0;
			dl[j] = d0;
			for (let k = 0; k < nc; k++) {
				U0[k * nf + j] = (kR[k] + kB[k] * u0) * kInv[k];
				D[k * nf + j] = (dt * kAg[k] + kB[k] * d0) * kInv[k];
			}
		}
	}

	/**
	 * Class shares after the step: each class's gas mass is carried by its own flux (conservative, donor-cell; the
	 * masses `classMass` and their sum per cell are formed with the fluxes in `advance`); the cell's gas is then
	 * divided among the classes in proportion to those masses.
	 */
	private updateClassShares(sum: Float64Array): void {
		const { n, nc } = this;
		const m = this.classMass;
		for (let i = 0; i < n; i++) sum[i] = sum[i] > 1e-300 ? 1 / sum[i] : 0;
		for (let k = 0; k < nc; k++) {
			const y = this.classShare[k];
			const o = k * n;
			for (let i = 0; i < n; i++) if (sum[i] > 0) y[i] = m[o + i] * sum[i];
		}
	}

	/**
	 * Conservative repair (PHYSICS §18.1): the old-time donor choice can over-drain a cell when a velocity
	 * reverses within the step. A cell left with negative liquid takes the deficit back from the neighbour(s)
	 * its liquid flowed to; a cell left with negative gas (liquid above one) takes gas back from the
	 * neighbour(s) its gas flowed to, i.e. hands them the excess liquid. Liquid volume is conserved exactly.
	 */
	private repair(lf: Float64Array, liquidFlux: Float64Array, gasFlux: Float64Array, dtOverDz: number): void {
		const n = this.n;
		// an end that passes liquid can settle a share with the outside: the liquid flux through it is corrected
		// so the inventory bookkeeping stays exact
		const top = this.cfg.top;
		const topOpen = top.kind === 'pressure' && top.liquid === 'open';
		const bottomOpen = this.cfg.bottom.kind === 'inflow' && this.cfg.bottom.liquidVolumeFluxMS !== 0;
		for (let pass = 0; pass < 16; pass++) {
			let any = false;
			for (let i = 0; i < n; i++) {
				const v = lf[i];
				if (v < 0) {
					// liquid over-drained: take it back from where it went
					const toTop = liquidFlux[i + 1] > 0 && (i < n - 1 || topOpen) ? liquidFlux[i + 1] : 0;
					const toBot = liquidFlux[i] < 0 && (i > 0 || bottomOpen) ? -liquidFlux[i] : 0;
					const tot = toTop + toBot;
					if (tot > 0) {
						any = true;
						if (toTop > 0) {
							if (i < n - 1) lf[i + 1] += (v * toTop) / tot;
							else liquidFlux[n] += (v * toTop) / tot / dtOverDz;
						}
						if (toBot > 0) {
							if (i > 0) lf[i - 1] += (v * toBot) / tot;
							else liquidFlux[0] -= (v * toBot) / tot / dtOverDz;
						}
						lf[i] = 0;
					}
				} else if (v > 1) {
					// gas over-drained: take gas back from where it went, i.e. hand that side the excess liquid
					const toTop = gasFlux[i + 1] > 0 && (i < n - 1 || topOpen) ? gasFlux[i + 1] : 0;
					const toBot = gasFlux[i] < 0 && i > 0 ? -gasFlux[i] : 0;
					const tot = toTop + toBot;
					if (tot > 0) {
						any = true;
						const ex = v - 1;
						if (toTop > 0) {
							if (i < n - 1) lf[i + 1] += (ex * toTop) / tot;
							else liquidFlux[n] += (ex * toTop) / tot / dtOverDz;
						}
						if (toBot > 0) lf[i - 1] += (ex * toBot) / tot;
						lf[i] = 1;
					}
				}
			}
			if (!any) break;
		}
	}

	/** First failing cell, as a message naming cell, variable and time; null when all is well. */
	private check(): string | null {
		const { n } = this;
		const lf = this.liquidFraction;
		const p = this.pressure;
		const where = (i: number) => `cell ${i} (z = ${this.zCentre[i].toFixed(3)} m) at t = ${this.timeS.toFixed(4)} s`;
		for (let i = 0; i < n; i++) {
			const a = 1 - lf[i];
			const pi = p[i];
			// one comparison chain for the common case; messages are built only on failure
			if (a >= -1e-9 && a <= 1 + 1e-9 && pi > 0 && pi < Number.POSITIVE_INFINITY) continue;
			if (!Number.isFinite(a)) return `holdup is not a number in ${where(i)}`;
			if (!Number.isFinite(pi)) return `pressure is not a number in ${where(i)}`;
			if (a < -1e-9 || a > 1 + 1e-9) return `holdup ${a.toPrecision(6)} is outside [0, 1] in ${where(i)}`;
			return `pressure ${pi.toPrecision(6)} Pa is not positive in ${where(i)}`;
		}
		// several classes: one pass over each class's velocities first; the face loop names the first bad one
		let classesBad = false;
		for (let k = 1; k < this.nc && !classesBad; k++) {
			const uk = this.classVelocity[k];
			for (let j = 0; j <= n; j++) {
				const u = uk[j];
				if (!(u - u === 0)) {
					classesBad = true;
					break;
				}
			}
		}
		for (let j = 0; j <= n; j++) {
			if (classesBad) for (let k = 1; k < this.nc; k++) {
				if (!Number.isFinite(this.classVelocity[k][j])) return `velocity of the ${this.classes[k].label.toLowerCase()} is not a number at face ${j} (z = ${(j * this.dz).toFixed(3)} m) at t = ${this.timeS.toFixed(4)} s`;
			}
			if (!Number.isFinite(this.gasVelocity[j]) || !Number.isFinite(this.liquidVelocity[j])) {
				return `${Number.isFinite(this.gasVelocity[j]) ? 'liquid' : 'gas'} velocity is not a number at face ${j} (z = ${(j * this.dz).toFixed(3)} m) at t = ${this.timeS.toFixed(4)} s`;
			}
		}
		return null;
	}

	/** A batch column whose aerated level reaches the closed top cannot reach a steady state: say so. */
	private overflow(): string | null {
		const top = this.cfg.top;
		if (top.kind !== 'pressure' || top.liquid !== 'closed') return null;
		const i = this.n - 1;
		if (this.liquidFraction[i] <= 0.5) return null;
		return `holdup ${(1 - this.liquidFraction[i]).toFixed(3)} in the top cell ${i} (z = ${this.zCentre[i].toFixed(3)} m) at t = ${this.timeS.toFixed(4)} s: the aerated level reached the top outlet; the column is too short for this gas rate and clear-liquid level`;
	}

	private fail(message: string): RunStatus {
		this.status = 'failed';
		const cfg = this.cfg;
		const noVirtualMass = cfg.drag !== 'none' && (cfg.virtualMass === 'none' || (cfg.virtualMass === 'constant' && cfg.virtualMassCoefficient === 0));
		// PHYSICS §18.1: without virtual mass the bubble front and the level are weakly damped
		this.message = noVirtualMass ? `${message} (the case has no virtual mass, which leaves bubble fronts and the level weakly damped: try the constant coefficient 0.5)` : message;
		return this.status;
	}
}
