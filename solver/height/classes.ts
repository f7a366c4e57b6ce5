/**
 * The bubble classes of a case (PHYSICS §8.8): one class, small and large bubbles with the gas divided at
 * the sparger by the regime transition, or size classes on a geometric diameter grid whose gas coalescence and
 * breakup redistribute (`population-source.ts`). Used by the height-profile configuration and the editor's derived numbers.
 */
import type { CaseDocument } from '../case.js';
import { bubbleDiameter, gasMassFlux, spargerGasDensityAtRest } from '../derived.js';
import { collinsWallFactor, krishnaAccelerationFactor, krishnaLargeBubbleDiameter, reillyTransition, type TransitionPoint } from '../correlations/churn.js';
import { GRAVITY_MS2 } from '../fluids.js';
import type { GasClassConfig } from './config.js';
import { eotvosNumber } from '../closures/drag.js';
import { lumpVolume, pivotGrid, sphereVolumeM3, type PivotGrid } from '../population/grid.js';

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
	/** the pivot grid of the size classes (size classes only): class k has the diameter `diametersM[k]` */
	sizeGrid?: PivotGrid;
}

/**
 * Eötvös number from which a size class takes the spherical-cap drag C_D = 8/3 instead of the case's law: spherical
 * caps at Eo ≳ 40 in the shape regime map of Clift, Grace & Weber (1978), Bubbles, Drops and Particles, fig. 2.5
 * (threshold from memory). In air–water that is d ≈ 17 mm.
 */
export const SIZE_CLASS_CAP_EOTVOS = 40;

/** The geometric grid of the size classes of a case: n pivots from the smallest to the largest diameter. */
export function sizeClassGrid(b: { sizeClassCount: number; sizeClassMinDiameterM: number; sizeClassMaxDiameterM: number }): PivotGrid {
	const n = b.sizeClassCount;
	const ratio = Math.pow(b.sizeClassMaxDiameterM / b.sizeClassMinDiameterM, 3 / (n - 1));
	return pivotGrid({ minDiameterM: b.sizeClassMinDiameterM, ratio, classes: n });
}

/**
 * Size classes: the pivots of `sizeClassGrid`, each class with the case's drag law and swarm correction, except the
 * classes at or above Eo = 40 (spherical caps), which take C_D = 8/3 without swarm correction as the large class of the
 * two-class model with the single-cap drag does (Davies & Taylor 1950). The gas enters as bubbles of the sparger
 * diameter, lumped onto the two neighbouring pivots with the number- and volume-preserving weights of Kumar &
 * Ramkrishna (1996); each class's share of the gas fed is the volume it receives.
 */
function planSizeClasses(c: CaseDocument, d: number, rhoSp: number): ClassPlan {
	const grid = sizeClassGrid(c.bubbles);
	const n = grid.classes;
	const l = c.fluids.liquid;
	const share = new Float64Array(n);
	const vs = sphereVolumeM3(d);
	const lump = lumpVolume(grid, vs, { index: 0, low: 0, high: 0 });
	share[lump.index] += lump.low * grid.volumesM3[lump.index];
	if (lump.high > 0) share[lump.index + 1] += lump.high * grid.volumesM3[lump.index + 1];
	const total = share.reduce((a, b) => a + b, 0);
	const classes: GasClassConfig[] = [];
	for (let k = 0; k < n; k++) {
		const dk = grid.diametersM[k];
		const eo = eotvosNumber({ diameterM: dk, liquidDensityKgM3: l.densityKgM3, gasDensityKgM3: rhoSp, surfaceTensionNM: l.surfaceTensionNM });
		const cap = eo >= SIZE_CLASS_CAP_EOTVOS;
		classes.push({
			id: `size${k + 1}`,
			label: `Bubbles of ${(dk * 1000).toPrecision(2)} mm`,
			diameterM: dk,
			drag: cap ? 'spherical-cap' : c.closures.drag,
			swarm: cap ? 'none' : c.closures.swarm,
			dragFactor: 1,
			inflowShare: share[k] / total
		});
	}
	return { classes, transition: null, transitionSource: '', wallFactor: 1, accelerationFactor: 1, largeSwarmVelocityMS: 0, sizeGrid: grid };
}


/** The transition of the case: Reilly et al. (1994) at the sparger gas density, or the analyst's fixed values. */
export function caseTransition(c: CaseDocument, rhoSp: number): { point: TransitionPoint; source: string } {
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
	if (c.bubbles.classes === 'size-classes') return planSizeClasses(c, d, rhoSp);
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
