/**
 * The bubble classes of a case (PHYSICS §8.8): one class, or small and large bubbles with the gas divided at
 * the sparger by the regime transition. Used by the height-profile configuration and the editor's derived numbers.
 */
import type { CaseDocument } from '../case.js';
import { bubbleDiameter, gasMassFlux, spargerGasDensityAtRest } from '../derived.js';
import { collinsWallFactor, krishnaAccelerationFactor, krishnaLargeBubbleDiameter, reillyTransition, type TransitionPoint } from '../correlations/churn.js';
import { GRAVITY_MS2 } from '../fluids.js';
import type { GasClassConfig } from './config.js';

/** `small` → `Small`: the suffix of a class's snapshot fields (`holdupSmall`, `gasVelocitySmall`). */
export function classFieldSuffix(id: string): string {
	return id.charAt(0).toUpperCase() + id.slice(1);
}

/** Davies & Taylor (1950) cap-bubble coefficient: V = 0.71 √(g d). The cap drag C_D = 8/3 gives 1/√2; this factor closes the gap. */
const DAVIES_TAYLOR_DRAG_FACTOR = 1 / (2 * 0.71 * 0.71);

export interface ClassPlan {
	classes: GasClassConfig[];
	/** the transition used to divide the gas (two classes only) */
	transition: TransitionPoint | null;
	transitionSource: string;
	/** large-bubble wall and acceleration factors (two classes only) */
	wallFactor: number;
	accelerationFactor: number;
	/** large-bubble swarm velocity 0.71 √(g d) SF AF, m/s (two classes only) */
	largeSwarmVelocityMS: number;
}

/** The transition of the case: Reilly et al. (1994) at the sparger gas density, or the analyst's fixed values. */
function caseTransition(c: CaseDocument, rhoSp: number): { point: TransitionPoint; source: string } {
	const b = c.bubbles;
	if (b.transition === 'fixed') return { point: { velocityMS: b.transitionVelocityMS, holdup: b.transitionHoldup }, source: 'entered by the analyst' };
	return {
		point: reillyTransition({ gasDensityKgM3: rhoSp, liquidDensityKgM3: c.fluids.liquid.densityKgM3, surfaceTensionNM: c.fluids.liquid.surfaceTensionNM }),
		source: 'Reilly et al. (1994), Can. J. Chem. Eng. 72, 3'
	};
}

/** The bubble classes of a validated case. */
export function planClasses(c: CaseDocument): ClassPlan {
	const d = bubbleDiameter(c);
	const rhoSp = spargerGasDensityAtRest(c);
	const jg = gasMassFlux(c) / rhoSp;
	const small: GasClassConfig = { id: 'small', label: 'Small bubbles', diameterM: d, drag: c.closures.drag, swarm: c.closures.swarm, dragFactor: 1, inflowShare: 1 };
	if (c.bubbles.classes === 'single') {
		return { classes: [{ ...small, id: 'gas', label: 'Bubbles' }], transition: null, transitionSource: '', wallFactor: 1, accelerationFactor: 1, largeSwarmVelocityMS: 0 };
	}
	const { point, source } = caseTransition(c, rhoSp);
	const excess = Math.max(jg - point.velocityMS, 0);
	const share = jg > 0 ? excess / jg : 0;
	// below the transition the large class is empty; its size is still defined (never below twice the small bubbles)
	const dl = c.bubbles.largeSizing === 'fixed' ? c.bubbles.largeDiameterM : Math.max(krishnaLargeBubbleDiameter(excess), 2 * d);
	const sf = collinsWallFactor(dl, c.geometry.diameterM);
	const af = c.bubbles.largeDrag === 'krishna-swarm' ? krishnaAccelerationFactor(excess) : 1;
	const factor = c.bubbles.largeDrag === 'krishna-swarm' ? DAVIES_TAYLOR_DRAG_FACTOR / (sf * sf * af * af) : 1;
	return {
		classes: [
			{ ...small, inflowShare: 1 - share },
			{ id: 'large', label: 'Large bubbles', diameterM: dl, drag: 'spherical-cap', swarm: 'none', dragFactor: factor, inflowShare: share }
		],
		transition: point,
		transitionSource: source,
		wallFactor: sf,
		accelerationFactor: af,
		largeSwarmVelocityMS: 0.71 * Math.sqrt(GRAVITY_MS2 * dl) * sf * af
	};
}
