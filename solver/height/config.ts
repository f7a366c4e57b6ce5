/**
 * Configuration of the height-profile model in SI units, built from a case or directly (for the
 * verification problems, which need pipe and closed-tube ends that a bubble-column case does not have).
 */
import type { CaseDocument, DragLaw } from '../case.js';
import { terminalVelocity } from '../closures/drag.js';
import type { SwarmCorrection } from '../closures/swarm.js';
import type { VirtualMassModel } from '../closures/virtual-mass.js';
import type { WallFrictionModel } from '../closures/friction.js';
import { bubbleDiameter, gasMassFlux, liquidDispersionOfCase, spargerGasDensityAtRest } from '../derived.js';
import { GAS_CONSTANT_J_MOL_K, GRAVITY_MS2 } from '../fluids.js';
import { planClasses } from './classes.js';
import { bensonKrauseWaterVapourPressurePa, solutes, type SoluteProperties } from '../correlations/solubility.js';

/** Bottom end (z = 0): prescribed inflow of both phases, or a closed wall. */
export type BottomBoundary =
	| {
			kind: 'inflow';
			/** gas mass flux entering, kg/(m² s) */
			gasMassFluxKgM2S: number;
			/** liquid volume flux entering (superficial velocity), m/s; negative = liquid leaves */
			liquidVolumeFluxMS: number;
			/** velocities of the incoming phases for momentum convection; omitted = zero gradient */
			gasVelocityMS?: number;
			liquidVelocityMS?: number;
	  }
	| { kind: 'wall' };

/** Top end (z = H): a pressure outlet, or a closed wall whose pressure is pinned (incompressible phases only). */
export type TopBoundary =
	| {
			kind: 'pressure';
			pressurePa: number;
			/**
			 * closed: liquid neither leaves nor enters (batch column); open: liquid may leave, what enters is gas;
			 * feed: liquid enters at a prescribed superficial velocity (counter-current operation)
			 */
			liquid: 'closed' | 'open' | 'feed';
			liquidFeedMS?: number;
	  }
	| { kind: 'wall'; pressurePa: number };

/** One bubble class of the gas: its own size, drag and share of the gas fed at the sparger. */
export interface GasClassConfig {
	/** stable id (snapshot field suffix): `small`, `large` */
	id: string;
	label: string;
	diameterM: number;
	/** single-bubble drag law; `spherical-cap` is C_D = 8/3, the Eo → ∞ limit of Tomiyama et al. (1998) */
	drag: DragLaw | 'spherical-cap';
	swarm: SwarmCorrection;
	/** factor on the interfacial drag (a swarm rising faster than one bubble by a factor F has 1/F²) */
	dragFactor: number;
	/** share of the gas mass fed at the sparger, 0–1 (the shares sum to 1) */
	inflowShare: number;
}

/**
 * Coalescence and breakup among the size classes (`population-source.ts`): the classes of `HeightModelConfig.classes`
 * are the pivots of `grid`, in order.
 */
export interface SizeClassSourceConfig {
	/** the pivot grid the classes sit on (minimum diameter, volume ratio, number of classes) */
	minDiameterM: number;
	volumeRatio: number;
	classes: number;
	/** Prince & Blanch (1990) coalescence on/off */
	coalescence: boolean;
	/** Luo & Svendsen (1996) breakup on/off */
	breakup: boolean;
	/** relative tolerance of the class-method integration over one time step (default 1e-5) */
	relativeTolerance?: number;
}

/** The solute transported in the liquid and in each bubble class (PHYSICS-style notes at the top of `transfer.ts`). */
export interface TransferConfig {
	mode: 'batch' | 'continuous' | 'steady';
	solute: SoluteProperties;
	/** Henry's constant at the case temperature, kg/m³ per Pa of solute partial pressure */
	henryKgM3Pa: number;
	/** water vapour pressure taken off the total pressure (0 for a dry gas), Pa */
	vapourPressurePa: number;
	initialConcentrationKgM3: number;
	/** concentration of the liquid entering through an end */
	inletConcentrationKgM3: number;
	/** solute mole fraction of the gas entering (sparger and, where gas enters there, the top) */
	inletGasMoleFraction: number;
	/** liquid axial dispersion coefficient, m²/s, and where it comes from */
	dispersionM2S: number;
	dispersionSource: string;
	massTransferCoefficient: 'higbie' | 'frossling';
	liquidHeatCapacityJKgK: number;
	liquidThermalConductivityWMK: number;
	/** sampling interval of the dissolved-concentration series (the case's snapshot interval), s */
	sampleIntervalS: number;
	/** first-order consumption in the liquid, 1/s per unit liquid volume (verification problems; 0 otherwise) */
	liquidSinkPerS?: number;
	/** factor on k_L a (verification problems: 0 switches the exchange off; 1 otherwise) */
	interfaceFactor?: number;
}

