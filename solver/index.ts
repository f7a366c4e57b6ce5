/**
 * Twofold solver — public surface. A pure TypeScript library: no database, no DOM, no I/O.
 */
import { validateCase, type CaseDocument } from './case.js';
import type { Results, RunOptions, Simulation } from './types.js';
import { createCrossSectionSimulation } from './cross-section/index.js';
import { createHeightSimulation } from './height/simulation.js';

export * from './case.js';
export type * from './types.js';
export { derivedNumbers, bubbleDiameter, gasMassFlux, type DerivedNumbers } from './derived.js';
export { fluidPresets, findFluidPreset, applyFluidPreset, type FluidPreset } from './fluids.js';
export { closureCatalog, type CatalogEntry } from './closures/catalog.js';
export { residualNames as heightResidualNames } from './height/simulation.js';
export { CROSS_SECTION_RESIDUALS as crossSectionResidualNames } from './cross-section/index.js';
export { gridConvergenceIndex, type GridConvergence } from './gci.js';
export { runVerification, type VerificationResult, type VerificationProgress } from './verification/index.js';
export { designCatalog, residualCatalog, type QuantityEntry } from './catalog/design.js';

export { SOLVER_VERSION } from './version.js';

/** Thrown when a case fails validation; `issues` name the field and the limit. */
export class InvalidCaseError extends Error {
	readonly issues: { path: string; message: string }[];
	constructor(issues: { path: string; message: string }[]) {
		super(`Invalid case: ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
		this.name = 'InvalidCaseError';
		this.issues = issues;
	}
}

/** Validate a case document and build the simulation of its kind. Throws `InvalidCaseError` for an invalid case. */
export function createSimulation(doc: unknown): Simulation {
	const v = validateCase(doc);
	if (!v.ok) throw new InvalidCaseError(v.issues);
	const c: CaseDocument = v.value;
	if (c.kind === 'cross-section') return createCrossSectionSimulation(c);
	return createHeightSimulation(c);
}

/**
 * Drive a simulation (or a case) until it converges, finishes, fails, is aborted or reaches `maxSteps`.
 * Returns its results; an aborted or step-limited run returns status `running`.
 */
export function runToEnd(subject: unknown, options: RunOptions = {}): Results {
	const sim = isSimulation(subject) ? subject : createSimulation(subject);
	const maxSteps = options.maxSteps ?? Number.POSITIVE_INFINITY;
	let steps = 0;
	while (sim.state.status === 'running' && steps < maxSteps) {
		if (options.signal?.aborted) break;
		sim.step();
		steps++;
		options.onProgress?.(sim.state, sim.residuals());
	}
	return sim.results();
}

function isSimulation(x: unknown): x is Simulation {
	return !!x && typeof x === 'object' && typeof (x as Simulation).step === 'function' && typeof (x as Simulation).results === 'function';
}
