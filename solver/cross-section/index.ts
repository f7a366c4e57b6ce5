/**
 * Cross-section (radial) model. Placeholder export so the public surface type-checks
 * until the model lands; it refuses to run rather than returning anything.
 */
import type { CaseDocument } from '../case.js';
import type { Simulation } from '../types.js';

export function createCrossSectionSimulation(_caseDoc: CaseDocument): Simulation {
	throw new Error('The cross-section model is not available in this build');
}
