/**
 * The contract every Twofold model (height profile, cross-section) implements.
 * The worker, the tests and the CLI drive a simulation only through this interface.
 * No I/O happens inside a simulation.
 */
import type { CaseDocument, CaseKind } from './case.js';

export type RunStatus = 'running' | 'converged' | 'finished' | 'failed';

/** Returned by every `step()`: never throws for a numerical failure, it reports it. */
export interface StepStatus {
	status: RunStatus;
	/** For `failed`: what went wrong, naming the cell, the variable and the simulated time. */
	message?: string;
}

export interface SimulationState {
	/** completed steps */
	step: number;
	/** simulated time, s */
	timeS: number;
	/** last time step, s */
	dtS: number;
	status: RunStatus;
	message?: string;
}

/**
 * Residuals of the last step. Names are stable identifiers (used as column keys in the
 * database and as chart series); values are dimensionless and non-negative.
 */
export type Residuals = Record<string, number>;

/** The fields along the line at one instant: `fields[name][cell]`, SI units. */
export interface Snapshot {
	step: number;
	timeS: number;
	/** positions of the cell centres (height z, m, or radius r, m) */
	x: Float64Array;
	fields: Record<string, Float64Array>;
}

export interface DesignNumber {
	value: number;
	unit: string;
	label: string;
}

/** A time series of a run, SI: the liquid-average dissolved concentration of a batch transfer run. */
export interface ConcentrationSeries {
	timeS: number[];
	concentrationKgM3: number[];
}

export interface Results {
	kind: CaseKind;
	status: RunStatus;
	message?: string;
	step: number;
	timeS: number;
	/** design numbers keyed by a stable id, each with its unit and label */
	design: Record<string, DesignNumber>;
	/** final profiles, as in `snapshot()` */
	profiles: Snapshot;
	/** time series keyed by a stable id (e.g. `dissolvedOxygen` of a batch transfer run), when the run has any */
	series?: Record<string, ConcentrationSeries>;
}

/** An opaque, serialisable (msgpackr-encodable) copy of everything needed to continue bit-identically. */
export interface Checkpoint {
	kind: CaseKind;
	solverVersion: string;
	step: number;
	timeS: number;
	data: Record<string, Float64Array | number | string | boolean | number[]>;
}

export interface Simulation {
	readonly caseDoc: CaseDocument;
	readonly state: SimulationState;
	/** Advance by one time step. After a terminal status further calls return it unchanged. */
	step(): StepStatus;
	residuals(): Residuals;
	snapshot(): Snapshot;
	checkpoint(): Checkpoint;
	restore(cp: Checkpoint): void;
	results(): Results;
}

export interface RunOptions {
	/** called after every step with the current state and residuals (keep it cheap) */
	onProgress?: (state: SimulationState, residuals: Residuals) => void;
	/** abort between steps (cancel, wall-time limit) */
	signal?: AbortSignal;
	/** guard against endless runs */
	maxSteps?: number;
}
