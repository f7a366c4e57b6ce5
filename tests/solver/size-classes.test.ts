import { describe, expect, it } from 'vitest';
import { defaultCase, validateCase, type CaseDocument } from '../../solver/case.js';
import { runToEnd } from '../../solver/index.js';
import { closureCatalog } from '../../solver/closures/catalog.js';
import { planClasses, sizeClassGrid, SIZE_CLASS_CAP_EOTVOS } from '../../solver/height/classes.js';
import { configFromCase } from '../../solver/height/config.js';
import { createHeightSimulation, type HeightSimulation } from '../../solver/height/simulation.js';
import { churnColumnCase, churnCorrelationMean } from '../../solver/verification/problems.js';
import { eotvosNumber } from '../../solver/closures/drag.js';
import { derivedNumbers } from '../../solver/derived.js';

/** The air–water column of the two-class checks (6 m, 3 m of clear liquid) with the gas as size classes. */
function sizeColumn(diameterM: number, ugMS: number, edit: (c: CaseDocument) => void = () => {}): CaseDocument {
	return churnColumnCase(diameterM, ugMS, (c) => {
		c.bubbles.classes = 'size-classes';
		edit(c);
	});
}

function run(sim: HeightSimulation): HeightSimulation {
	while (sim.state.status === 'running') sim.step();
	return sim;
}

/** Sauter diameter of cell i from the class shares, d32 = 1/Σ (y_k/d_k). */
function cellSauter(sim: HeightSimulation, i: number): number {
	const m = sim.model;
	let inv = 0;
	for (let k = 0; k < m.nc; k++) inv += m.classShare[k][i] / m.classes[k].diameterM;
	return 1 / inv;
}

describe('the size-class option of the case', () => {
	it('keeps stored documents valid and defaults to ten classes from 1 to 60 mm', () => {
		// a version-2 document written before the option: the new fields take their defaults, nothing else changes
		const v = validateCase({ schemaVersion: 2, bubbles: { classes: 'small-large' } });
		expect(v.ok).toBe(true);
		if (!v.ok) return;
		expect(v.value.bubbles.sizeClassCount).toBe(10);
		expect(v.value.bubbles.sizeClassMinDiameterM).toBe(0.001);
		expect(v.value.bubbles.sizeClassMaxDiameterM).toBe(0.06);
		const s = validateCase({ schemaVersion: 2, bubbles: { classes: 'size-classes', sizeClassMinDiameterM: 0.004, sizeClassMaxDiameterM: 0.006 } });
		expect(s.ok).toBe(false);
		if (!s.ok) expect(s.issues[0].path).toBe('bubbles.sizeClassMaxDiameterM');
		expect(validateCase({ schemaVersion: 2, bubbles: { classes: 'size-classes', sizeClassCount: 5 } }).ok).toBe(false);
		expect(closureCatalog['bubbles.classes']['size-classes'].source).toContain('Kumar, D. Ramkrishna (1996)');
	});

	it('plans a geometric grid, feeds the sparger size by the fixed-pivot weights and gives caps the cap drag', () => {
		const c = sizeColumn(0.3, 0.05);
		const plan = planClasses(c);
		const grid = sizeClassGrid(c.bubbles);
		expect(plan.classes.length).toBe(10);
		// geometric: d_k = 1 mm · 60^(k/9)
		for (let k = 0; k < 10; k++) expect(plan.classes[k].diameterM).toBeCloseTo(0.001 * Math.pow(60, k / 9), 12);
		expect(grid.diametersM[9]).toBeCloseTo(0.06, 12);
		// Kumar & Ramkrishna (1996) lumping of one 5 mm bubble between the 3.92 mm and 6.19 mm pivots: the gas volume
		// shares are η_lo x_3/v and η_hi x_4/v with η_lo = (x_4 − v)/(x_4 − x_3)
		const v = (Math.PI / 6) * 0.005 ** 3;
		const x3 = grid.volumesM3[3];
		const x4 = grid.volumesM3[4];
		const lo = (x4 - v) / (x4 - x3);
		expect(plan.classes[3].inflowShare).toBeCloseTo((lo * x3) / v, 12);
		expect(plan.classes[4].inflowShare).toBeCloseTo(((1 - lo) * x4) / v, 12);
		expect(plan.classes.reduce((s, k) => s + k.inflowShare, 0)).toBeCloseTo(1, 14);
		// Clift, Grace & Weber (1978): spherical caps from Eo ≈ 40 (≈ 17 mm in air–water); below, the case's law
		for (const k of plan.classes) {
			const eo = eotvosNumber({ diameterM: k.diameterM, liquidDensityKgM3: 998.2, gasDensityKgM3: 1.57, surfaceTensionNM: 0.0727 });
			expect(k.drag).toBe(eo >= SIZE_CLASS_CAP_EOTVOS ? 'spherical-cap' : c.closures.drag);
		}
		expect(plan.classes.filter((k) => k.drag === 'spherical-cap').map((k) => k.id)).toEqual(['size8', 'size9', 'size10']);
	});
});

