/**
 * The height-profile simulation object: drives `HeightModel`, detects steady state from integral
 * measures over fixed windows of simulated time, and reports residuals, snapshots, checkpoints and results.
 *
 * Steady rule (PHYSICS §18.1: integral measures over windows, not instantaneous values): over each window
 * of `steadyWindowS` of simulated time
 *   gasMassImbalance     |∫(gas in − gas out) dt| / ∫(gas fed) dt
 *   liquidMassImbalance  |∫(liquid in − liquid out) dt| (volume) / ∫(gas fed, volume at the sparger) dt
 *   holdupChangeRate     max over cells of |Δα| over the window, per second
 *   overallHoldupChange  |Δε| over the window, per second, ε the holdup below the level
 *   liquidCentreRate     |Δz_c|/Δt of the liquid's centre of height over the gas feed velocity (catches
 *                        liquid still raining back from the freeboard while ε already looks steady)
 *   momentumImbalance    max over faces of |Δu_k| over the window per second, for each phase present
 *                        there, in units of g (the largest unbalanced acceleration)
 * all at or below the steady tolerance ⇒ converged. The values shown before the first window closes are 1.
 * With mass transfer in batch or continuous mode (`transfer.ts`) one more measure joins them:
 *   soluteChangeRate     max over cells holding liquid of |Δc| over the window, per second, over the
 *                        saturation concentration of the gas fed at the top pressure
 * In steady mode the transfer is solved for its steady state once the hydrodynamics has converged (or the run ends).
 */
import type { CaseDocument } from '../case.js';
import type { Checkpoint, Residuals, Results, Simulation, SimulationState, Snapshot, StepStatus, DesignNumber, RunStatus } from '../types.js';
import { HeightModel } from './model.js';
import { configFromCase, type HeightModelConfig } from './config.js';
import { akitaYoshidaHoldup, hughmarkHoldup } from '../correlations/holdup.js';
import { zuberFindlayHoldup } from '../correlations/drift-flux.js';
import { higbieMassTransferCoefficient } from '../correlations/mass-transfer.js';
import { regimeFromBand, regimeFromTransition } from '../correlations/regime.js';
import { hikitaHoldup } from '../correlations/churn.js';
import { canContinueCheckpoint, SOLVER_VERSION } from '../version.js';
import { SoluteTransport } from './transfer.js';
import { classFieldSuffix } from './classes.js';
import { SizeClassSource } from './population-source.js';
import { deckwerWallHeatTransfer } from '../correlations/heat-transfer.js';
import { bensonKrauseOxygenSaturationKgM3, effectiveSaturationDepthM } from '../correlations/solubility.js';
import { NORMAL_PRESSURE_PA } from '../fluids.js';

export const HEIGHT_MODEL_VERSION = SOLVER_VERSION;


/** The status record of an ordinary step, shared so a running simulation allocates nothing per step. */
const RUNNING: StepStatus = Object.freeze({ status: 'running' });

/** Stable residual ids of the height-profile model (database and chart keys). */
export const residualNames = ['gasMassImbalance', 'liquidMassImbalance', 'holdupChangeRate', 'overallHoldupChange', 'liquidCentreRate', 'momentumImbalance'] as const;

/** Longest dissolved-concentration series kept: beyond it every other sample is dropped and the interval doubled. */
const MAX_SERIES_POINTS = 20000;
/** Customary temperature coefficient of kLa for oxygen in clean water (ASCE/EWRI 2-06 practice; PHYSICS §13.1). */
const KLA_THETA = 1.024;

export interface HeightSimulation extends Simulation {
	/** the underlying model (tests and the benchmark read its arrays) */
	readonly model: HeightModel;
	/** the dissolved gas along the column; null without mass transfer */
	readonly transfer: SoluteTransport | null;
	/** coalescence and breakup among the size classes; null for the other bubble-class models */
	readonly sizeClasses: SizeClassSource | null;
	/** level (α = 0.5 crossing from the top), m */
	level(): number;
	/** gas holdup below the level */
	overallHoldup(): number;
	/** liquid volume per column cross-section, m */
	liquidInventoryM(): number;
}

/** Build a height-profile simulation from a validated case, optionally overriding model settings. */
export function createHeightSimulation(caseDoc: CaseDocument, overrides: Partial<HeightModelConfig> = {}): HeightSimulation {
	return new HeightSimulationImpl(caseDoc, { ...configFromCase(caseDoc), ...overrides });
}

/** Build a height-profile simulation from a model configuration alone (verification problems). */
export function createHeightSimulationFromConfig(caseDoc: CaseDocument, cfg: HeightModelConfig): HeightSimulation {
	return new HeightSimulationImpl(caseDoc, cfg);
}

