/**
 * Coalescence and breakup among the size classes of the height-profile model, as an operator-split source step
 * after each time step of the class transport (and of the mass transfer).
 *
 * In every cell of the bubbly region (at and below the cell holding the aerated level, from the top the first with
 * α < 0.5; above it the gas is continuous and its classes lose their identity) the class holdups α y_k are turned
 * into bubble numbers per unit volume N_k = α y_k / x_k on the pivots x_k of the size classes, the fixed-pivot class
 * method of Kumar & Ramkrishna (1996), Chem. Eng. Sci. 51, 1311 (`population/pivot.ts`) is integrated over the step
 * (`population/integrate.ts`), and the new shares are y_k = x_k N_k / Σ x_j N_j. The cell's gas (α, ρ_g) is not
 * touched, so its gas mass is kept exactly and the class masses α ρ_g y_k add up to it to round-off; the class
 * method itself keeps Σ x_k N_k to round-off.
 *
 * Kernels: Prince & Blanch (1990), AIChE J. 36, 1485, turbulent and buoyancy-driven collisions with their
 * film-drainage efficiency (laminar-shear collisions left out: no mean shear in a 1-D column), and Luo & Svendsen (1996),
 * AIChE J. 42, 1225, binary breakup by turbulent eddies with the liquid fraction 1 − α of the cell. The turbulence
 * dissipation rate is the power input of the rising gas per unit liquid mass, ε ≈ g U_G (common practice), with U_G the
 * local superficial gas velocity of the steady column, G/ρ_g (G the gas mass flux fed, ρ_g the cell's gas density).
 * The kernels are tabulated on levels of ε 2 % apart (ε^⅓ within 0.4 %), each level once, when a cell first needs it.
 *
 * Bubbles do not grow by the expansion of their gas between pivots (the pivots are volumes at the local pressure);
 * the expansion changes the holdup, not the distribution.
 *
 * With mass transfer the solute moves with the gas: the gas a class keeps keeps its mole fraction, the gas it gains
 * carries the mean mole fraction of the gas the other classes lost, so the solute in the gas is kept to round-off.
 */
import { GRAVITY_MS2 } from '../fluids.js';
import { pivotGrid, type PivotGrid } from '../population/grid.js';
import { createPopulationBalance, type KernelTable, type PopulationBalance } from '../population/pivot.js';
import { createPopulationIntegrator, type PopulationIntegrator } from '../population/integrate.js';
import { luoSvendsenBreakage, princeBlanchCoalescence } from '../population/kernels.js';
import type { HeightModel } from './model.js';
import type { SizeClassSourceConfig } from './config.js';
import type { SoluteTransport } from './transfer.js';

/** Ratio of successive ε levels of the kernel tables. */
const DISSIPATION_LEVEL_RATIO = 1.02;
/** A cell with less gas than this takes no part (nothing to redistribute). */
const MIN_HOLDUP = 1e-9;

/** Work done by the source since the start (cost reporting). */
export interface SizeClassSourceStats {
	/** cell integrations */
	cellSteps: number;
	acceptedSteps: number;
	rejectedSteps: number;
	rateEvaluations: number;
	/** kernel tables evaluated (one per level of ε) */
	tables: number;
}

export class SizeClassSource {
	readonly cfg: SizeClassSourceConfig;
	readonly model: HeightModel;
	readonly grid: PivotGrid;
	readonly stats: SizeClassSourceStats = { cellSteps: 0, acceptedSteps: 0, rejectedSteps: 0, rateEvaluations: 0, tables: 0 };
	private readonly balance: PopulationBalance;
	private readonly integrator: PopulationIntegrator;
	private readonly tables = new Map<number, KernelTable>();
	/** the table of the cell: coalescence and daughters shared with a level's table, breakup rates times 1 − α */
	private readonly cellTable: KernelTable;
	private readonly N: Float64Array;
	private readonly shareOld: Float64Array;
	/** ε of level 0, W/kg (at the reference gas density); 0 without gas fed */
	private readonly baseDissipation: number;
	private readonly gasMassFlux: number;

	constructor(model: HeightModel, cfg: SizeClassSourceConfig) {
		this.model = model;
		this.cfg = cfg;
		this.grid = pivotGrid({ minDiameterM: cfg.minDiameterM, ratio: cfg.volumeRatio, classes: cfg.classes });
		if (model.nc !== this.grid.classes) throw new Error(`Size classes: the model has ${model.nc} classes, the grid ${this.grid.classes}`);
		for (let k = 0; k < model.nc; k++) {
			const d = model.classes[k].diameterM;
			if (Math.abs(d - this.grid.diametersM[k]) > 1e-12 * d) throw new Error(`Size classes: class ${k + 1} has ${d} m, its pivot ${this.grid.diametersM[k]} m`);
		}
		this.balance = createPopulationBalance(this.grid);
		this.integrator = createPopulationIntegrator(this.balance);
		const n = this.grid.classes;
		this.cellTable = { coalescence: new Float64Array(0), breakageRate: new Float64Array(n), daughters: new Float64Array(0), hasCoalescence: false, hasBreakage: false };
		this.N = new Float64Array(n);
		this.shareOld = new Float64Array(n);
		const bottom = model.cfg.bottom;
		this.gasMassFlux = bottom.kind === 'inflow' ? Math.max(bottom.gasMassFluxKgM2S, 0) : 0;
		const rhoRef = model.cfg.gasDensityKgM3 ?? model.cfg.referenceGasDensityKgM3;
		this.baseDissipation = (GRAVITY_MS2 * this.gasMassFlux) / rhoRef;
	}

