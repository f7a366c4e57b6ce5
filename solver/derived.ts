/**
 * Cheap derived numbers for the case editor (browser-safe: pure arithmetic, no solver run).
 */
import type { CaseDocument } from './case.js';
import { eotvosNumber, terminalVelocity } from './closures/drag.js';
import { hyperbolicityLimitHoldup, virtualMassCoefficient } from './closures/virtual-mass.js';
import { akitaYoshidaSauterDiameter } from './correlations/bubble-size.js';
import { regimeFromBand, regimeFromTransition } from './correlations/regime.js';
import { caseTransition, planClasses } from './height/classes.js';
import { GRAVITY_MS2, idealGasDensity, NORMAL_PRESSURE_PA, NORMAL_TEMPERATURE_K } from './fluids.js';
import { bairdRiceLiquidDispersion, deckwerLiquidDispersion } from './correlations/axial-dispersion.js';
import { saturationConcentrationKgM3, solutes } from './correlations/solubility.js';

export interface DerivedNumbers {
	/** bubble diameter used by the model (fixed, or Akita–Yoshida 1974), m */
	bubbleDiameterM: number;
	eotvos: number;
	morton: number;
	/** single-bubble terminal velocity of the chosen drag law, m/s */
	terminalVelocityMS: number;
	/** Reynolds number at that velocity */
	terminalReynolds: number;
	/** gas density at the sparger with the column at rest (top pressure + clear-liquid head), kg/m³ */
	spargerGasDensityKgM3: number;
	/** gas density at the top pressure, kg/m³ */
	topGasDensityKgM3: number;
	/** superficial gas velocity at sparger conditions, m/s */
	spargerSuperficialGasVelocityMS: number;
	/** gas mass flux fed at the sparger, kg/(m² s) */
	gasMassFluxKgM2S: number;
	regime: 0 | 1;
	regimeLabel: string;
	cellSizeM: number;
	/** first time step from the material CFL with the terminal velocity as the velocity scale, s */
	firstTimeStepS: number;
	/**
	 * largest holdup up to which the model with this virtual-mass and interfacial-pressure choice is
	 * hyperbolic (ρ_g → 0, PHYSICS §3.3); 1 = everywhere. Above it the model is not well-posed.
	 */
	wellPosedUpToHoldup: number;
	/** plain-language cautions about the closure choice for this case (empty when none apply) */
	warnings: string[];
	/** small + large bubbles (height profile only): the expected transition and the large bubbles it implies */
	classes: {
		transitionVelocityMS: number;
		transitionHoldup: number;
		transitionSource: string;
		largeDiameterM: number;
		largeGasShare: number;
		/** large-bubble swarm velocity, 0.71 √(g d) SF AF, m/s */
		largeSwarmVelocityMS: number;
	} | null;
	/** size classes (height profile only): the grid, where the cap drag starts and the dissipation rate of the kernels */
	sizeClasses: {
		/** d_{k+1}/d_k of the geometric grid */
		diameterRatio: number;
		/** diameter of the smallest class with the spherical-cap drag (Eo ≥ 40), m; null when no class is a cap */
		capFromDiameterM: number | null;
		/** ε = g U_G at the sparger, W/kg (common practice) */
		dissipationRateM2S3: number;
	} | null;
	/** mass transfer (height profile, mode other than `none`): saturation at the top and at the sparger, liquid dispersion */
	transfer: {
		/** saturation concentration with the gas fed at the top pressure (Henry's law), kg/m³ */
		surfaceSaturationKgM3: number;
		/** the same at the sparger with the column at rest, kg/m³ */
		bottomSaturationKgM3: number;
		solubilitySource: string;
		/** liquid axial dispersion coefficient, m²/s */
		dispersionM2S: number;
		dispersionSource: string;
	} | null;
}

export function spargerPressurePaAtRest(c: CaseDocument): number {
	return c.fluids.topPressurePa + c.fluids.liquid.densityKgM3 * GRAVITY_MS2 * c.geometry.clearLiquidLevelM;
}