export interface HeightModelConfig {
	cells: number;
	heightM: number;
	diameterM: number;
	liquidDensityKgM3: number;
	liquidViscosityPaS: number;
	surfaceTensionNM: number;
	gasMolarMassKgMol: number;
	gasViscosityPaS: number;
	temperatureK: number;
	/** constant gas density; when omitted the gas is ideal with ρ_g = p M/(R T) */
	gasDensityKgM3?: number;
	/** signed axial component of gravity, m/s² (−9.81 for a column with z upward) */
	gravityAxialMS2: number;
	bubbleDiameterM: number;
	/** numbers known before the run that the results carry (expected transition, large-bubble size), SI */
	expected?: Record<string, { value: number; unit: string; label: string }>;
	/** where the transition of the classes comes from (the regime label names it) */
	transitionSource?: string;
	/** two or more bubble classes; omitted = one class of `bubbleDiameterM` with `drag` and `swarm` */
	classes?: GasClassConfig[];
	/** coalescence and breakup among the classes (size classes only); omitted = the classes keep their gas */
	sizeClasses?: SizeClassSourceConfig;
	/** 'none' switches interfacial drag off (the faucet benchmark assumes no interfacial friction) */
	drag: DragLaw | 'none';
	swarm: SwarmCorrection;
	virtualMass: VirtualMassModel;
	virtualMassCoefficient: number;
	interfacialPressureCoefficient: number;
	wallFriction: WallFrictionModel;
	/** separated-flow limit above the level: blend bubbly drag into droplet drag between these holdups */
	dropletBlend: { fromHoldup: number; toHoldup: number; dropDiameterM: number } | null;
	scheme: CaseDocument['numerics']['scheme'];
	cflNumber: number;
	maxTimeStepS: number;
	endTimeS: number;
	steadyTolerance: number;
	/** false: never stop on steady state (benchmarks with a fixed end time) */
	detectSteady: boolean;
	/** length of the window over which the steady rule compares integral measures, s */
	steadyWindowS: number;
	bottom: BottomBoundary;
	top: TopBoundary;
	initial: {
		/** gas holdup per cell */
		holdup: (zBottomM: number, zTopM: number) => number;
		gasVelocityMS: number;
		liquidVelocityMS: number;
	};
	/** velocity scale for the first time step, m/s */
	velocityScaleMS: number;
	/** gas density at the sparger with the column at rest (normalises residuals), kg/m³ */
	referenceGasDensityKgM3: number;
	clearLiquidLevelM: number;
	soluteDiffusivityM2S: number;
	/** mass transfer along the column; omitted = none (the hydrodynamics alone, as before) */
	transfer?: TransferConfig;
}

/** The transfer configuration of a validated height-profile case (null for mode `none`). */
export function transferConfigFromCase(c: CaseDocument): TransferConfig | null {
	const t = c.transfer;
	if (t.mode === 'none') return null;
	const { valueM2S: dispersionM2S, source: dispersionSource } = liquidDispersionOfCase(c);
	const solute = solutes[t.solute];
	const T = c.fluids.temperatureK;
	return {
		mode: t.mode,
		solute,
		henryKgM3Pa: solute.henryKgM3Pa(T),
		vapourPressurePa: t.gasHumidity === 'saturated' ? bensonKrauseWaterVapourPressurePa(T) : 0,
		initialConcentrationKgM3: t.initialConcentrationKgM3,
		inletConcentrationKgM3: t.inletConcentrationKgM3,
		inletGasMoleFraction: t.inletGasMoleFraction,
		dispersionM2S,
		dispersionSource,
		massTransferCoefficient: t.massTransferCoefficient,
		liquidHeatCapacityJKgK: t.liquidHeatCapacityJKgK,
		liquidThermalConductivityWMK: t.liquidThermalConductivityWMK,
		sampleIntervalS: c.numerics.snapshotIntervalS
	};
}

