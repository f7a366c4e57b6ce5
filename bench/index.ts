/**
 * Solver benchmark: prints JSON with the cost per cell-step of the height-profile model at 100, 400 and
 * 1600 cells, and the wall time and steps to steady state of the reference case (air–water, 2 m column,
 * 0.2 m diameter, 1.5 m clear level, 4 mm bubbles, U_g = 0.05 m/s, Schiller–Naumann, 100 cells).
 * The cross-section figures are added when `bench/cross-section.ts` is present.
 * Figures, not assertions: `npm run bench` or `npx tsx bench/index.ts`.
 */
import { defaultCase } from '../solver/case.js';
import { createHeightSimulation } from '../solver/height/simulation.js';
import { SOLVER_VERSION } from '../solver/index.js';

function referenceCase() {
	const c = defaultCase();
	c.name = 'Height-profile reference: air–water, 2 m, 0.2 m, 1.5 m clear level, 4 mm, U_g 0.05 m/s, Schiller–Naumann, 100 cells';
	c.geometry = { heightM: 2, diameterM: 0.2, clearLiquidLevelM: 1.5 };
	c.bubbles = { sizing: 'fixed', diameterM: 0.004 };
	c.sparging.superficialGasVelocityMS = 0.05;
	c.closures.drag = 'schiller-naumann';
	c.numerics.cells = 100;
	c.numerics.endTimeS = 300;
	return c;
}

/** Nanoseconds per cell-step over a stretch of the transient after a warm-up (no steady stop, no snapshots). */
function costPerCellStep(cells: number) {
	const c = referenceCase();
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

async function main() {
	const cold = referenceToSteady();
	// one pass to let the JIT settle, then the measured pass
	[100, 400, 1600].map(costPerCellStep);
	const perCellStep = [100, 400, 1600].map(costPerCellStep);
	const warm = referenceToSteady();
	const out: Record<string, unknown> = {
		solverVersion: SOLVER_VERSION,
		node: process.version,
		heightProfile: {
			nsPerCellStep: perCellStep,
			referenceCase: { cold, warm }
		}
	};
	try {
		const cs = await import('./cross-section.js');
		out.crossSection = cs.benchCrossSection();
	} catch (e) {
		out.crossSection = { unavailable: (e as Error).message };
	}
	try {
		const jobs = await import('./jobs.js');
		out.jobs = await jobs.benchJobs();
	} catch (e) {
		out.jobs = { unavailable: (e as Error).message };
	}
	console.log(JSON.stringify(out, null, 2));
}

await main();
