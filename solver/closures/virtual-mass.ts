/**
 * Virtual (added) mass coefficient C_VM: force on the gas C_VM α ρ_l (D_l u_l/Dt − D_g u_g/Dt), PHYSICS §2.
 */
import type { CaseDocument } from '../case.js';

export type VirtualMassModel = CaseDocument['closures']['virtualMass'];

/** Zuber (1964), Chem. Eng. Sci. 19, 897: C_VM = ½ (1 + 2α)/(1 − α) (from memory, PHYSICS §2). */
export function zuberVirtualMassCoefficient(holdup: number): number {
	return (0.5 * (1 + 2 * holdup)) / (1 - holdup);
}

/** C_VM for a model: none → 0; constant → the given value (Lamb 1932: ½ for an isolated sphere, from memory); Zuber (1964). */
export function virtualMassCoefficient(o: { model: VirtualMassModel; holdup: number; constant?: number }): number {
	if (o.model === 'none') return 0;
	if (o.model === 'constant') return o.constant ?? 0.5;
	return zuberVirtualMassCoefficient(o.holdup);
}

/**
 * Largest holdup for which the 1-D model with virtual mass (substantive form) and interfacial pressure
 * Δp = C_p ρ_l u_r² is hyperbolic, ρ_g → 0: C_p ≥ C_VM α (C_VM + 1 − α)/(C_VM + α(1 − α)) (PHYSICS §3.3, derived).
 * Returns 1 when the condition holds for every α in [0, 1).
 */
export function hyperbolicityLimitHoldup(o: { virtualMassCoefficient: number; interfacialPressureCoefficient: number }): number {
	const c = o.virtualMassCoefficient;
	const need = (a: number) => (c * a * (c + 1 - a)) / (c + a * (1 - a)) - o.interfacialPressureCoefficient;
	if (c === 0) return 1;
	let lo = 0;
	let hi = 0.999999;
	if (need(hi) <= 0) return 1;
	// need(α) rises from −C_p at α = 0; bisect for the first crossing
	for (let k = 0; k < 200; k++) {
		const mid = 0.5 * (lo + hi);
		if (need(mid) > 0) hi = mid;
		else lo = mid;
	}
	return 0.5 * (lo + hi);
}