class HeightSimulationImpl implements HeightSimulation {
	readonly caseDoc: CaseDocument;
	readonly model: HeightModel;
	private readonly cfg: HeightModelConfig;
	private readonly gasRef: number;
	private readonly volumeRef: number;
	private readonly liquid0: number;
	// window accumulators (checkpointed)
	private winStartS = 0;
	private winHoldup = 0;
	private winCentre = 0;
	private winGasIn = 0;
	private winGasOut = 0;
	private winLiqIn = 0;
	private winLiqOut = 0;
	private liquidNetInM = 0;
	private windows = 0;
	private res = { gasMassImbalance: 1, liquidMassImbalance: 1, overallHoldupChange: 1, liquidCentreRate: 1, holdupChangeRate: 1, momentumImbalance: 1 };
	/** liquid fraction and face velocities at the start of the current window */
	private readonly winLiquid: Float64Array;
	private readonly winGasVelocity: Float64Array;
	private readonly winLiquidVelocity: Float64Array;
	readonly transfer: SoluteTransport | null;
	readonly sizeClasses: SizeClassSource | null;
	/** batch and continuous transfer: the solute must be steady too before the run counts as converged */
	private readonly soluteInCriterion: boolean;
	private soluteChangeRate = 1;
	/** concentration at the start of the window and the scale of its change rate, kg/m³ */
	private readonly winConcentration: Float64Array | null;
	private readonly concentrationScale: number;
	/** the batch run's liquid-average concentration at the sample times */
	private seriesTimeS: number[] = [];
	private seriesConcentration: number[] = [];
	private sampleIntervalS = 0;
	private nextSample = 1;
	/** steady mode: whether the steady transfer problem has been solved at the end */
	private steadyState: 'pending' | 'solved' | 'none' = 'pending';

	constructor(caseDoc: CaseDocument, cfg: HeightModelConfig) {
		this.caseDoc = caseDoc;
		this.cfg = cfg;
		this.model = new HeightModel(cfg);
		this.winLiquid = Float64Array.from(this.model.liquidFraction);
		this.winGasVelocity = Float64Array.from(this.model.gasVelocity);
		this.winLiquidVelocity = Float64Array.from(this.model.liquidVelocity);
		const fin = cfg.bottom.kind === 'inflow' ? cfg.bottom.gasMassFluxKgM2S : 0;
		const rhoRef = cfg.gasDensityKgM3 ?? cfg.referenceGasDensityKgM3;
		// with no gas fed, normalise by a 1 mm/s gas flux so the measures stay finite
		this.gasRef = fin > 0 ? fin : rhoRef * 1e-3;
		this.volumeRef = this.gasRef / rhoRef;
		this.liquid0 = this.liquidInventoryM();
		this.winHoldup = this.overallHoldup();
		this.winCentre = this.liquidCentre();
		const t = cfg.transfer;
		this.transfer = t ? new SoluteTransport(this.model, t) : null;
		this.sizeClasses = cfg.sizeClasses ? new SizeClassSource(this.model, cfg.sizeClasses) : null;
		this.soluteInCriterion = !!t && t.mode !== 'steady';
		this.winConcentration = this.transfer ? Float64Array.from(this.transfer.concentration) : null;
		this.concentrationScale = t
			? Math.max(t.henryKgM3Pa * t.inletGasMoleFraction * Math.max(cfg.top.pressurePa - t.vapourPressurePa, 0), t.inletConcentrationKgM3, t.initialConcentrationKgM3, 1e-12)
			: 1;
		if (t && t.mode === 'batch') {
			this.sampleIntervalS = t.sampleIntervalS;
			this.seriesTimeS.push(0);
			this.seriesConcentration.push(this.transfer!.meanConcentration());
		}
	}

	get state(): SimulationState {
		const m = this.model;
		const s: SimulationState = { step: m.stepCount, timeS: m.timeS, dtS: m.dtS, status: m.status };
		if (m.message) s.message = m.message;
		return s;
	}

	step(): StepStatus {
		const m = this.model;
		if (m.status !== 'running') return m.message ? { status: m.status, message: m.message } : { status: m.status };
		const status = m.advance();
		const tr = this.transfer;
		if (tr && status !== 'failed') {
			tr.step(m.dtS);
			const mean = tr.meanConcentration();
			if (!Number.isFinite(mean)) {
				m.status = 'failed';
				m.message = `the dissolved concentration is not a number at t = ${m.timeS.toFixed(4)} s`;
			} else if (this.sampleIntervalS > 0) this.sample(mean);
		}
		const pop = this.sizeClasses;
		if (pop && m.status !== 'failed') {
			// operator split: coalescence and breakup after the transport of the classes (and of the solute)
			try {
				pop.apply(m.dtS, tr);
			} catch (e) {
				m.status = 'failed';
				m.message = `coalescence and breakup at t = ${m.timeS.toFixed(4)} s: ${e instanceof Error ? e.message : String(e)}`;
			}
		}
		const dt = m.dtS;
		this.winGasIn += m.diag.gasInKgM2S * dt;
		this.winGasOut += m.diag.gasOutKgM2S * dt;
		this.winLiqIn += m.diag.liquidInMS * dt;
		this.winLiqOut += m.diag.liquidOutMS * dt;
		this.liquidNetInM += (m.diag.liquidInMS - m.diag.liquidOutMS) * dt;
		if (status === 'running' || status === 'finished') {
			const span = m.timeS - this.winStartS;
			if (span >= this.cfg.steadyWindowS * (1 - 1e-9)) this.closeWindow(span);
		}
		const after = m.status as RunStatus;
		if (tr && tr.cfg.mode === 'steady' && this.steadyState === 'pending' && (after === 'converged' || after === 'finished')) {
			this.steadyState = tr.solveSteady() ? 'solved' : 'none';
		}
		if (m.status === 'running') return RUNNING;
		return m.message ? { status: m.status, message: m.message } : { status: m.status };
	}

	/** Add the batch run's liquid-average concentration to its series when simulated time passes the next sample time. */
	private sample(mean: number): void {
		const t = this.model.timeS;
		if (t < this.nextSample * this.sampleIntervalS * (1 - 1e-12)) return;
		this.seriesTimeS.push(t);
		this.seriesConcentration.push(mean);
		if (this.seriesTimeS.length > MAX_SERIES_POINTS) {
			this.seriesTimeS = this.seriesTimeS.filter((_, i) => i % 2 === 0);
			this.seriesConcentration = this.seriesConcentration.filter((_, i) => i % 2 === 0);
			this.sampleIntervalS *= 2;
		}
		this.nextSample = Math.floor((t / this.sampleIntervalS) * (1 + 1e-12)) + 1;
	}

