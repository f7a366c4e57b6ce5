/**
 * Cross-section benchmark: the reference case (air–water at 20 °C, 0.2 m column, U_g = 0.05 m/s,
 * 4 mm bubbles, Tomiyama lift + Antal wall lubrication + Burns dispersion, 60 cells) run from its
 * initial state to steady state. Prints nothing; returns the figures for `bench/index.ts`.
 * Run alone with `npx tsx bench/cross-section.ts`.
 */
import { defaultCase } from '../solver/case.js';
import { createCrossSectionSimulation } from '../solver/cross-section/index.js';

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

if (import.meta.url === `file://${process.argv[1]}`) console.log(benchCrossSection());
