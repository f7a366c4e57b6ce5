/**
 * Sauter mean bubble diameter.
 */
import { columnGroups, type ColumnInput } from './groups.js';

/** Akita & Yoshida (1974), Ind. Eng. Chem. Process Des. Dev. 13, 84: d₃₂/D = 26 Bo^−0.50 Ga^−0.12 Fr^−0.12 (from memory), m. */
export function akitaYoshidaSauterDiameter(o: ColumnInput): number {
	const { bond, galilei, froude } = columnGroups(o);
	return o.diameterM * 26 * Math.pow(bond, -0.5) * Math.pow(galilei, -0.12) * Math.pow(froude, -0.12);
}