	private closeWindow(span: number): void {
		const m = this.model;
		const eps = this.overallHoldup();
		const zc = this.liquidCentre();
		this.res.gasMassImbalance = Math.abs(this.winGasIn - this.winGasOut) / (this.gasRef * span);
		this.res.liquidMassImbalance = Math.abs(this.winLiqIn - this.winLiqOut) / (this.volumeRef * span);
		this.res.overallHoldupChange = Math.abs(eps - this.winHoldup) / span;
		this.res.liquidCentreRate = Math.abs(zc - this.winCentre) / span / this.volumeRef;
		let maxChange = 0;
		const lf = m.liquidFraction;
		const w = this.winLiquid;
		for (let i = 0; i < m.n; i++) {
			const d = Math.abs(lf[i] - w[i]);
			if (d > maxChange) maxChange = d;
			w[i] = lf[i];
		}
		this.res.holdupChangeRate = maxChange / span;
		// largest change of a face velocity of a phase present there (fraction above 1e-4), as an unbalanced
		// acceleration in units of g
		let maxAccel = 0;
		const ug = m.gasVelocity;
		const ul = m.liquidVelocity;
		const wg = this.winGasVelocity;
		const wl = this.winLiquidVelocity;
		for (let j = 0; j <= m.n; j++) {
			const lfBelow = j > 0 ? lf[j - 1] : lf[0];
			const lfAbove = j < m.n ? lf[j] : lf[m.n - 1];
			const lff = 0.5 * (lfBelow + lfAbove);
			if (1 - lff > 1e-4) maxAccel = Math.max(maxAccel, Math.abs(ug[j] - wg[j]));
			if (lff > 1e-4) maxAccel = Math.max(maxAccel, Math.abs(ul[j] - wl[j]));
			wg[j] = ug[j];
			wl[j] = ul[j];
		}
		this.res.momentumImbalance = maxAccel / span / Math.abs(this.cfg.gravityAxialMS2);
		const wc = this.winConcentration;
		if (wc && this.transfer) {
			const c = this.transfer.concentration;
			let maxDc = 0;
			for (let i = 0; i < m.n; i++) {
				if (lf[i] > 1e-3) {
					const d = Math.abs(c[i] - wc[i]);
					if (d > maxDc) maxDc = d;
				}
				wc[i] = c[i];
			}
			this.soluteChangeRate = maxDc / span / this.concentrationScale;
		}
		this.windows++;
		this.winStartS = m.timeS;
		this.winHoldup = eps;
		this.winCentre = zc;
		this.winGasIn = 0;
		this.winGasOut = 0;
		this.winLiqIn = 0;
		this.winLiqOut = 0;
		const tol = this.cfg.steadyTolerance;
		const r = this.res;
		if (
			this.cfg.detectSteady &&
			m.status === 'running' &&
			r.gasMassImbalance <= tol &&
			r.liquidMassImbalance <= tol &&
			r.overallHoldupChange <= tol &&
			r.liquidCentreRate <= tol &&
			r.holdupChangeRate <= tol &&
			r.momentumImbalance <= tol &&
			(!this.soluteInCriterion || this.soluteChangeRate <= tol)
		) {
			m.status = 'converged';
		}
	}

	residuals(): Residuals {
		if (this.soluteInCriterion) return { ...this.res, soluteChangeRate: this.soluteChangeRate };
		return { ...this.res };
	}

	level(): number {
		const m = this.model;
		const lf = m.liquidFraction;
		const n = m.n;
		for (let i = n - 1; i >= 0; i--) {
			const a = 1 - lf[i];
			if (a < 0.5) {
				if (i === n - 1) return this.cfg.heightM;
				const a1 = 1 - lf[i + 1];
				return m.zCentre[i] + ((0.5 - a) / (a1 - a)) * m.dz;
			}
		}
		return 0;
	}

	/** Liquid volume per area below height z, m. */
	private liquidBelow(z: number): number {
		const m = this.model;
		let v = 0;
		for (let i = 0; i < m.n; i++) {
			const z0 = i * m.dz;
			if (z0 >= z) break;
			const h = Math.min(m.dz, z - z0);
			v += m.liquidFraction[i] * h;
		}
		return v;
	}

	overallHoldup(): number {
		const h = this.level();
		return h > 0 ? 1 - this.liquidBelow(h) / h : 0;
	}

	liquidInventoryM(): number {
		const m = this.model;
		let v = 0;
		for (let i = 0; i < m.n; i++) v += m.liquidFraction[i];
		return v * m.dz;
	}