describe('derived numbers of a size-class case', () => {
	it('give the grid ratio, the first cap class and ε = g U_G, and warn when the sparger size lies outside the classes', () => {
		const c = sizeColumn(0.3, 0.05);
		const d = derivedNumbers(c);
		expect(d.classes).toBeNull();
		expect(d.sizeClasses!.diameterRatio).toBeCloseTo(Math.pow(60, 1 / 9), 12);
		// Eo = 40 at 17.2 mm in air–water: the first cap class is the 8th, 1 mm · 60^(7/9) = 24.2 mm
		expect(d.sizeClasses!.capFromDiameterM).toBeCloseTo(0.001 * Math.pow(60, 7 / 9), 12);
		// common practice: ε = g U_G, here at the sparger gas velocity
		expect(d.sizeClasses!.dissipationRateM2S3).toBeCloseTo(9.81 * d.spargerSuperficialGasVelocityMS, 12);
		expect(d.warnings.some((w) => w.includes('outside the size classes'))).toBe(false);
		c.bubbles.diameterM = 0.0005;
		expect(derivedNumbers(c).warnings.some((w) => w.includes('enters the smallest class'))).toBe(true);
	});

	it('warn above 0.03 m/s that the holdup comes out above the correlations, and not at 0.02 m/s', () => {
		// the measured ratios of the holdup suite below: 0.97 at 0.02 m/s, 1.36 at 0.05 and 1.97 at 0.1 m/s
		const over = (d: ReturnType<typeof derivedNumbers>) => d.warnings.some((w) => w.includes('1.4–2 times the published correlations'));
		expect(over(derivedNumbers(sizeColumn(0.3, 0.05)))).toBe(true);
		expect(over(derivedNumbers(sizeColumn(0.3, 0.02)))).toBe(false);
		const two = sizeColumn(0.3, 0.05);
		two.bubbles.classes = 'small-large';
		expect(over(derivedNumbers(two))).toBe(false);
	});
});

