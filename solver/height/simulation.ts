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

export const HEIGHT_MODEL_VERSION = SOLVER_VERSION;

/** `small` → `Small`: the suffix of a class's snapshot fields (`holdupSmall`, `gasVelocitySmall`). */
export function classFieldSuffix(id: string): string {
	return id.charAt(0).toUpperCase() + id.slice(1);
}

/** The status record of an ordinary step, shared so a running simulation allocates nothing per step. */
const RUNNING: StepStatus = Object.freeze({ status: 'running' });

/** Stable residual ids of the height-profile model (database and chart keys). */
export const residualNames = ['gasMassImbalance', 'liquidMassImbalance', 'holdupChangeRate', 'overallHoldupChange', 'liquidCentreRate', 'momentumImbalance'] as const;

export interface HeightSimulation extends Simulation {
	/** the underlying model (tests and the benchmark read its arrays) */
	readonly model: HeightModel;
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
		if (m.status === 'running') return RUNNING;
		return m.message ? { status: m.status, message: m.message } : { status: m.status };
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
			r.momentumImbalance <= tol
		) {
			m.status = 'converged';
		}
	}

	residuals(): Residuals {
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
				...this.classCheckpoint()
			}
		};
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
		if (!canContinueCheckpoint(cp.solverVersion, m.nc === 1)) throw new Error(`Checkpoint of solver ${cp.solverVersion} cannot continue with solver ${SOLVER_VERSION}`);
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
			kLaPerS: num(kLa, '1/s', `kLa of ${c.fluids.solute} (Higbie penetration, t_c = d/u_r${perClass ? ', per class' : ''})`),
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
		Object.assign(design, cfg.expected ?? {});
		const r: Results = { kind: 'height-profile', status: m.status, step: m.stepCount, timeS: m.timeS, design, profiles: this.snapshot() };
		if (m.message) r.message = m.message;
		return r;
	}
}