	/** Per-class holdup, slip, interfacial area and kLa below the level (several classes). */
	private classSummary(level: number) {
		const m = this.model;
		const cfg = this.cfg;
		const classes = m.classes.map((c) => ({ suffix: classFieldSuffix(c.id), label: c.label, diameterM: c.diameterM, holdup: 0, slipMS: 0 }));
		let areaSum = 0;
		let gasSum = 0;
		let invSum = 0;
		for (let k = 0; k < m.nc; k++) {
			let vol = 0;
			let slip = 0;
			const uk = m.classVelocity[k];
			for (let i = 0; i < m.n; i++) {
				const z0 = i * m.dz;
				if (z0 >= level) break;
				const h = Math.min(m.dz, level - z0);
				const a = m.classHoldup(k, i) * h;
				vol += a;
				slip += a * (0.5 * (uk[i] + uk[i + 1]) - 0.5 * (m.liquidVelocity[i] + m.liquidVelocity[i + 1]));
			}
			classes[k].holdup = level > 0 ? vol / level : 0;
			classes[k].slipMS = vol > 0 ? slip / vol : 0;
			gasSum += classes[k].holdup;
			invSum += classes[k].holdup / classes[k].diameterM;
			areaSum += (6 * classes[k].holdup) / classes[k].diameterM;
		}
		let kLaPerS = 0;
		for (const k of classes) {
			if (k.slipMS > 0) kLaPerS += higbieMassTransferCoefficient({ diffusivityM2S: cfg.soluteDiffusivityM2S, diameterM: k.diameterM, slipMS: k.slipMS }) * ((6 * k.holdup) / k.diameterM);
		}
		return { classes, areaPerM: areaSum, kLaPerS, sauterM: invSum > 0 ? gasSum / invSum : classes[0].diameterM };
	}

	private liquidCentre(): number {
		const m = this.model;
		let s = 0;
		let w = 0;
		for (let i = 0; i < m.n; i++) {
			s += m.liquidFraction[i] * m.zCentre[i];
			w += m.liquidFraction[i];
		}
		return w > 0 ? s / w : 0;
	}

	snapshot(): Snapshot {
		const m = this.model;
		const n = m.n;
		const holdup = new Float64Array(n);
		const gasVelocity = new Float64Array(n);
		const liquidVelocity = new Float64Array(n);
		const slip = new Float64Array(n);
		const sauterDiameter = new Float64Array(n);
		for (let i = 0; i < n; i++) {
			holdup[i] = 1 - m.liquidFraction[i];
			gasVelocity[i] = 0.5 * (m.gasVelocity[i] + m.gasVelocity[i + 1]);
			liquidVelocity[i] = 0.5 * (m.liquidVelocity[i] + m.liquidVelocity[i + 1]);
			slip[i] = gasVelocity[i] - liquidVelocity[i];
			// d32 = Σ α_k / Σ (α_k/d_k), from the class shares (defined even where there is no gas)
			let inv = 0;
			for (let k = 0; k < m.nc; k++) inv += m.classShare[k][i] / m.classes[k].diameterM;
			sauterDiameter[i] = inv > 0 ? 1 / inv : m.classes[0].diameterM;
		}
		const fields: Record<string, Float64Array> = { holdup, gasVelocity, liquidVelocity, pressure: Float64Array.from(m.pressure), gasDensity: Float64Array.from(m.gasDensity), slip, sauterDiameter };
		if (m.nc > 1) {
			for (let k = 0; k < m.nc; k++) {
				const id = classFieldSuffix(m.classes[k].id);
				const a = new Float64Array(n);
				const u = new Float64Array(n);
				const uk = m.classVelocity[k];
				for (let i = 0; i < n; i++) {
					a[i] = m.classHoldup(k, i);
					u[i] = 0.5 * (uk[i] + uk[i + 1]);
				}
				fields[`holdup${id}`] = a;
				fields[`gasVelocity${id}`] = u;
			}
		}
		const tr = this.transfer;
		if (tr) {
			const dissolved = Float64Array.from(tr.concentration);
			const saturation = new Float64Array(n);
			const mole = new Float64Array(n);
			const rate = new Float64Array(n);
			for (let i = 0; i < n; i++) {
				mole[i] = tr.mixedMoleFraction(i);
				saturation[i] = tr.saturationFactor[i] * mole[i];
				rate[i] = tr.transferRate(i);
			}
			fields.dissolvedConcentration = dissolved;
			fields.saturationConcentration = saturation;
			fields.gasMoleFraction = mole;
			fields.transferRate = rate;
			if (m.nc > 1) for (let k = 0; k < m.nc; k++) fields[`gasMoleFraction${classFieldSuffix(m.classes[k].id)}`] = Float64Array.from(tr.moleFraction[k]);
		}
		return { step: m.stepCount, timeS: m.timeS, x: Float64Array.from(m.zCentre), fields };
	}

	checkpoint(): Checkpoint {
		const m = this.model;
		return {
			kind: 'height-profile',
			solverVersion: HEIGHT_MODEL_VERSION,
			step: m.stepCount,
			timeS: m.timeS,
			data: {
				cells: m.n,
				liquidFraction: Float64Array.from(m.liquidFraction),
				pressure: Float64Array.from(m.pressure),
				gasDensity: Float64Array.from(m.gasDensity),
				gasVelocity: Float64Array.from(m.gasVelocity),
				liquidVelocity: Float64Array.from(m.liquidVelocity),
				timeS: m.timeS,
				stepCount: m.stepCount,
				dtS: m.dtS,
				status: m.status,
				message: m.message ?? '',
				lastMaxHoldupRate: m.lastMaxHoldupRate,
				winStartS: this.winStartS,
				winHoldup: this.winHoldup,
				winCentre: this.winCentre,
				winGasIn: this.winGasIn,
				winGasOut: this.winGasOut,
				winLiqIn: this.winLiqIn,
				winLiqOut: this.winLiqOut,
				liquidNetInM: this.liquidNetInM,
				windows: this.windows,
				windowLiquidFraction: Float64Array.from(this.winLiquid),
				windowGasVelocity: Float64Array.from(this.winGasVelocity),
				windowLiquidVelocity: Float64Array.from(this.winLiquidVelocity),
				residuals: [this.res.gasMassImbalance, this.res.liquidMassImbalance, this.res.overallHoldupChange, this.res.liquidCentreRate, this.res.holdupChangeRate, this.res.momentumImbalance],
				...this.classCheckpoint(),
				...this.transferCheckpoint()
			}
		};
	}