describe('gas conservation with coalescence and breakup on', () => {
	it('moves gas between the classes of a cell without changing the cell’s gas, to round-off', () => {
		// the source step touches the class shares only: Σ_k α ρ_g y_k = α ρ_g in every cell (Kumar & Ramkrishna 1996:
		// the fixed-pivot rates keep Σ x_k N_k)
		const sim = createHeightSimulation(sizeColumn(0.3, 0.1));
		for (let s = 0; s < 300; s++) sim.step();
		const m = sim.model;
		const lf = Float64Array.from(m.liquidFraction);
		const rg = Float64Array.from(m.gasDensity);
		const before = m.classShare.map((y) => Float64Array.from(y));
		// one long step (2 s) of coalescence and breakup alone, a closed batch in every cell
		sim.sizeClasses!.apply(2);
		let moved = 0;
		let worst = 0;
		for (let i = 0; i < m.n; i++) {
			expect(m.liquidFraction[i]).toBe(lf[i]);
			expect(m.gasDensity[i]).toBe(rg[i]);
			const gas = (1 - lf[i]) * rg[i];
			let sum = 0;
			for (let k = 0; k < m.nc; k++) {
				sum += gas * m.classShare[k][i];
				moved = Math.max(moved, Math.abs(m.classShare[k][i] - before[k][i]));
			}
			if (gas > 0) worst = Math.max(worst, Math.abs(sum - gas) / gas);
		}
		expect(moved).toBeGreaterThan(0.01);
		// measured: 5.1e-16 (a sum of ten shares)
		expect(worst).toBeLessThan(2e-15);
	});

	it('keeps the column’s gas inventory to the error of the pressure linearisation, as the two-class model', () => {
		// ∫(in − out) dt = Δ(Σ α ρ_g Δz) up to the linearised gas density of the pressure step (model.ts header)
		const inventoryError = (c: CaseDocument) => {
			const sim = createHeightSimulation(c);
			const m = sim.model;
			const inv = () => {
				let s = 0;
				for (let i = 0; i < m.n; i++) s += (1 - m.liquidFraction[i]) * m.gasDensity[i];
				return s * m.dz;
			};
			const inv0 = inv();
			let net = 0;
			let fed = 0;
			for (let s = 0; s < 600; s++) {
				sim.step();
				net += (m.diag.gasInKgM2S - m.diag.gasOutKgM2S) * m.dtS;
				fed += m.diag.gasInKgM2S * m.dtS;
			}
			return Math.abs(inv() - inv0 - net) / fed;
		};
		const sized = inventoryError(sizeColumn(0.3, 0.1));
		const two = inventoryError(churnColumnCase(0.3, 0.1));
		// measured: 4.6e-5 with size classes, 7.1e-5 with two classes, of the gas fed over 600 steps
		expect(sized).toBeLessThan(1e-4);
		expect(sized).toBeLessThan(2 * two);
	});

	it('carries the solute with the gas moved between classes (no transfer: gas in − out = Δ inventory)', () => {
		const c = sizeColumn(0.2, 0.08, (x) => {
			x.geometry = { heightM: 3, diameterM: 0.2, clearLiquidLevelM: 2 };
			x.numerics.cells = 60;
			x.numerics.endTimeS = 10;
			x.transfer.mode = 'batch';
		});
		const cfg = configFromCase(c);
		const sim = createHeightSimulation(c, { transfer: { ...cfg.transfer!, interfaceFactor: 0 } });
		const tr = sim.transfer!;
		// different mole fractions in every class, so moving gas between classes moves solute
		for (let k = 0; k < tr.nc; k++) for (let i = 0; i < tr.n; i++) tr.moleFraction[k][i] = 0.05 + 0.02 * k + 0.1 * Math.sin(i / 7) ** 2;
		tr.captureOld();
		const gas0 = tr.gasInventoryKgM2();
		run(sim);
		const t = tr.totals;
		expect(sim.model.nc).toBe(10);
		// the balance of the two-class check in transfer.test.ts; measured here 1.7e-15 relative after 286 steps
		expect(Math.abs(t.gasInKgM2 - t.gasOutKgM2 - (tr.gasInventoryKgM2() - gas0)) / t.gasInKgM2).toBeLessThan(1e-12);
	});
});

describe('the size distribution along the column (air–water, 0.3 m, U_G = 0.1 m/s)', () => {
	const kernels = (coalescence: boolean, breakup: boolean, endTimeS: number) => {
		const c = sizeColumn(0.3, 0.1, (x) => (x.numerics.endTimeS = endTimeS));
		const base = configFromCase(c).sizeClasses!;
		return run(createHeightSimulation(c, { sizeClasses: { ...base, coalescence, breakup } }));
	};
	/** the cell below the one holding the level */
	const topCell = (sim: HeightSimulation) => Math.floor(sim.level() / sim.model.dz) - 1;

	it('grows by coalescence alone and shrinks by breakup alone (Prince & Blanch 1990; Luo & Svendsen 1996)', () => {
		// coalescence merges bubbles at constant gas volume: d32 can only grow along the rise; binary breakup can only lower it
		const grow = kernels(true, false, 40);
		const d0 = cellSauter(grow, 0);
		const dTop = cellSauter(grow, topCell(grow));
		// measured: 5.8 mm at the sparger → 18.9 mm below the level
		expect(dTop / d0).toBeGreaterThan(2.5);
		const shrink = kernels(false, true, 15);
		// measured at 15 s: 3.8 mm → 1.05 mm (the smallest class is 1 mm)
		expect(cellSauter(shrink, topCell(shrink)) / cellSauter(shrink, 0)).toBeLessThan(0.5);
	});

	it('with both on, coalescence wins slightly: d32 rises from the sparger to the level', () => {
		const sim = run(createHeightSimulation(sizeColumn(0.3, 0.1)));
		const r = sim.results();
		expect(r.status).toBe('converged');
		const d = r.design;
		// measured: 5.09 mm → 5.65 mm (the sparger's 5 mm bubbles, fed as 3.9 and 6.2 mm classes, d32 5.3 mm,
		// first break up to the equilibrium of the kernels at ε = g U_G ≈ 1 W/kg)
		expect(d.sauterDiameterTopM.value).toBeGreaterThan(1.05 * d.sauterDiameterBottomM.value);
		expect(d.sauterDiameterBottomM.value).toBeGreaterThan(0.0045);
		expect(d.sauterDiameterTopM.value).toBeLessThan(0.0065);
		// the snapshot carries the profile d32(z) and the holdup of every class
		const f = r.profiles.fields;
		expect(f.sauterDiameter[0]).toBeCloseTo(d.sauterDiameterBottomM.value, 12);
		expect(Object.keys(f).filter((k) => /^holdupSize\d+$/.test(k)).length).toBe(10);
		let sum = 0;
		for (let k = 1; k <= 10; k++) sum += f[`holdupSize${k}`][20];
		expect(sum).toBeCloseTo(f.holdup[20], 12);
	});
});

