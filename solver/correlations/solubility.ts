/**
 * Solubility of the transferred gas in water: Henry's law c* = H(T) · p_solute, with H in kg/m³ per Pa of partial
 * pressure. Oxygen from the Benson & Krause (1984) saturation equation (PHYSICS §13.2), other gases from the
 * Sander (2023) compilation. The partial pressure is y (p − p_w) for a gas saturated with water vapour, y p for a dry one.
 */
import { GAS_CONSTANT_J_MOL_K, GRAVITY_MS2, NORMAL_PRESSURE_PA } from '../fluids.js';

/** Mole fraction of oxygen in dry air (PHYSICS §14, from memory). */
export const OXYGEN_IN_AIR = 0.20946;

/**
 * Benson & Krause (1984), Limnol. Oceanogr. 29, 620 (as in APHA Standard Methods): oxygen in fresh water in
 * equilibrium with water-saturated air at 101.325 kPa, ln C_s[mg/L] = −139.34411 + 1.575701e5/T − 6.642308e7/T²
 * + 1.243800e10/T³ − 8.621949e11/T⁴, T in K. Returns kg/m³ (9.092e-3 at 293.15 K).
 */
export function bensonKrauseOxygenSaturationKgM3(temperatureK: number): number {
	const T = temperatureK;
	const lnCs = -139.34411 + 1.575701e5 / T - 6.642308e7 / (T * T) + 1.2438e10 / (T * T * T) - 8.621949e11 / (T * T * T * T);
	return Math.exp(lnCs) * 1e-3;
}

/**
 * Vapour pressure of water used with the Benson & Krause equation (Benson & Krause 1980, as in the USGS dissolved-oxygen
 * tables): ln p_w[atm] = 11.8571 − 3840.70/T − 216961/T², T in K. Returns Pa (2337 Pa at 293.15 K).
 */
export function bensonKrauseWaterVapourPressurePa(temperatureK: number): number {
	const T = temperatureK;
	return Math.exp(11.8571 - 3840.7 / T - 216961 / (T * T)) * NORMAL_PRESSURE_PA;
}

/**
 * Henry's law constant of oxygen in water from Benson & Krause (1984): the saturation C_s(T) with water-saturated air at
 * 1 atm divided by its oxygen partial pressure 0.20946 (101325 Pa − p_w(T)); kg/m³ per Pa (ideal gas and ideal solution:
 * the small non-ideality term of Benson & Krause, below 0.1 % per atmosphere, is left out).
 */
export function oxygenHenryKgM3Pa(temperatureK: number): number {
	return bensonKrauseOxygenSaturationKgM3(temperatureK) / (OXYGEN_IN_AIR * (NORMAL_PRESSURE_PA - bensonKrauseWaterVapourPressurePa(temperatureK)));
}

/**
 * Henry's law with its temperature dependence as tabulated by Sander (2023), Atmos. Chem. Phys. 23, 10901:
 * H^cp(T) = H^cp(298.15 K) exp(B (1/T − 1/298.15 K)), B = d ln H^cp/d(1/T); mol/(m³ Pa).
 */
export function sanderHenryMolM3Pa(o: { henryAt298MolM3Pa: number; temperatureFactorK: number; temperatureK: number }): number {
	return o.henryAt298MolM3Pa * Math.exp(o.temperatureFactorK * (1 / o.temperatureK - 1 / 298.15));
}

export interface SoluteProperties {
	id: 'oxygen' | 'carbon-dioxide';
	label: string;
	/** chemical formula for labels */
	formula: string;
	/** key of the dissolved-concentration series of a batch run (`results.series`) */
	seriesId: string;
	molarMassKgMol: number;
	/** Henry's constant at temperature T, kg/m³ per Pa of partial pressure */
	henryKgM3Pa: (temperatureK: number) => number;
	source: string;
}

export const solutes: Record<SoluteProperties['id'], SoluteProperties> = {
	oxygen: {
		id: 'oxygen',
		label: 'oxygen',
		formula: 'O₂',
		seriesId: 'dissolvedOxygen',
		molarMassKgMol: 0.031998,
		henryKgM3Pa: oxygenHenryKgM3Pa,
		source: 'Benson & Krause (1984) saturation with water-saturated air, Limnol. Oceanogr. 29, 620'
	},
	'carbon-dioxide': {
		id: 'carbon-dioxide',
		label: 'carbon dioxide',
		formula: 'CO₂',
		seriesId: 'dissolvedCarbonDioxide',
		molarMassKgMol: 0.04401,
		// Sander's recommended CO₂ entry: 3.3e-4 mol/(m³ Pa) at 298.15 K, B = 2400 K (values as in his version 4.0, 2015)
		henryKgM3Pa: (t) => sanderHenryMolM3Pa({ henryAt298MolM3Pa: 3.3e-4, temperatureFactorK: 2400, temperatureK: t }) * 0.04401,
		source: 'Sander (2023), Atmos. Chem. Phys. 23, 10901: H = 3.3e-4 mol/(m³ Pa) at 25 °C, d ln H/d(1/T) = 2400 K (CO₂ as dissolved gas, no carbonate equilibria)'
	}
};

/** Saturation concentration in equilibrium with a gas of solute mole fraction y at total pressure p, kg/m³. */
export function saturationConcentrationKgM3(o: { solute: SoluteProperties['id']; temperatureK: number; pressurePa: number; moleFraction: number; waterSaturatedGas?: boolean }): number {
	const pw = o.waterSaturatedGas === false ? 0 : bensonKrauseWaterVapourPressurePa(o.temperatureK);
	return solutes[o.solute].henryKgM3Pa(o.temperatureK) * o.moleFraction * Math.max(o.pressurePa - pw, 0);
}

/** Dimensionless solubility c_l/c_g = H^cp R T of a solute (0.033 for oxygen at 20 °C). */
export function dimensionlessSolubility(solute: SoluteProperties['id'], temperatureK: number): number {
	const s = solutes[solute];
	return (s.henryKgM3Pa(temperatureK) / s.molarMassKgMol) * GAS_CONSTANT_J_MOL_K * temperatureK;
}

/**
 * Effective saturation depth, ASCE/EWRI 2-06: the depth below the surface at which the gas fed is in equilibrium with
 * the equilibrium concentration C∞, from C∞ = C_s,top (p_top + ρ g d_e − p_w)/(p_top − p_w), m (NaN without a
 * surface saturation).
 */
export function effectiveSaturationDepthM(o: { equilibriumKgM3: number; surfaceSaturationKgM3: number; topPressurePa: number; vapourPressurePa: number; liquidDensityKgM3: number }): number {
	return o.surfaceSaturationKgM3 > 0
		? ((o.equilibriumKgM3 / o.surfaceSaturationKgM3 - 1) * Math.max(o.topPressurePa - o.vapourPressurePa, 0)) / (o.liquidDensityKgM3 * GRAVITY_MS2)
		: Number.NaN;
}
