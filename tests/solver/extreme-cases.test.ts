/**
 * Extreme but valid cases at the case schema's own limits (`solver/case.ts`): the finest grid
 * (5000 cells: the schema refuses 10 000), the tallest column (50 m), the highest top pressure
 * (1e7 Pa = 100 bar), a viscous liquid (1 Pa·s, within the 1e-4–10 Pa·s range), and all of them at
 * once. Each must end by itself — converged, finished at its end time, or failed with a diagnosis
 * naming the variable, the place and the simulated time (the contract of `StepStatus` in
 * `solver/types.ts`) — within a bounded number of steps and wall time, with finite results, and
 * without the heap growing. The end times are capped through the case's own `numerics.endTimeS`
 * so the file stays well under a minute on two cores; what a case reaches is reported, not chosen.
 */
import v8 from 'node:v8';
import { runInNewContext } from 'node:vm';
import { describe, expect, it } from 'vitest';
import { createSimulation, defaultCase, validateCase, type CaseDocument } from '../../solver/index.js';
import type { Results } from '../../solver/types.js';

/** Molar gas constant, J/(mol·K) (CODATA 2018, exact since the 2019 SI). */
const R_J_MOL_K = 8.314462618;

/** A forced full garbage collection, so heap figures count what is kept, not garbage not yet collected. */
v8.setFlagsFromString('--expose-gc');
const gc = runInNewContext('gc') as () => void;

/** Safety net only: no case here comes near it (the finest grid needs a few hundred steps to its end time). */
const STEP_GUARD = 50_000;
/** Per case, on a two-core machine: the slowest case here takes a few seconds. */
const WALL_LIMIT_S = 20;
/**
 * Heap kept after a case, once collected. The solver holds a few dozen Float64Arrays of one value per
 * cell: about 2 MB at 5000 cells. A leak of one field per step (40 kB at 5000 cells, over the ~1000
 * steps of the finest grid) would keep ~40 MB, one profile snapshot per step (11 fields) ~440 MB;
 * 32 MB leaves room for the JIT's code and caches while catching either.
 */
const HEAP_KEPT_LIMIT_BYTES = 32 * 1024 * 1024;

const ALLOWED = ['converged', 'finished', 'failed'];

function base(name: string): CaseDocument {
	const c = defaultCase('height-profile');
	c.name = name;
	return c;
}

/** Each extreme on its own, as a change to a case; "all at once" applies them together. */
const finest = (c: CaseDocument) => {
	c.numerics.cells = 5000;
};
const tallest = (c: CaseDocument) => {
	c.geometry.heightM = 50;
	c.geometry.clearLiquidLevelM = 30;
};
const highestPressure = (c: CaseDocument) => {
	c.fluids.topPressurePa = 1e7;
};
const viscous = (c: CaseDocument) => {
	c.fluids.preset = null;
	c.fluids.liquid.name = 'viscous liquid';
	c.fluids.liquid.viscosityPaS = 1;
};

function extreme(name: string, changes: ((c: CaseDocument) => void)[], endTimeS: number, snapshotIntervalS?: number): CaseDocument {
	const c = base(name);
	for (const change of changes) change(c);
	c.numerics.endTimeS = endTimeS;
	if (snapshotIntervalS !== undefined) c.numerics.snapshotIntervalS = snapshotIntervalS;
	return c;
}

const extremes: { name: string; make: () => CaseDocument; mustEndNormally?: boolean }[] = [
	{
		name: 'the finest grid: 5000 cells in the 2 m column',
		// 0.4 mm cells: 0.05 s is a few hundred steps
		make: () => extreme('5000 cells', [finest], 0.05, 0.05),
		// the default two bubble classes: the large bubbles' interfacial pressure at the sharp front of the first
		// gas once ran away here (NaN gas velocity at t ≈ 0.025 s); capped at the drag it must run to its end time
		mustEndNormally: true
	},
	{ name: 'the tallest column: 50 m, 30 m of clear liquid', make: () => extreme('50 m column', [tallest], 300) },
	{ name: 'the highest top pressure: 100 bar', make: () => extreme('100 bar', [highestPressure], 60) },
	{ name: 'a viscous liquid: 1 Pa·s', make: () => extreme('1 Pa·s liquid', [viscous], 60) },
	{ name: 'all at once: 5000 cells, 50 m, 100 bar, 1 Pa·s', make: () => extreme('all extremes', [finest, tallest, highestPressure, viscous], 0.5, 0.5) }
];

