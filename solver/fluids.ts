/**
 * Fluid property presets at 20 °C (293.15 K) and 1 atm. SI units throughout.
 * Each preset names its source; values tagged "from memory" in the physics reference are marked so
 * here too, because the case editor shows the source beside the numbers.
 */
import type { CaseDocument } from './case.js';

/** Universal gas constant, J/(mol·K) (CODATA 2018, exact in the revised SI). */
export const GAS_CONSTANT_J_MOL_K = 8.314462618;
/** Standard gravity, m/s² (value used throughout the physics reference). */
export const GRAVITY_MS2 = 9.81;
/** Normal conditions for a gas flow quoted "at normal conditions": 0 °C, 1 atm (common practice). */
export const NORMAL_TEMPERATURE_K = 273.15;
export const NORMAL_PRESSURE_PA = 101325;

export interface LiquidProperties {
	name: string;
	densityKgM3: number;
	viscosityPaS: number;
	surfaceTensionNM: number;
	source: string;
}

export interface GasProperties {
	name: string;
	molarMassKgMol: number;
	viscosityPaS: number;
	source: string;
}

export interface FluidPreset {
	id: string;
	label: string;
	liquid: LiquidProperties;
	gas: GasProperties;
	temperatureK: number;
	solute: string;
	soluteDiffusivityM2S: number;
	soluteSource: string;
}

const water: LiquidProperties = {
	name: 'water',
	densityKgM3: 998.2,
	viscosityPaS: 1.002e-3,
	surfaceTensionNM: 0.0727,
	source: 'CRC Handbook of Chemistry and Physics; surface tension IAPWS R1-76(2014) (72.74 mN/m at 20 °C)'
};

const air: GasProperties = {
	name: 'air',
	molarMassKgMol: 0.02896,
	viscosityPaS: 1.81e-5,
	source: 'CRC Handbook of Chemistry and Physics (dry air, 20 °C)'
};

const oxygenInWater = {
	solute: 'oxygen',
	soluteDiffusivityM2S: 2.0e-9,
	soluteSource: 'O₂ in water at 20 °C, 2.0e-9 m²/s (handbook value, from memory)'
};

export const fluidPresets: readonly FluidPreset[] = [
	{ id: 'air-water-20C', label: 'Air – water, 20 °C', liquid: water, gas: air, temperatureK: 293.15, ...oxygenInWater },
	{
		id: 'nitrogen-water-20C',
		label: 'Nitrogen – water, 20 °C',
		liquid: water,
		gas: { name: 'nitrogen', molarMassKgMol: 0.028014, viscosityPaS: 1.76e-5, source: 'CRC Handbook (N₂ viscosity at 20 °C, from memory)' },
		temperatureK: 293.15,
		...oxygenInWater
	},
	{
		id: 'oxygen-water-20C',
		label: 'Oxygen – water, 20 °C',
		liquid: water,
		gas: { name: 'oxygen', molarMassKgMol: 0.031998, viscosityPaS: 2.04e-5, source: 'CRC Handbook (O₂ viscosity at 20 °C, from memory)' },
		temperatureK: 293.15,
		...oxygenInWater
	},
	{
		id: 'air-glycerol-water-80wt-20C',
		label: 'Air – glycerol/water 80 wt %, 20 °C',
		liquid: {
			name: 'glycerol–water 80 wt %',
			densityKgM3: 1208,
			viscosityPaS: 0.0609,
			surfaceTensionNM: 0.065,
			source: 'viscosity Cheng (2008) Ind. Eng. Chem. Res. 47, 3285; density and surface tension handbook values (from memory)'
		},
		gas: air,
		temperatureK: 293.15,
		solute: 'oxygen',
		// 2.0e-9 · (0.0609/1.002e-3)^(−2/3) = 1.29e-10
		soluteDiffusivityM2S: 1.3e-10,
		soluteSource: 'O₂ diffusivity scaled from water by the viscosity ratio to the power −2/3 (estimate)'
	},
	{
		id: 'air-glycerol-20C',
		label: 'Air – glycerol, 20 °C',
		liquid: {
			name: 'glycerol',
			densityKgM3: 1261,
			viscosityPaS: 1.412,
			surfaceTensionNM: 0.0634,
			source: 'CRC Handbook (pure glycerol at 20 °C, from memory; Cheng 2008 gives 1.414 Pa·s)'
		},
		gas: air,
		temperatureK: 293.15,
		solute: 'oxygen',
		soluteDiffusivityM2S: 1.0e-11,
		soluteSource: 'order-of-magnitude estimate for a very viscous liquid'
	},
	{
		id: 'air-ethanol-20C',
		label: 'Air – ethanol, 20 °C',
		liquid: {
			name: 'ethanol',
			densityKgM3: 789,
			viscosityPaS: 1.144e-3,
			surfaceTensionNM: 0.0223,
			source: 'CRC Handbook (density and viscosity at 20 °C); surface tension ≈ 22.3 mN/m (from memory)'
		},
		gas: air,
		temperatureK: 293.15,
		solute: 'oxygen',
		soluteDiffusivityM2S: 2.4e-9,
		soluteSource: 'O₂ in ethanol, order of 2e-9 m²/s (estimate)'
	}
];

export function findFluidPreset(id: string): FluidPreset | undefined {
	return fluidPresets.find((p) => p.id === id);
}

/** The `fluids` section of a case filled from a preset (top pressure kept from `base`). */
export function applyFluidPreset(fluids: CaseDocument['fluids'], id: string): CaseDocument['fluids'] {
	const p = findFluidPreset(id);
	if (!p) throw new Error(`Unknown fluid preset "${id}"`);
	const { source: _ls, ...liquid } = p.liquid;
	const { source: _gs, ...gas } = p.gas;
	return {
		...fluids,
		preset: p.id,
		liquid: { ...liquid },
		gas: { ...gas },
		temperatureK: p.temperatureK,
		solute: p.solute,
		soluteDiffusivityM2S: p.soluteDiffusivityM2S
	};
}

/** Ideal-gas density ρ = p M / (R T), kg/m³. */
export function idealGasDensity(o: { pressurePa: number; molarMassKgMol: number; temperatureK: number }): number {
	return (o.pressurePa * o.molarMassKgMol) / (GAS_CONSTANT_J_MOL_K * o.temperatureK);
}