	/** Turbulence dissipation rate of cell i, ε = g G/ρ_g, W/kg (common practice: power input of the gas per unit liquid mass). */
	dissipationRate(i: number): number {
		const rg = this.model.cfg.gasDensityKgM3 ?? this.model.gasDensity[i];
		return rg > 0 ? (GRAVITY_MS2 * this.gasMassFlux) / rg : 0;
	}

	/** The kernels at ε level L (ε = ε₀ · 1.02^L), tabulated once. */
	private table(level: number): KernelTable {
		let t = this.tables.get(level);
		if (t) return t;
		const m = this.model.cfg;
		const eps = this.baseDissipation * Math.pow(DISSIPATION_LEVEL_RATIO, level);
		const liquid = { liquidDensityKgM3: m.liquidDensityKgM3, surfaceTensionNM: m.surfaceTensionNM };
		t = this.balance.tabulate({
			...(this.cfg.coalescence ? { coalescence: princeBlanchCoalescence({ dissipationM2S3: eps, ...liquid, buoyancy: true }) } : {}),
			...(this.cfg.breakup ? { breakage: luoSvendsenBreakage({ dissipationM2S3: eps, ...liquid, liquidViscosityPaS: m.liquidViscosityPaS }) } : {})
		});
		this.tables.set(level, t);
		this.stats.tables++;
		return t;
	}

	/** Top cell of the bubbly region: from the top, the first cell with α < 0.5 (−1: none). */
	bubblyTopCell(): number {
		const lf = this.model.liquidFraction;
		for (let i = this.model.n - 1; i >= 0; i--) if (1 - lf[i] < 0.5) return i;
		return -1;
	}

	/**
	 * Coalescence and breakup over the step dt in every cell of the bubbly region; with mass transfer the solute mole
	 * fractions of the classes follow the gas. Throws if the class method cannot keep the classes non-negative.
	 */
	apply(dt: number, transfer: SoluteTransport | null = null): void {
		if (!(dt > 0) || !(this.baseDissipation > 0) || !(this.cfg.coalescence || this.cfg.breakup)) return;
		const m = this.model;
		const nc = m.nc;
		const x = this.grid.volumesM3;
		const lf = m.liquidFraction;
		const N = this.N;
		const old = this.shareOld;
		const ct = this.cellTable;
		const logRatio = Math.log(DISSIPATION_LEVEL_RATIO);
		const options = { relativeTolerance: this.cfg.relativeTolerance ?? 1e-5 };
		const top = this.bubblyTopCell();
		for (let i = 0; i <= top; i++) {
			const a = 1 - lf[i];
			if (!(a > MIN_HOLDUP)) continue;
			const eps = this.dissipationRate(i);
			const level = Math.round(Math.log(eps / this.baseDissipation) / logRatio);
			const t = this.table(level);
			ct.coalescence = t.coalescence;
			ct.daughters = t.daughters;
			ct.hasCoalescence = t.hasCoalescence;
			ct.hasBreakage = t.hasBreakage;
			// Luo & Svendsen (1996): the breakup rate carries the liquid fraction 1 − α
			for (let k = 0; k < nc; k++) ct.breakageRate[k] = t.breakageRate[k] * lf[i];
			for (let k = 0; k < nc; k++) {
				const y = m.classShare[k][i];
				old[k] = y;
				N[k] = (a * y) / x[k];
			}
			const s = this.integrator.advance(N, ct, dt, options);
			this.stats.cellSteps++;
			this.stats.acceptedSteps += s.acceptedSteps;
			this.stats.rejectedSteps += s.rejectedSteps + s.positivityRejections;
			this.stats.rateEvaluations += s.rateEvaluations;
			let sum = 0;
			for (let k = 0; k < nc; k++) sum += x[k] * N[k];
			if (!(sum > 0)) continue;
			for (let k = 0; k < nc; k++) m.classShare[k][i] = (x[k] * N[k]) / sum;
			if (transfer) this.carrySolute(transfer, i);
		}
		m.mixGasVelocity();
		if (transfer) transfer.captureOld();
	}

	/** The solute follows the gas of cell i from the old shares (`shareOld`) to the new ones. */
	private carrySolute(tr: SoluteTransport, i: number): void {
		const m = this.model;
		const nc = m.nc;
		const old = this.shareOld;
		let lost = 0;
		let lostSolute = 0;
		for (let k = 0; k < nc; k++) {
			const d = old[k] - m.classShare[k][i];
			if (d > 0) {
				lost += d;
				lostSolute += d * tr.moleFraction[k][i];
			}
		}
		if (!(lost > 0)) return;
		const pool = lostSolute / lost;
		for (let k = 0; k < nc; k++) {
			const y = m.classShare[k][i];
			const gain = y - old[k];
			if (gain > 0) tr.moleFraction[k][i] = ((y - gain) * tr.moleFraction[k][i] + gain * pool) / y;
		}
	}
}
