/**
 * Solver benchmark: prints JSON with the cost per cell-step of the height-profile model at 100, 400 and
 * 1600 cells, and the wall time and steps to steady state of the reference case (air–water, 2 m column,
 * 0.2 m diameter, 1.5 m clear level, 4 mm bubbles, U_g = 0.05 m/s, Schiller–Naumann, 100 cells), the cost of
 * the default small + large bubbles against one class at 400 cells, and `holdupCurve`: the 0.3 m air–water sweep
 * of the default classes with Akita–Yoshida (1973) and Hikita et al. (1980) beside it.
 * The cross-section figures are added when `bench/cross-section.ts` is present.
 * Figures, not assertions: `npm run bench` or `npx tsx bench/index.ts`.
 */
import { defaultCase } from '../solver/case.js';
import { createHeightSimulation } from '../solver/height/simulation.js';
import { SOLVER_VERSION } from '../solver/index.js';
import { akitaYoshidaHoldup } from '../solver/correlations/holdup.js';
import { hikitaHoldup } from '../solver/correlations/churn.js';

function referenceCase() {
	const c = defaultCase();
	c.name = 'Height-profile reference: air–water, 2 m, 0.2 m, 1.5 m clear level, 4 mm, U_g 0.05 m/s, Schiller–Naumann, 100 cells';
	c.geometry = { heightM: 2, diameterM: 0.2, clearLiquidLevelM: 1.5 };
	c.bubbles = { ...c.bubbles, classes: 'single', sizing: 'fixed', diameterM: 0.004 };
	c.sparging.superficialGasVelocityMS = 0.05;
	c.closures.drag = 'schiller-naumann';
	c.numerics.cells = 100;
	c.numerics.endTimeS = 300;
	return c;
}

/** The default two-class case (small + large bubbles) on the reference column at U_g 0.15 m/s. */
function twoClassCase() {
	const c = defaultCase();
	c.geometry = { heightM: 2, diameterM: 0.2, clearLiquidLevelM: 1.5 };
	c.sparging.superficialGasVelocityMS = 0.15;
	c.numerics.endTimeS = 300;
	return c;
}

/** Nanoseconds per cell-step over a stretch of the transient after a warm-up (no steady stop, no snapshots). */
function costPerCellStep(cells: number, build = referenceCase) {
	const c = build();
	c.numerics.cells = cells;
	const sim = createHeightSimulation(c, { detectSteady: false });
	const warm = 50;
	for (let k = 0; k < warm; k++) sim.step();
	const steps = Math.max(300, Math.round(4e6 / cells));
	const t0 = process.hrtime.bigint();
	let done = 0;
	for (; done < steps && sim.state.status === 'running'; done++) sim.step();
	const ns = Number(process.hrtime.bigint() - t0);
	return { cells, steps: done, simulatedTimeS: sim.state.timeS, status: sim.state.status, nsPerCellStep: ns / (done * cells) };
}

function referenceToSteady() {
	const sim = createHeightSimulation(referenceCase());
	const t0 = process.hrtime.bigint();
	while (sim.state.status === 'running') sim.step();
	const wallTimeS = Number(process.hrtime.bigint() - t0) / 1e9;
	const d = sim.results().design;
	return {
		status: sim.state.status,
		steps: sim.state.step,
		simulatedTimeS: sim.state.timeS,
		wallTimeS,
		nsPerCellStep: (wallTimeS * 1e9) / (sim.state.step * 100),
		overallHoldup: d.overallHoldup.value,
		aeratedHeightM: d.aeratedHeightM.value,
		spargerPressurePa: d.spargerPressurePa.value
	};
}

/** The 0.3 m air–water sweep of the default classes against Akita & Yoshida (1973) and Hikita et al. (1980). */
function holdupCurve() {
	const rows = [];
	for (const ug of [0.01, 0.02, 0.03, 0.04, 0.06, 0.08, 0.1, 0.15, 0.2, 0.25, 0.3, 0.35]) {
		const c = defaultCase();
		c.geometry = { heightM: 6, diameterM: 0.3, clearLiquidLevelM: 3 };
		c.sparging.superficialGasVelocityMS = ug;
		c.numerics.endTimeS = 300;
		const sim = createHeightSimulation(c);
		while (sim.state.status === 'running') sim.step();
		const r = sim.results();
		const col = { diameterM: 0.3, superficialGasVelocityMS: ug, liquidDensityKgM3: 998.2, liquidViscosityPaS: 1.002e-3, surfaceTensionNM: 0.0727 };
		rows.push({
			ugMS: ug,
			holdup: r.design.overallHoldup.value,
			holdupSmall: r.design.holdupSmall?.value,
			holdupLarge: r.design.holdupLarge?.value,
			akitaYoshida: akitaYoshidaHoldup(col),
			hikita: hikitaHoldup({ ...col, gasDensityKgM3: sim.model.cfg.referenceGasDensityKgM3, gasViscosityPaS: 1.81e-5 }),
			status: r.status
		});
	}
	return rows;
}

async function main() {
	const cold = referenceToSteady();
	// one pass to let the JIT settle, then the measured pass
	[100, 400, 1600].map((n) => costPerCellStep(n));
	const perCellStep = [100, 400, 1600].map((n) => costPerCellStep(n));
	const warm = referenceToSteady();
	const one400 = costPerCellStep(400);
	const two400 = costPerCellStep(400, twoClassCase);
	const out: Record<string, unknown> = {
		solverVersion: SOLVER_VERSION,
		node: process.version,
		heightProfile: {
			nsPerCellStep: perCellStep,
			referenceCase: { cold, warm },
			twoClassCostRatioAt400Cells: { oneClassNsPerCellStep: one400.nsPerCellStep, twoClassNsPerCellStep: two400.nsPerCellStep, ratio: two400.nsPerCellStep / one400.nsPerCellStep },
			holdupCurve: holdupCurve()
		}
	};
	try {
		const cs = await import('./cross-section.js');
		out.crossSection = { reference: cs.benchCrossSection(), circulationCurve: cs.circulationCurve() };
	} catch (e) {
		out.crossSection = { unavailable: (e as Error).message };
	}
	try {
		const jobs = await import('./jobs.js');
		out.jobs = await jobs.benchJobs();
	} catch (e) {
		out.jobs = { unavailable: (e as Error).message };
	}
	try {
		const study = await import('./study.js');
		out.study = await study.benchStudy();
	} catch (e) {
		out.study = { unavailable: (e as Error).message };
	}
	try {
		const load = await import('./load.js');
		out.load = await load.benchLoad();
	} catch (e) {
		out.load = { unavailable: (e as Error).message };
	}
	console.log(JSON.stringify(out, null, 2));
}

await main();