	/** Dissolved and gas-side solute, totals, window and series (mass transfer only: other checkpoints are unchanged). */
	private transferCheckpoint(): Record<string, Float64Array | number | string | number[]> {
		const tr = this.transfer;
		if (!tr) return {};
		const t = tr.totals;
		const out: Record<string, Float64Array | number | string | number[]> = {
			transferConcentration: Float64Array.from(tr.concentration),
			transferTotals: [t.transferredKgM2, t.liquidInKgM2, t.liquidOutKgM2, t.gasInKgM2, t.gasOutKgM2],
			transferWindowConcentration: Float64Array.from(this.winConcentration!),
			soluteChangeRate: this.soluteChangeRate,
			transferSeriesTimeS: Float64Array.from(this.seriesTimeS),
			transferSeriesConcentration: Float64Array.from(this.seriesConcentration),
			transferSampleIntervalS: this.sampleIntervalS,
			transferNextSample: this.nextSample,
			transferSteadyState: this.steadyState
		};
		for (let k = 0; k < tr.nc; k++) out[`transferMoleFraction${k}`] = Float64Array.from(tr.moleFraction[k]);
		return out;
	}

	/** Class shares and velocities (several classes only: a one-class checkpoint is unchanged). */
	private classCheckpoint(): Record<string, Float64Array | number> {
		const m = this.model;
		if (m.nc === 1) return {};
		const out: Record<string, Float64Array | number> = { classes: m.nc };
		for (let k = 0; k < m.nc; k++) {
			out[`classShare${k}`] = Float64Array.from(m.classShare[k]);
			out[`classVelocity${k}`] = Float64Array.from(m.classVelocity[k]);
		}
		return out;
	}

	restore(cp: Checkpoint): void {
		const m = this.model;
		const d = cp.data;
		if (cp.kind !== 'height-profile') throw new Error(`Checkpoint of a ${cp.kind} run cannot restore a height-profile simulation`);
		// continuing bit-identically needs the very same numerics
		if (!canContinueCheckpoint(cp.solverVersion, m.nc === 1, this.transfer !== null)) throw new Error(`Checkpoint of solver ${cp.solverVersion} cannot continue with solver ${SOLVER_VERSION}`);
		if (d.cells !== m.n) throw new Error(`Checkpoint has ${String(d.cells)} cells, this case has ${m.n}`);
		const arr = (name: string, into: Float64Array) => {
			const v = d[name];
			if (!(v instanceof Float64Array) || v.length !== into.length) throw new Error(`Checkpoint field ${name} is missing or has the wrong length`);
			into.set(v);
		};
		arr('liquidFraction', m.liquidFraction);
		arr('pressure', m.pressure);
		arr('gasDensity', m.gasDensity);
		arr('gasVelocity', m.gasVelocity);
		arr('liquidVelocity', m.liquidVelocity);
		arr('windowLiquidFraction', this.winLiquid);
		arr('windowGasVelocity', this.winGasVelocity);
		arr('windowLiquidVelocity', this.winLiquidVelocity);
		if (m.nc > 1) {
			if (d.classes !== m.nc) throw new Error(`Checkpoint has ${String(d.classes ?? 1)} bubble classes, this case has ${m.nc}`);
			for (let k = 0; k < m.nc; k++) {
				arr(`classShare${k}`, m.classShare[k]);
				arr(`classVelocity${k}`, m.classVelocity[k]);
			}
		} else if (d.classes !== undefined && d.classes !== 1) throw new Error(`Checkpoint has ${String(d.classes)} bubble classes, this case has one`);
		const num = (name: string) => {
			const v = d[name];
			if (typeof v !== 'number') throw new Error(`Checkpoint field ${name} is missing`);
			return v;
		};
		m.timeS = num('timeS');
		m.stepCount = num('stepCount');
		m.dtS = num('dtS');
		m.status = d.status as RunStatus;
		m.message = d.message ? String(d.message) : undefined;
		m.lastMaxHoldupRate = num('lastMaxHoldupRate');
		this.winStartS = num('winStartS');
		this.winHoldup = num('winHoldup');
		this.winCentre = num('winCentre');
		this.winGasIn = num('winGasIn');
		this.winGasOut = num('winGasOut');
		this.winLiqIn = num('winLiqIn');
		this.winLiqOut = num('winLiqOut');
		this.liquidNetInM = num('liquidNetInM');
		this.windows = num('windows');
		const r = d.residuals as number[];
		this.res = { gasMassImbalance: r[0], liquidMassImbalance: r[1], overallHoldupChange: r[2], liquidCentreRate: r[3], holdupChangeRate: r[4], momentumImbalance: r[5] };
		const tr = this.transfer;
		if (!tr) {
			if (d.transferConcentration !== undefined) throw new Error('Checkpoint carries mass transfer, this case has none');
			return;
		}
		if (d.transferConcentration === undefined) throw new Error('Checkpoint carries no mass transfer, this case has it');
		arr('transferConcentration', tr.concentration);
		for (let k = 0; k < tr.nc; k++) arr(`transferMoleFraction${k}`, tr.moleFraction[k]);
		arr('transferWindowConcentration', this.winConcentration!);
		const totals = d.transferTotals as number[];
		const t = tr.totals;
		[t.transferredKgM2, t.liquidInKgM2, t.liquidOutKgM2, t.gasInKgM2, t.gasOutKgM2] = totals;
		this.soluteChangeRate = num('soluteChangeRate');
		const series = (name: string): number[] => {
			const v = d[name];
			if (!(v instanceof Float64Array)) throw new Error(`Checkpoint field ${name} is missing`);
			return Array.from(v);
		};
		this.seriesTimeS = series('transferSeriesTimeS');
		this.seriesConcentration = series('transferSeriesConcentration');
		this.sampleIntervalS = num('transferSampleIntervalS');
		this.nextSample = num('transferNextSample');
		this.steadyState = d.transferSteadyState as 'pending' | 'solved' | 'none';
		// the coefficients and the state a step starts from follow from the restored hydrodynamics
		tr.updateCoefficients();
		tr.captureOld();
	}