/** Names of every non-finite number in the results: design numbers, profiles, positions. */
function nonFinite(r: Results): string[] {
	const bad: string[] = [];
	for (const [k, d] of Object.entries(r.design)) if (typeof d.value === 'number' && !Number.isFinite(d.value)) bad.push(`design.${k}`);
	for (const [k, a] of Object.entries(r.profiles.fields)) if (a.some((x) => !Number.isFinite(x))) bad.push(`profiles.${k}`);
	if (r.profiles.x.some((x) => !Number.isFinite(x))) bad.push('profiles.x');
	return bad;
}

describe('extreme but valid cases', () => {
	it('the schema refuses 10 000 cells, naming its limit of 5000', () => {
		const c = base('10 000 cells');
		c.numerics.cells = 10_000;
		const v = validateCase(c);
		expect(v.ok).toBe(false);
		if (!v.ok) expect(v.issues).toContainEqual({ path: 'numerics.cells', message: 'Cells must be at most 5000' });
	});

	for (const x of extremes) {
		it(`${x.name} ends by itself with finite results, a diagnosis if it fails, and no heap kept`, () => {
			const doc = x.make();
			const v = validateCase(doc);
			expect(v.ok, v.ok ? '' : JSON.stringify(v.issues)).toBe(true);

			gc();
			const heapBefore = process.memoryUsage().heapUsed;
			const t0 = performance.now();
			let sim: ReturnType<typeof createSimulation> | null = createSimulation(doc);
			let nonFiniteResiduals = 0;
			while (sim.state.status === 'running' && sim.state.step < STEP_GUARD) {
				sim.step();
				if (sim.state.status === 'running' && Object.values(sim.residuals()).some((r) => !Number.isFinite(r))) nonFiniteResiduals++;
			}
			const wallS = (performance.now() - t0) / 1000;
			const r = sim.results();
			const state = { ...sim.state };
			sim = null;
			gc();
			const heapKept = process.memoryUsage().heapUsed - heapBefore;

			const outcome = `${r.status} at step ${state.step}, t = ${r.timeS} s, ${wallS.toFixed(2)} s wall${r.message ? `: ${r.message}` : ''}`;
			expect(ALLOWED, outcome).toContain(r.status);
			if (x.mustEndNormally) expect(['converged', 'finished'], outcome).toContain(r.status);
			expect(state.step, outcome).toBeLessThan(STEP_GUARD);
			expect(wallS, outcome).toBeLessThan(WALL_LIMIT_S);
			expect(Number.isFinite(r.timeS) && r.timeS > 0 && r.timeS <= doc.numerics.endTimeS * (1 + 1e-9), outcome).toBe(true);
			expect(r.step, outcome).toBe(state.step);
			expect(nonFiniteResiduals, `non-finite residuals while running (${outcome})`).toBe(0);
			expect(r.profiles.x.length).toBe(doc.numerics.cells);
			expect(heapKept, `heap kept ${(heapKept / 2 ** 20).toFixed(1)} MiB (${outcome})`).toBeLessThan(HEAP_KEPT_LIMIT_BYTES);

			const bad = nonFinite(r);
			if (r.status === 'failed') {
				// the contract of StepStatus: the variable, the cell (or face) and the simulated time
				expect(r.message ?? '', outcome).toMatch(/\S/);
				expect(r.message, outcome).toMatch(/(cell|face) \d+/);
				expect(r.message, outcome).toMatch(/t = \d+(\.\d+)? s/);
				// a failed run holds the state it failed in: a non-finite value there is the one its diagnosis names
				if (bad.length) expect(r.message, `${bad.join(', ')} (${outcome})`).toMatch(/is not a number/);
			} else {
				expect(r.message, outcome).toBeUndefined();
				expect(bad, outcome).toEqual([]);
				const f = r.profiles.fields;
				// a volume fraction lies in [0, 1] (up to round-off: cells the gas has not reached yet hold
				// values of order −1e-13 in the all-at-once case); absolute pressure is positive
				const low = Math.min(...f.holdup);
				const high = Math.max(...f.holdup);
				expect(low >= -1e-9 && high <= 1 + 1e-9, `holdup ${low} … ${high} (${outcome})`).toBe(true);
				expect(f.pressure.every((p) => p > 0), outcome).toBe(true);
				// the gas follows the ideal-gas law ρ = p M / (R T) in every cell (the solver's equation of state)
				for (let i = 0; i < f.pressure.length; i += Math.max(1, Math.floor(f.pressure.length / 50))) {
					const ideal = (f.pressure[i] * doc.fluids.gas.molarMassKgMol) / (R_J_MOL_K * doc.fluids.temperatureK);
					expect(Math.abs(f.gasDensity[i] / ideal - 1), `cell ${i} (${outcome})`).toBeLessThan(1e-6);
				}
			}
			console.log(`${x.name}: ${outcome}; heap kept ${(heapKept / 2 ** 20).toFixed(1)} MiB`);
		});
	}
});
