/**
 * Overall gas holdup correlations for batch bubble columns.
 */
import { bisect, columnGroups, type ColumnInput } from './groups.js';

/**
 * Akita & Yoshida (1973), Ind. Eng. Chem. Process Des. Dev. 12, 76: ε/(1 − ε)⁴ = C Bo^(1/8) Ga^(1/12) Fr,
 * C = 0.20 for pure liquids and non-electrolytes, 0.25 for electrolytes (constants from memory).
 * The original data cover D = 0.152–0.6 m; for D > 0.6 m the common practice is to use D = 0.6 m.
 */
export function akitaYoshidaHoldup(o: ColumnInput & { electrolyte?: boolean }): number {
	if (o.superficialGasVelocityMS <= 0) return 0;
	const { bond, galilei, froude } = columnGroups({ ...o, diameterM: Math.min(o.diameterM, 0.6) });
	const c = o.electrolyte ? 0.25 : 0.2;
	const rhs = c * Math.pow(bond, 1 / 8) * Math.pow(galilei, 1 / 12) * froude;
	return bisect((e) => e / Math.pow(1 - e, 4) - rhs, 0, 1 - 1e-12);
}

/**
 * Hughmark (1967), Ind. Eng. Chem. Process Des. Dev. 6, 218, as the analytical fit
 * ε = 1/[2 + (0.35/U_G)(ρ_L σ/72)^(1/3)] with ρ_L in g/cm³ and σ in mN/m (fit from memory).
 */
export function hughmarkHoldup(o: { superficialGasVelocityMS: number; liquidDensityKgM3: number; surfaceTensionNM: number }): number {
	if (o.superficialGasVelocityMS <= 0) return 0;
	const rhoGcm3 = o.liquidDensityKgM3 / 1000;
	const sigmaMNm = o.surfaceTensionNM * 1000;
	return 1 / (2 + (0.35 / o.superficialGasVelocityMS) * Math.cbrt((rhoGcm3 * sigmaMNm) / 72));
}