	results(): Results {
		const m = this.model;
		const c = this.caseDoc;
		const cfg = this.cfg;
		const n = m.n;
		const level = this.level();
		const eps = this.overallHoldup();
		const g = cfg.gravityAxialMS2;
		const rl = cfg.liquidDensityKgM3;
		const p0 = m.pressure[0] - g * 0.5 * m.dz * ((1 - m.liquidFraction[0]) * m.gasDensity[0] + m.liquidFraction[0] * rl);
		// gas mass and volume-weighted slip below the level
		let gasMass = 0;
		let slipSum = 0;
		let gasVol = 0;
		for (let i = 0; i < n; i++) {
			const z0 = i * m.dz;
			if (z0 >= level) break;
			const h = Math.min(m.dz, level - z0);
			const a = 1 - m.liquidFraction[i];
			gasMass += a * m.gasDensity[i] * h;
			const s = 0.5 * (m.gasVelocity[i] + m.gasVelocity[i + 1]) - 0.5 * (m.liquidVelocity[i] + m.liquidVelocity[i + 1]);
			slipSum += a * h * s;
			gasVol += a * h;
		}
		const fin = cfg.bottom.kind === 'inflow' ? cfg.bottom.gasMassFluxKgM2S : 0;
		const meanSlip = gasVol > 0 ? slipSum / gasVol : 0;
		const d = cfg.bubbleDiameterM;
		let area = (6 * eps) / d;
		let kLa = (meanSlip > 0 ? higbieMassTransferCoefficient({ diffusivityM2S: cfg.soluteDiffusivityM2S, diameterM: d, slipMS: meanSlip }) : 0) * area;
		const perClass = m.nc > 1 ? this.classSummary(level) : null;
		if (perClass) {
			area = perClass.areaPerM;
			kLa = perClass.kLaPerS;
		}
		const jg = fin / (cfg.gasDensityKgM3 ?? cfg.referenceGasDensityKgM3);
		const ut = cfg.expected?.transitionVelocityMS;
		const regime = ut
			? regimeFromTransition({ superficialGasVelocityMS: jg, transitionVelocityMS: ut.value, source: cfg.transitionSource ?? '' })
			: regimeFromBand({ superficialGasVelocityMS: jg });
		const liq = this.liquidInventoryM();
		const liquidErr = this.liquid0 > 0 ? Math.abs(liq - this.liquid0 - this.liquidNetInM) / this.liquid0 : 0;
		const column = { diameterM: cfg.diameterM, superficialGasVelocityMS: jg, liquidDensityKgM3: rl, liquidViscosityPaS: cfg.liquidViscosityPaS, surfaceTensionNM: cfg.surfaceTensionNM };
		const num = (value: number, unit: string, label: string): DesignNumber => ({ value, unit, label });
		const design: Record<string, DesignNumber> = {
			overallHoldup: num(eps, '1', 'Overall gas holdup of the aerated region'),
			aeratedHeightM: num(level, 'm', 'Aerated height'),
			levelSwellM: num(level - cfg.clearLiquidLevelM, 'm', 'Level swell'),
			spargerPressurePa: num(p0, 'Pa', 'Pressure at the sparger'),
			gasResidenceTimeS: num(fin > 0 ? gasMass / fin : 0, 's', 'Gas residence time'),
			meanSlipMS: num(meanSlip, 'm/s', 'Mean slip velocity'),
			interfacialAreaPerM: num(area, '1/m', perClass ? 'Interfacial area (Σ 6ε_k/d_k)' : 'Interfacial area (6ε/d)'),
			kLaPerS: num(kLa, '1/s', `kLa of ${c.fluids.solute} per aerated volume (Higbie penetration, t_c = d/u_r${perClass ? ', per class' : ''})`),
			sauterDiameterM: num(perClass ? perClass.sauterM : d, 'm', 'Sauter mean diameter of the aerated region'),
			regime: num(regime.value, '1', `Regime: ${regime.label}`),
			liquidMassErrorRel: num(liquidErr, '1', 'Relative liquid inventory error'),
			akitaYoshidaHoldup: num(akitaYoshidaHoldup(column), '1', 'Akita–Yoshida (1973) holdup'),
			hughmarkHoldup: num(hughmarkHoldup(column), '1', 'Hughmark (1967) holdup'),
			hikitaHoldup: num(
				hikitaHoldup({ ...column, gasDensityKgM3: cfg.gasDensityKgM3 ?? cfg.referenceGasDensityKgM3, gasViscosityPaS: cfg.gasViscosityPaS }),
				'1',
				'Hikita et al. (1980) holdup'
			),
			driftFluxHoldup: num(
				zuberFindlayHoldup({ superficialGasVelocityMS: jg, superficialLiquidVelocityMS: c.sparging.superficialLiquidVelocityMS, liquidDensityKgM3: rl, gasDensityKgM3: cfg.gasDensityKgM3 ?? cfg.referenceGasDensityKgM3, surfaceTensionNM: cfg.surfaceTensionNM }),
				'1',
				'Drift-flux holdup (Zuber–Findlay, C₀ = 1.2)'
			)
		};
		if (perClass) {
			for (const k of perClass.classes) {
				design[`holdup${k.suffix}`] = num(k.holdup, '1', `Holdup of the ${k.label.toLowerCase()}`);
				design[`slip${k.suffix}MS`] = num(k.slipMS, 'm/s', `Mean slip of the ${k.label.toLowerCase()}`);
				design[`diameter${k.suffix}M`] = num(k.diameterM, 'm', `Diameter of the ${k.label.toLowerCase()}`);
			}
		}
		if (this.sizeClasses) Object.assign(design, this.sizeClassDesign(level));
		Object.assign(design, cfg.expected ?? {});
		if (this.transfer) Object.assign(design, this.transferDesign({ level, holdup: eps, spargerPressurePa: p0, superficialGasVelocityMS: jg, gasMassFluxKgM2S: fin }));
		const r: Results = { kind: 'height-profile', status: m.status, step: m.stepCount, timeS: m.timeS, design, profiles: this.snapshot() };
		if (m.message) r.message = m.message;
		if (this.transfer && this.sampleIntervalS > 0) {
			r.series = { [this.transfer.cfg.solute.seriesId]: { timeS: [...this.seriesTimeS], concentrationKgM3: [...this.seriesConcentration] } };
		}
		return r;
	}

