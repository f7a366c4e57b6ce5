/**
 * Model configurations of the verification problems that need pipe or closed-tube ends
 * (not user-facing cases). Setups as described in PHYSICS §11.
 */
import type { HeightModelConfig } from './config.js';
import { solutes } from '../correlations/solubility.js';

const common = {
	diameterM: 1,
	liquidDensityKgM3: 1000,
	liquidViscosityPaS: 1.0e-3,
	surfaceTensionNM: 0.0727,
	gasMolarMassKgMol: 0.02896,
	gasViscosityPaS: 1.8e-5,
	temperatureK: 293.15,
	swarm: 'none',
	wallFriction: 'none',
	steadyWindowS: 1,
	soluteDiffusivityM2S: 2e-9
} as const;

/**
 * Ransom's water faucet (Ransom 1987; PHYSICS §11.1): a 12 m vertical pipe, liquid fed at the top at 10 m/s
 * with α_g = 0.2, gas at rest, bottom open at 1e5 Pa; no interfacial friction, gas of small constant density.
 * The pipe axis z points downward along the flow, so gravity is +9.81 m/s² along z; the inlet is the z = 0 end.
 */
export function faucetConfig(o: { cells: number; endTimeS: number; scheme?: HeightModelConfig['scheme']; cflNumber?: number }): HeightModelConfig {
	return {
		...common,
		cells: o.cells,
		heightM: 12,
		gasDensityKgM3: 1.16,
		gravityAxialMS2: 9.81,
		bubbleDiameterM: 1e-3,
		drag: 'none',
		virtualMass: 'none',
		virtualMassCoefficient: 0,
		interfacialPressureCoefficient: 0,
		dropletBlend: null,
		scheme: o.scheme ?? 'donor-cell',
		cflNumber: o.cflNumber ?? 0.5,
		maxTimeStepS: 1,
		endTimeS: o.endTimeS,
		steadyTolerance: 1e-12,
		detectSteady: false,
		bottom: { kind: 'inflow', gasMassFluxKgM2S: 0, liquidVolumeFluxMS: 0.8 * 10, gasVelocityMS: 0, liquidVelocityMS: 10 },
		top: { kind: 'pressure', pressurePa: 1e5, liquid: 'open' },
		initial: { holdup: () => 0.2, gasVelocityMS: 0, liquidVelocityMS: 10 },
		velocityScaleMS: 15,
		referenceGasDensityKgM3: 1.16,
		clearLiquidLevelM: 12
	};
}

/**
 * Ransom's sedimentation (PHYSICS §11.2): a 7.5 m tube closed at both ends, initially α_g = 0.5 at rest,
 * ρ_l = 1000 and ρ_g = 1.16 kg/m³ (both incompressible here), 1e5 Pa held at the top wall.
 * Bubbly drag (Schiller–Naumann, `bubbleDiameterM`) with the separated-flow limit above α = 0.7.
 */
export function sedimentationConfig(o: { cells: number; endTimeS: number; bubbleDiameterM?: number }): HeightModelConfig {
	return {
		...common,
		cells: o.cells,
		heightM: 7.5,
		gasDensityKgM3: 1.16,
		gravityAxialMS2: -9.81,
		bubbleDiameterM: o.bubbleDiameterM ?? 4e-3,
		drag: 'schiller-naumann',
		virtualMass: 'constant',
		virtualMassCoefficient: 0.5,
		interfacialPressureCoefficient: 0.25,
		dropletBlend: { fromHoldup: 0.7, toHoldup: 0.9, dropDiameterM: 1e-3 },
		scheme: 'donor-cell',
		cflNumber: 0.5,
		maxTimeStepS: 0.1,
		endTimeS: o.endTimeS,
		steadyTolerance: 1e-8,
		detectSteady: false,
		bottom: { kind: 'wall' },
		top: { kind: 'wall', pressurePa: 1e5 },
		initial: { holdup: () => 0.5, gasVelocityMS: 0, liquidVelocityMS: 0 },
		velocityScaleMS: 0.3,
		referenceGasDensityKgM3: 1.16,
		clearLiquidLevelM: 3.75
	};
}

/**
 * The axial-dispersion reactor of Danckwerts (1953), Chem. Eng. Sci. 2, 1: a vertical pipe full of liquid fed at the
 * bottom at `liquidVelocityMS`, no gas, a solute entering at concentration 1 kg/m³ with axial dispersion and a
 * first-order consumption k (1/s); the ends are closed to dispersion. Its steady state is
 * D c'' − u c' − k c = 0, u c_in = u c(0) − D c'(0), c'(L) = 0.
 */
export function dispersionReactorConfig(o: { cells: number; heightM: number; liquidVelocityMS: number; dispersionM2S: number; sinkPerS: number }): HeightModelConfig {
	return {
		...common,
		cells: o.cells,
		heightM: o.heightM,
		gasDensityKgM3: 1.16,
		gravityAxialMS2: -9.81,
		bubbleDiameterM: 4e-3,
		drag: 'schiller-naumann',
		virtualMass: 'constant',
		virtualMassCoefficient: 0.5,
		interfacialPressureCoefficient: 0.25,
		dropletBlend: { fromHoldup: 0.7, toHoldup: 0.9, dropDiameterM: 1e-3 },
		scheme: 'donor-cell',
		cflNumber: 0.5,
		maxTimeStepS: 0.1,
		endTimeS: 10,
		steadyTolerance: 1e-8,
		detectSteady: false,
		bottom: { kind: 'inflow', gasMassFluxKgM2S: 0, liquidVolumeFluxMS: o.liquidVelocityMS, gasVelocityMS: 0, liquidVelocityMS: o.liquidVelocityMS },
		top: { kind: 'pressure', pressurePa: 1e5, liquid: 'open' },
		initial: { holdup: () => 0, gasVelocityMS: 0, liquidVelocityMS: o.liquidVelocityMS },
		velocityScaleMS: o.liquidVelocityMS,
		referenceGasDensityKgM3: 1.16,
		clearLiquidLevelM: o.heightM,
		transfer: {
			mode: 'continuous',
			solute: solutes.oxygen,
			henryKgM3Pa: 0,
			vapourPressurePa: 0,
			initialConcentrationKgM3: 0,
			inletConcentrationKgM3: 1,
			inletGasMoleFraction: 0,
			dispersionM2S: o.dispersionM2S,
			dispersionSource: 'entered',
			massTransferCoefficient: 'higbie',
			liquidHeatCapacityJKgK: 4182,
			liquidThermalConductivityWMK: 0.598,
			sampleIntervalS: 1,
			liquidSinkPerS: o.sinkPerS,
			interfaceFactor: 0
		}
	};
}
