/**
 * Cross-section benchmark: the reference case (air–water at 20 °C, 0.2 m column, U_g = 0.05 m/s,
 * 4 mm bubbles, Tomiyama lift + Antal wall lubrication + Burns dispersion, 60 cells) run from its
 * initial state to steady state, and the circulation of the default small + large bubbles in 0.3 m and 1 m
 * columns against Riquarts (1981) and their section holdup against Akita & Yoshida (1973) and Hikita et al. (1980).
 * Prints nothing; returns the figures for `bench/index.ts`.
 * Run alone with `npx tsx bench/cross-section.ts`.
 */
import { defaultCase } from '../solver/case.js';
import { createCrossSectionSimulation, crossSectionParameters } from '../solver/cross-section/index.js';
import { akitaYoshidaHoldup } from '../solver/correlations/holdup.js';
import { hikitaHoldup } from '../solver/correlations/churn.js';
import { riquartsCentrelineVelocityMS } from '../solver/correlations/circulation.js';

export interface CrossSectionBenchFigures {
	case: string;
	cells: number;
	status: string;
	steps: number;
	simulatedTimeS: number;
	wallTimeS: number;
	nsPerCellStep: number;
	sectionHoldup: number;
	centrelineLiquidVelocityMS: number;
	reversalRadiusRatio: number;
	peak: string;
	axialPressureGradientPaM: number;
}

export function benchCrossSection(): CrossSectionBenchFigures {
	const c = defaultCase('cross-section');
	c.name = 'Cross-section reference: air–water, 0.2 m, U_g 0.05 m/s, 4 mm, Tomiyama + Antal + Burns';
	c.geometry.diameterM = 0.2;
	c.sparging.superficialGasVelocityMS = 0.05;
	c.sparging.superficialLiquidVelocityMS = 0;
	c.bubbles.classes = 'single';
	c.bubbles.sizing = 'fixed';
	c.bubbles.diameterM = 0.004;
	c.closures.lift = 'tomiyama';
	c.closures.wallLubrication = 'antal';
	c.closures.turbulentDispersion = 'burns';
	c.numerics.cells = 60;
	const sim = createCrossSectionSimulation(c);
	const t0 = performance.now();
	let status = sim.state.status;
	for (let k = 0; k < 1_000_000 && status === 'running'; k++) status = sim.step().status;
	const wallTimeS = (performance.now() - t0) / 1000;
	const r = sim.results();
	return {
		case: c.name,
		cells: c.numerics.cells,
		status,
		steps: sim.state.step,
		simulatedTimeS: sim.state.timeS,
		wallTimeS,
		nsPerCellStep: (wallTimeS * 1e9) / (sim.state.step * c.numerics.cells),
		sectionHoldup: r.design.sectionHoldup.value,
		centrelineLiquidVelocityMS: r.design.centrelineLiquidVelocityMS.value,
		reversalRadiusRatio: r.design.reversalRadiusRatio.value,
		peak: r.design.peakLocation.label,
		axialPressureGradientPaM: r.design.axialPressureGradientPaM.value
	};
}

export interface CirculationPoint {
	diameterM: number;
	ugMS: number;
	status: string;
	centrelineLiquidVelocityMS: number;
	/** Riquarts (1981): 0.21 √(g D) (U_G³/(g ν_l))^(1/8), formula from memory (PHYSICS §8.7) */
	riquartsMS: number;
	ratio: number;
	sectionHoldup: number;
	holdupSmall: number;
	holdupLarge: number;
	/** mean of Akita & Yoshida (1973) and Hikita et al. (1980) */
	correlationHoldup: number;
	peak: string;
}

/** The default bubble classes (air–water at 20 °C, 60 cells) at 0.02–0.35 m/s in 0.3 m and 1 m columns. */
export function circulationCurve(): CirculationPoint[] {
	const rl = 998.2;
	const mul = 1.002e-3;
	const rows: CirculationPoint[] = [];
	for (const diameterM of [0.3, 1]) {
		for (const ugMS of [0.02, 0.05, 0.1, 0.15, 0.2, 0.3, 0.35]) {
			const c = defaultCase('cross-section');
			c.geometry.diameterM = diameterM;
			c.sparging.superficialGasVelocityMS = ugMS;
			c.numerics.endTimeS = 600;
			const sim = createCrossSectionSimulation(c);
			while (sim.state.status === 'running' && sim.state.step < 200_000) sim.step();
			const d = sim.results().design;
			const riquartsMS = riquartsCentrelineVelocityMS({ diameterM, superficialGasVelocityMS: ugMS, liquidKinematicViscosityM2S: mul / rl });
			const col = { diameterM, superficialGasVelocityMS: ugMS, liquidDensityKgM3: rl, liquidViscosityPaS: mul, surfaceTensionNM: 0.0727 };
			const correlationHoldup = (akitaYoshidaHoldup(col) + hikitaHoldup({ ...col, gasDensityKgM3: crossSectionParameters(c).gasDensityKgM3, gasViscosityPaS: 1.81e-5 })) / 2;
			rows.push({
				diameterM,
				ugMS,
				status: sim.state.status,
				centrelineLiquidVelocityMS: d.centrelineLiquidVelocityMS.value,
				riquartsMS,
				ratio: d.centrelineLiquidVelocityMS.value / riquartsMS,
				sectionHoldup: d.sectionHoldup.value,
				holdupSmall: d.sectionHoldupSmall?.value ?? Number.NaN,
				holdupLarge: d.sectionHoldupLarge?.value ?? Number.NaN,
				correlationHoldup,
				peak: d.peakLocation.label
			});
		}
	}
	return rows;
}

if (import.meta.url === `file://${process.argv[1]}`) console.log(benchCrossSection(), circulationCurve());