	/** Sauter diameter of cell i from the class shares, d32 = 1/Σ (y_k/d_k), m. */
	private cellSauterM(i: number): number {
		const m = this.model;
		let inv = 0;
		for (let k = 0; k < m.nc; k++) inv += m.classShare[k][i] / m.classes[k].diameterM;
		return inv > 0 ? 1 / inv : m.classes[0].diameterM;
	}

	/** Size classes: the Sauter diameter at the sparger and just below the level, and the bubble number density there. */
	private sizeClassDesign(level: number): Record<string, DesignNumber> {
		const m = this.model;
		const num = (value: number, unit: string, label: string): DesignNumber => ({ value, unit, label });
		// the cell holding the level mixes bubbly liquid and freeboard: the top of the bubbly region is the cell below it
		const top = Math.max(0, Math.min(m.n - 1, Math.floor(level / m.dz) - 1));
		const numberDensity = (i: number) => {
			let s = 0;
			for (let k = 0; k < m.nc; k++) s += m.classHoldup(k, i) / ((Math.PI / 6) * m.classes[k].diameterM ** 3);
			return s;
		};
		return {
			sauterDiameterBottomM: num(this.cellSauterM(0), 'm', 'Sauter mean diameter at the sparger (first cell)'),
			sauterDiameterTopM: num(this.cellSauterM(top), 'm', 'Sauter mean diameter at the top of the bubbly region (cell below the level)'),
			bubbleNumberDensityBottomPerM3: num(numberDensity(0), '1/m³', 'Bubble number density at the sparger (first cell)'),
			bubbleNumberDensityTopPerM3: num(numberDensity(top), '1/m³', 'Bubble number density at the top of the bubbly region')
		};
	}