describe('overall holdup of the air–water 0.3 m column against Akita & Yoshida (1973) and Hikita et al. (1980)', () => {
	// The class method keeps d32 near 5–6 mm at every gas rate (the Prince–Blanch and Luo–Svendsen equilibrium at
	// ε = g U_G): no large bubbles form, so the column stays homogeneous. In the homogeneous regime (0.02 m/s) it agrees
	// with the correlations; above the transition (≈ 0.04 m/s, Reilly et al. 1994) it overpredicts, more with U_G.
	// Bands: ±15 % at 0.02 m/s (the two correlations differ by 15 % there); above, the measured ratios ±10 % so a change
	// of the kernels or the drag shows.
	const cases: [number, number, number][] = [
		// U_G, lowest and highest ratio to the correlation mean (measured: 0.966, 1.362, 1.966)
		[0.02, 0.85, 1.15],
		[0.05, 1.22, 1.5],
		[0.1, 1.77, 2.16]
	];
	for (const [ug, lo, hi] of cases) {
		it(`gives ${lo}–${hi} times the correlation mean at ${ug} m/s`, () => {
			const sim = run(createHeightSimulation(sizeColumn(0.3, ug)));
			const r = sim.results();
			expect(r.status).toBe('converged');
			const mean = churnCorrelationMean(0.3, ug, sim.model.cfg.referenceGasDensityKgM3).mean;
			const ratio = r.design.overallHoldup.value / mean;
			expect(ratio).toBeGreaterThan(lo);
			expect(ratio).toBeLessThan(hi);
		});
	}
});

describe('checkpoint of a size-class run', () => {
	it('continues bit-identically (the source step keeps no state besides the class shares)', () => {
		const c = sizeColumn(0.3, 0.05);
		const first = createHeightSimulation(c);
		for (let s = 0; s < 150; s++) first.step();
		const cp = first.checkpoint();
		for (let s = 0; s < 150; s++) first.step();
		const resumed = createHeightSimulation(c);
		resumed.restore(cp);
		for (let s = 0; s < 150; s++) resumed.step();
		expect(Array.from(resumed.model.liquidFraction)).toEqual(Array.from(first.model.liquidFraction));
		for (let k = 0; k < 10; k++) expect(Array.from(resumed.model.classShare[k])).toEqual(Array.from(first.model.classShare[k]));
	});
});

describe('the other bubble-class models do not go through the class method', () => {
	it('gives one and two classes no size-class source', () => {
		const one = createHeightSimulation(defaultCase());
		expect(one.sizeClasses).toBeNull();
		const c = defaultCase();
		c.bubbles.classes = 'single';
		expect(createHeightSimulation(c).sizeClasses).toBeNull();
		expect(configFromCase(c).sizeClasses).toBeUndefined();
		expect(runToEnd(c, { maxSteps: 5 }).design.sauterDiameterBottomM).toBeUndefined();
	});
});