/** The case's liquid axial dispersion coefficient (m²/s) at the sparger gas velocity, by its chosen correlation or as entered. */
export function liquidDispersionOfCase(c: CaseDocument): { valueM2S: number; source: string } {
	const t = c.transfer;
	if (t.dispersion === 'fixed') return { valueM2S: t.dispersionM2S, source: 'entered by the analyst' };
	const column = { columnDiameterM: c.geometry.diameterM, superficialGasVelocityMS: gasMassFlux(c) / spargerGasDensityAtRest(c) };
	return t.dispersion === 'deckwer'
		? { valueM2S: deckwerLiquidDispersion(column), source: 'Deckwer et al. 1974' }
		: { valueM2S: bairdRiceLiquidDispersion(column), source: 'Baird & Rice 1975' };
}

/** Gas density at the sparger with the column at rest (ideal gas), kg/m³. */
export function spargerGasDensityAtRest(c: CaseDocument): number {
	return idealGasDensity({ pressurePa: spargerPressurePaAtRest(c), molarMassKgMol: c.fluids.gas.molarMassKgMol, temperatureK: c.fluids.temperatureK });
}

/** Gas mass flux fed at the sparger, kg/(m² s), from the superficial velocity on its stated basis. */
export function gasMassFlux(c: CaseDocument): number {
	const basisPressure = c.sparging.gasVelocityBasis === 'normal' ? NORMAL_PRESSURE_PA : spargerPressurePaAtRest(c);
	const basisTemperature = c.sparging.gasVelocityBasis === 'normal' ? NORMAL_TEMPERATURE_K : c.fluids.temperatureK;
	const rho = idealGasDensity({ pressurePa: basisPressure, molarMassKgMol: c.fluids.gas.molarMassKgMol, temperatureK: basisTemperature });
	return rho * c.sparging.superficialGasVelocityMS;
}

/** Bubble diameter of the case: the fixed value, or Akita & Yoshida (1974) at sparger conditions. */
export function bubbleDiameter(c: CaseDocument): number {
	if (c.bubbles.sizing === 'fixed' || c.sparging.superficialGasVelocityMS <= 0) return c.bubbles.diameterM;
	const rhoSp = spargerGasDensityAtRest(c);
	return akitaYoshidaSauterDiameter({
		diameterM: c.geometry.diameterM,
		superficialGasVelocityMS: gasMassFlux(c) / rhoSp,
		liquidDensityKgM3: c.fluids.liquid.densityKgM3,
		liquidViscosityPaS: c.fluids.liquid.viscosityPaS,
		surfaceTensionNM: c.fluids.liquid.surfaceTensionNM
	});
}