	/**
	 * The design numbers of the mass transfer. The standard oxygen transfer rate and efficiency follow the ASCE/EWRI 2-06
	 * definitions: SOTR = V kLa20 C∞20 with the kLa and C∞ a clean-water re-aeration test of this column would give.
	 * For a well-mixed liquid of uniform concentration c the transfer rate, with each class in its steady state, is
	 * exactly linear, R(c) = R(0) − B c (`uniformLiquidRate`): the test's kLa is B/V and C∞ = R(0)/B, so
	 * V kLa C∞ = R(0), the rate into oxygen-free water; SOTR = R(0) θ^(20 − T) / (τ Ω), τ = C_s(T)/C_s(20 °C) (Benson &
	 * Krause 1984), Ω = p_top/101.325 kPa, θ = 1.024. SOTE = SOTR / (oxygen mass flow fed), per metre of submergence (the
	 * clear-liquid level above the sparger).
	 */
	private transferDesign(o: { level: number; holdup: number; spargerPressurePa: number; superficialGasVelocityMS: number; gasMassFluxKgM2S: number }): Record<string, DesignNumber> {
		const tr = this.transfer!;
		const t = tr.cfg;
		const m = this.model;
		const cfg = this.cfg;
		const n = m.n;
		const dz = m.dz;
		const num = (value: number, unit: string, label: string): DesignNumber => ({ value, unit, label });
		const areaM2 = (Math.PI * cfg.diameterM * cfg.diameterM) / 4;
		const f = t.solute.formula;
		let kSum = 0;
		let liquid = 0;
		let rate = 0;
		for (let i = 0; i < n; i++) {
			for (let k = 0; k < m.nc; k++) kSum += tr.kLa[k][i];
			liquid += m.liquidFraction[i];
			rate += tr.transferRate(i);
		}
		rate *= dz;
		const liquidM = liquid * dz;
		const topP = cfg.top.pressurePa;
		const surface = t.henryKgM3Pa * t.inletGasMoleFraction * Math.max(topP - t.vapourPressurePa, 0);
		const bottom = t.henryKgM3Pa * t.inletGasMoleFraction * Math.max(o.spargerPressurePa - t.vapourPressurePa, 0);
		// the re-aeration model of the well-mixed liquid: R(c) = R(0) − B c
		const r0 = tr.uniformLiquidRate(0);
		const cRef = surface > 0 ? surface : this.concentrationScale;
		const slope = (r0 - tr.uniformLiquidRate(cRef)) / cRef;
		const cInf = slope > 0 ? r0 / slope : Number.NaN;
		const depth = effectiveSaturationDepthM({ equilibriumKgM3: cInf, surfaceSaturationKgM3: surface, topPressurePa: topP, vapourPressurePa: t.vapourPressurePa, liquidDensityKgM3: cfg.liquidDensityKgM3 });
		const soluteFed = (t.inletGasMoleFraction * o.gasMassFluxKgM2S * t.solute.molarMassKgMol) / cfg.gasMolarMassKgMol;
		const gasMolesFed = o.gasMassFluxKgM2S / cfg.gasMolarMassKgMol;
		const jl = this.caseDoc.sparging.superficialLiquidVelocityMS;
		const dl = t.dispersionM2S;
		const c = tr.concentration;
		const fl0 = m.liquidFlux[0];
		const fln = m.liquidFlux[n];
		const outletLiquid = fln > 0 ? c[n - 1] : fl0 < 0 ? c[0] : Number.NaN;
		const design: Record<string, DesignNumber> = {
			transferRateKgH: num(rate * areaM2 * 3600, 'kg/h', `${f} transfer rate into the liquid (negative: stripped)`),
			transferEfficiencyPercent: num(soluteFed > 0 ? (100 * rate) / soluteFed : Number.NaN, '%', `Share of the ${f} fed that dissolves`),
			transferKLaPerS: num(liquidM > 0 ? kSum * dz / liquidM : 0, '1/s', `Volume-averaged kLa per liquid volume (${t.massTransferCoefficient === 'frossling' ? 'Frössling rigid interface' : 'Higbie penetration'}, a = 6α/d per class)`),
			apparentKLaPerS: num(liquidM > 0 ? slope / liquidM : 0, '1/s', 'kLa a clean-water re-aeration test would measure (well-mixed liquid, gas depletion included)'),
			equilibriumConcentrationKgM3: num(cInf, 'kg/m³', `Equilibrium ${f} concentration C∞ of the well-mixed liquid`),
			surfaceSaturationKgM3: num(surface, 'kg/m³', `${f} saturation with the gas fed at the top pressure`),
			bottomSaturationKgM3: num(bottom, 'kg/m³', `${f} saturation with the gas fed at the sparger pressure`),
			effectiveSaturationDepthM: num(depth, 'm', 'Effective saturation depth (where the gas fed is in equilibrium with C∞)'),
			meanConcentrationKgM3: num(tr.meanConcentration(), 'kg/m³', `Liquid-average dissolved ${f}`),
			outletGasMoleFraction: num(tr.outletMoleFraction(), '1', `${f} mole fraction of the gas leaving`),
			transferredGasShare: num(gasMolesFed > 0 ? rate / t.solute.molarMassKgMol / gasMolesFed : 0, '1', 'Share of the gas moles fed that dissolve (the gas flow is not reduced by it: keep it small)'),
			liquidDispersionM2S: num(dl, 'm²/s', `Liquid axial dispersion coefficient (${t.dispersionSource})`),
			bodensteinNumber: num(dl > 0 ? (Math.abs(jl) * o.level) / ((1 - o.holdup) * dl) : Number.POSITIVE_INFINITY, '1', 'Liquid Bodenstein number u_l L/D_L over the aerated height (0 for a batch liquid)'),
			wallHeatTransferWM2K: num(
				deckwerWallHeatTransfer({
					superficialGasVelocityMS: o.superficialGasVelocityMS,
					liquidDensityKgM3: cfg.liquidDensityKgM3,
					liquidViscosityPaS: cfg.liquidViscosityPaS,
					heatCapacityJKgK: t.liquidHeatCapacityJKgK,
					thermalConductivityWMK: t.liquidThermalConductivityWMK
				}),
				'W/(m²·K)',
				'Wall heat-transfer coefficient (Deckwer 1980; for low-viscosity liquids at U_G of about 0.01–0.3 m/s, range from memory)'
			)
		};
		if (Number.isFinite(outletLiquid)) design.outletConcentrationKgM3 = num(outletLiquid, 'kg/m³', `Dissolved ${f} of the liquid leaving`);
		if (t.solute.id === 'oxygen') {
			const celsius = cfg.temperatureK - 273.15;
			const tau = bensonKrauseOxygenSaturationKgM3(cfg.temperatureK) / bensonKrauseOxygenSaturationKgM3(293.15);
			const omega = topP / NORMAL_PRESSURE_PA;
			const sotr = (r0 * Math.pow(KLA_THETA, 20 - celsius)) / (tau * omega);
			const sote = soluteFed > 0 ? (100 * sotr) / soluteFed : Number.NaN;
			const submergence = cfg.clearLiquidLevelM;
			design.sotrKgH = num(sotr * areaM2 * 3600, 'kg/h', 'Standard oxygen transfer rate SOTR (ASCE/EWRI 2-06: 20 °C, zero DO, 1 atm)');
			design.sotePercent = num(sote, '%', 'Standard oxygen transfer efficiency SOTE (ASCE/EWRI 2-06, referred to 1 atm)');
			design.sotePerMetrePercentM = num(sote / submergence, '%/m', 'SOTE per metre of submergence (clear-liquid level above the sparger)');
		}
		return design;
	}
}
