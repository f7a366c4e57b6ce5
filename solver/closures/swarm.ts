/**
 * Swarm (hindrance) corrections: a factor h(α) on the single-bubble drag coefficient.
 *
 * Both published forms give a swarm slip U_t (1 − α)^(n−1). For a drag coefficient that does not
 * depend on Re, a slip U_t (1 − α)^(n−1) under the single-bubble buoyancy needs
 * h = (1 − α)^(−2(n−1)); that is the factor used here (an interpretation, stated as such).
 */
import type { CaseDocument } from '../case.js';

export type SwarmCorrection = CaseDocument['closures']['swarm'];

/**
 * Richardson & Zaki (1954), Trans. Inst. Chem. Eng. 32, 35: exponent n from the terminal Reynolds number
 * (wall term omitted): 4.65 (Re_t < 0.2), 4.4 Re_t^−0.03 (< 1), 4.4 Re_t^−0.1 (< 500), 2.39 (from memory, PHYSICS §1.8).
 */
export function richardsonZakiExponent(terminalReynolds: number): number {
	const re = terminalReynolds;
	if (re < 0.2) return 4.65;
	if (re < 1) return 4.4 * Math.pow(re, -0.03);
	if (re < 500) return 4.4 * Math.pow(re, -0.1);
	return 2.39;
}

/** Wallis (1969), One-Dimensional Two-Phase Flow: n = 2 for small bubbles (common practice; from memory, PHYSICS §1.8). */
export const WALLIS_EXPONENT = 2;

/** Exponent n of the swarm slip U_t(1 − α)^(n−1), or 1 (no correction). */
export function swarmExponent(o: { model: SwarmCorrection; terminalReynolds: number }): number {
	if (o.model === 'richardson-zaki') return richardsonZakiExponent(o.terminalReynolds);
	if (o.model === 'wallis') return WALLIS_EXPONENT;
	return 1;
}

/** Factor h(α) = (1 − α)^(−2(n−1)) on C_D; 1 for "none". */
export function swarmDragFactor(o: { model: SwarmCorrection; holdup: number; terminalReynolds: number }): number {
	const n = swarmExponent(o);
	if (n === 1) return 1;
	const al = Math.max(1 - o.holdup, 1e-6);
	return Math.exp(-2 * (n - 1) * Math.log(al));
}