export function derivedNumbers(c: CaseDocument): DerivedNumbers {
	const l = c.fluids.liquid;
	const g = GRAVITY_MS2;
	const rhoSp = spargerGasDensityAtRest(c);
	const rhoTop = idealGasDensity({ pressurePa: c.fluids.topPressurePa, molarMassKgMol: c.fluids.gas.molarMassKgMol, temperatureK: c.fluids.temperatureK });
	const d = bubbleDiameter(c);
	const props = { diameterM: d, liquidDensityKgM3: l.densityKgM3, gasDensityKgM3: rhoSp, liquidViscosityPaS: l.viscosityPaS, surfaceTensionNM: l.surfaceTensionNM };
	const ut = terminalVelocity({ law: c.closures.drag, ...props });
	const dRho = l.densityKgM3 - rhoSp;
	const massFlux = gasMassFlux(c);
	const plan = c.bubbles.classes === 'small-large' ? planClasses(c) : null;
	const classes =
		plan && plan.transition
			? {
					transitionVelocityMS: plan.transition.velocityMS,
					transitionHoldup: plan.transition.holdup,
					transitionSource: plan.transitionSource,
					largeDiameterM: plan.classes[1].diameterM,
					largeGasShare: plan.classes[1].inflowShare,
					largeSwarmVelocityMS: plan.largeSwarmVelocityMS
				}
			: null;
	const sizePlan = c.kind === 'height-profile' && c.bubbles.classes === 'size-classes' ? planClasses(c) : null;
	const sizeClasses = sizePlan?.sizeGrid
		? {
				diameterRatio: Math.cbrt(sizePlan.sizeGrid.ratio),
				capFromDiameterM: sizePlan.classes.find((k) => k.drag === 'spherical-cap')?.diameterM ?? null,
				dissipationRateM2S3: g * (massFlux / rhoSp)
			}
		: null;
	const regime = classes
		? regimeFromTransition({ superficialGasVelocityMS: massFlux / rhoSp, transitionVelocityMS: classes.transitionVelocityMS, source: classes.transitionSource })
		: regimeFromBand({ superficialGasVelocityMS: massFlux / rhoSp });
	const dz = c.geometry.heightM / c.numerics.cells;
	const t = c.transfer;
	let transfer: DerivedNumbers['transfer'] = null;
	if (c.kind === 'height-profile' && t.mode !== 'none') {
		const at = (pressurePa: number) =>
			saturationConcentrationKgM3({ solute: t.solute, temperatureK: c.fluids.temperatureK, pressurePa, moleFraction: t.inletGasMoleFraction, waterSaturatedGas: t.gasHumidity === 'saturated' });
		const dispersion = liquidDispersionOfCase(c);
		transfer = {
			surfaceSaturationKgM3: at(c.fluids.topPressurePa),
			bottomSaturationKgM3: at(spargerPressurePaAtRest(c)),
			solubilitySource: solutes[t.solute].source,
			dispersionM2S: dispersion.valueM2S,
			dispersionSource: dispersion.source
		};
	}
	const terminalReynolds = (l.densityKgM3 * ut * d) / l.viscosityPaS;
	const warnings: string[] = [];
	if (c.closures.drag === 'stokes' && terminalReynolds > 1) {
		warnings.push(`Stokes drag is valid for Re ≲ 0.1; this bubble rises at Re ≈ ${terminalReynolds.toPrecision(2)}, so its terminal velocity (${ut.toPrecision(3)} m/s) is far too high`);
	}
	const vm = c.closures.virtualMass === 'none' || (c.closures.virtualMass === 'constant' && c.closures.virtualMassCoefficient === 0);
	if (c.kind === 'height-profile' && vm) {
		warnings.push('Without virtual mass the level zone of the height profile is weakly damped; a run with fast bubbles can fail');
	}
	if (c.kind === 'height-profile' && t.mode !== 'none' && t.massTransferCoefficient === 'higbie' && d < 0.003) {
		// common practice (from memory): bubbles of a few millimetres in tap water have a rigid, contaminated interface
		warnings.push(
			`Bubbles of ${(d * 1000).toPrecision(2)} mm in tap or process water usually transfer as rigid spheres: the mobile-interface Higbie k_L can overstate the transfer several times (Frössling is the rigid-interface choice)`
		);
	}
	if (l.viscosityPaS > 0.1) {
		// measured with the default case (2 m, 0.2 m, 4 mm small bubbles, U_g 0.05 m/s): the slow small bubbles swell the
		// level to the outlet, with either large-bubble drag (the swarm drag no longer fails near the sparger since the
		// interfacial pressure of a class is capped at its drag, `solver/height/model.ts`)
		warnings.push(
			`The holdup and bubble-class descriptions are checked against correlations for low-viscosity liquids; at ${l.viscosityPaS.toPrecision(2)} Pa·s treat the results as outside their range`
		);
	}
	if (c.bubbles.classes === 'single') {
		const ugSp = massFlux / rhoSp;
		const { point: trans, source } = caseTransition(c, rhoSp);
		if (ugSp > trans.velocityMS) {
			// one size of a few millimetres over-predicts holdup above the transition and fails in churn-turbulent flow
			// (air–water, 0.3 m: 1.7–2.6 times Akita–Yoshida at 0.02–0.06 m/s and failing from 0.08 m/s with 4 mm bubbles;
			// a 0.3 m section with 5 mm bubbles fails at 0.2 m/s, tests/e2e/section-classes.spec.ts)
			warnings.push(
				`One bubble size above the regime transition (${trans.velocityMS.toPrecision(2)} m/s, ${source}): in churn-turbulent flow large bubbles carry most of the gas, and one size of small bubbles over-predicts the holdup or fails; small + large bubbles is the description checked there`
			);
		}
	}
	if (c.kind === 'cross-section' && classes && massFlux / rhoSp > classes.transitionVelocityMS) {
		const dCol = c.geometry.diameterM;
		// measured against Riquarts (1981) with the default classes, air–water (tests/solver/cross-section-classes.test.ts,
		// `npm run bench` crossSection.circulationCurve): within 30 % in a 0.3 m column at 0.05–0.4 m/s
		if (dCol < 0.2 || dCol > 0.6) {
			warnings.push(
				`The small + large bubble cross-section is checked against the centreline velocity of Riquarts (1981) in columns of about 0.3 m; at ${dCol} m its circulation can be off by a factor of two (a 1 m column: 0.5–1.5 times; 0.15 m above 0.2 m/s: no circulation; 3 m at 0.05 m/s: reversed), so treat it as an order of magnitude`
			);
		}
	}
	if (sizeClasses && massFlux / rhoSp > 0.03) {
		// measured in a 0.3 m air–water column (tests/solver/size-classes.test.ts): 0.97 of the correlations at 0.02 m/s,
		// 1.36 at 0.05 and 1.97 at 0.1 m/s, with d32 staying 5–6 mm
		warnings.push(
			'Above about 0.03 m/s the size classes’ coalescence and breakup kernels keep the bubbles near their sparger size and form no churn-turbulent large bubbles: the holdup comes out 1.4–2 times the published correlations (air–water, 0.05–0.1 m/s); use small and large bubbles for design there'
		);
	}
	if (sizeClasses && (d < c.bubbles.sizeClassMinDiameterM || d > c.bubbles.sizeClassMaxDiameterM)) {
		warnings.push(
			`The bubbles fed (${(d * 1000).toPrecision(2)} mm) lie outside the size classes (${(c.bubbles.sizeClassMinDiameterM * 1000).toPrecision(2)}–${(c.bubbles.sizeClassMaxDiameterM * 1000).toPrecision(2)} mm): their gas enters the ${d < c.bubbles.sizeClassMinDiameterM ? 'smallest' : 'largest'} class`
		);
	}
	if (c.closures.interfacialPressureCoefficient === 0) {
		warnings.push('With no interfacial pressure the one-dimensional two-fluid model is not well-posed (complex characteristics)');
	}
	return {
		bubbleDiameterM: d,
		eotvos: eotvosNumber(props),
		morton: (g * Math.pow(l.viscosityPaS, 4) * dRho) / (l.densityKgM3 * l.densityKgM3 * Math.pow(l.surfaceTensionNM, 3)),
		terminalVelocityMS: ut,
		terminalReynolds,
		spargerGasDensityKgM3: rhoSp,
		topGasDensityKgM3: rhoTop,
		spargerSuperficialGasVelocityMS: massFlux / rhoSp,
		gasMassFluxKgM2S: massFlux,
		regime: regime.value,
		regimeLabel: regime.label,
		cellSizeM: dz,
		firstTimeStepS: (c.numerics.cflNumber * dz) / Math.max(ut + Math.abs(c.sparging.superficialLiquidVelocityMS) + massFlux / rhoTop, 1e-3),
		// Zuber's C_VM grows with α; its value at α = 0.3 stands for the range where the limit matters. With no
		// interfacial pressure the characteristics are complex for any slip once ρ_g > 0 (PHYSICS §3.1, §3.3), which
		// the ρ_g → 0 limit of the criterion misses when there is no virtual mass either
		wellPosedUpToHoldup:
			c.closures.interfacialPressureCoefficient > 0
				? hyperbolicityLimitHoldup({
						virtualMassCoefficient: virtualMassCoefficient({ model: c.closures.virtualMass, holdup: 0.3, constant: c.closures.virtualMassCoefficient }),
						interfacialPressureCoefficient: c.closures.interfacialPressureCoefficient
					})
				: 0,
		warnings,
		classes,
		sizeClasses,
		transfer
	};
}