/** Build the model configuration of a validated height-profile case. */
export function configFromCase(c: CaseDocument): HeightModelConfig {
	const d = bubbleDiameter(c);
	const rhoSp = spargerGasDensityAtRest(c);
	const l = c.fluids.liquid;
	const ut = terminalVelocity({ law: c.closures.drag, diameterM: d, liquidDensityKgM3: l.densityKgM3, gasDensityKgM3: rhoSp, liquidViscosityPaS: l.viscosityPaS, surfaceTensionNM: l.surfaceTensionNM });
	const level = c.geometry.clearLiquidLevelM;
	const jl = c.sparging.superficialLiquidVelocityMS;
	const plan = planClasses(c);
	const transfer = transferConfigFromCase(c);
	const expected: NonNullable<HeightModelConfig['expected']> = {};
	if (plan.transition) {
		expected.transitionVelocityMS = { value: plan.transition.velocityMS, unit: 'm/s', label: `Transition gas velocity (${plan.transitionSource})` };
		expected.transitionHoldup = { value: plan.transition.holdup, unit: '1', label: `Transition holdup (${plan.transitionSource})` };
		expected.largeGasShare = { value: plan.classes[1].inflowShare, unit: '1', label: 'Share of the gas fed as large bubbles' };
		expected.largeAccelerationFactor = { value: plan.accelerationFactor, unit: '1', label: 'Large-bubble swarm acceleration factor (Krishna et al. 1999)' };
		expected.largeWallFactor = { value: plan.wallFactor, unit: '1', label: 'Large-bubble wall factor (Collins 1967)' };
	}
	if (plan.sizeGrid) {
		const jg = gasMassFlux(c) / rhoSp;
		expected.sizeClassDiameterRatio = { value: Math.cbrt(plan.sizeGrid.ratio), unit: '1', label: 'Diameter ratio of neighbouring size classes' };
		expected.dissipationRateM2S3 = { value: GRAVITY_MS2 * jg, unit: 'W/kg', label: 'Turbulence dissipation rate at the sparger, ε = g U_G (common practice)' };
	}
	return {
		...(plan.classes.length > 1 ? { classes: plan.classes, expected, transitionSource: plan.transitionSource } : {}),
		...(plan.sizeGrid ? { sizeClasses: { minDiameterM: plan.sizeGrid.diametersM[0], volumeRatio: plan.sizeGrid.ratio, classes: plan.sizeGrid.classes, coalescence: true, breakup: true } } : {}),
		cells: c.numerics.cells,
		heightM: c.geometry.heightM,
		diameterM: c.geometry.diameterM,
		liquidDensityKgM3: l.densityKgM3,
		liquidViscosityPaS: l.viscosityPaS,
		surfaceTensionNM: l.surfaceTensionNM,
		gasMolarMassKgMol: c.fluids.gas.molarMassKgMol,
		gasViscosityPaS: c.fluids.gas.viscosityPaS,
		temperatureK: c.fluids.temperatureK,
		gravityAxialMS2: -GRAVITY_MS2,
		bubbleDiameterM: d,
		drag: c.closures.drag,
		swarm: c.closures.swarm,
		virtualMass: c.closures.virtualMass,
		virtualMassCoefficient: c.closures.virtualMassCoefficient,
		interfacialPressureCoefficient: c.closures.interfacialPressureCoefficient,
		wallFriction: c.closures.wallFriction,
		dropletBlend: { fromHoldup: 0.7, toHoldup: 0.9, dropDiameterM: 1e-3 },
		scheme: c.numerics.scheme,
		cflNumber: c.numerics.cflNumber,
		maxTimeStepS: 0.05,
		endTimeS: c.numerics.endTimeS,
		steadyTolerance: c.numerics.steadyTolerance,
		detectSteady: true,
		steadyWindowS: 1,
		bottom: { kind: 'inflow', gasMassFluxKgM2S: gasMassFlux(c), liquidVolumeFluxMS: jl },
		top:
			jl > 0
				? { kind: 'pressure', pressurePa: c.fluids.topPressurePa, liquid: 'open' }
				: jl < 0
					? { kind: 'pressure', pressurePa: c.fluids.topPressurePa, liquid: 'feed', liquidFeedMS: -jl }
					: { kind: 'pressure', pressurePa: c.fluids.topPressurePa, liquid: 'closed' },
		initial: {
			holdup: (z0, z1) => (z1 <= level ? 0 : z0 >= level ? 1 : 1 - (level - z0) / (z1 - z0)),
			gasVelocityMS: 0,
			liquidVelocityMS: 0
		},
		velocityScaleMS: ut + Math.abs(jl) + c.sparging.superficialGasVelocityMS,
		referenceGasDensityKgM3: rhoSp,
		clearLiquidLevelM: level,
		soluteDiffusivityM2S: c.fluids.soluteDiffusivityM2S,
		...(transfer ? { transfer } : {})
	};
}

/** dρ_g/dp of the configured gas, s²/m² (0 for a constant-density gas). */
export function gasCompressibility(cfg: HeightModelConfig): number {
	return cfg.gasDensityKgM3 === undefined ? cfg.gasMolarMassKgMol / (GAS_CONSTANT_J_MOL_K * cfg.temperatureK) : 0;
}
