/**
 * The cross-section model with the gas as small and large bubbles (PHYSICS §8.8): the division of the gas, the
 * lift's sign change separating the classes, the circulation against Riquarts (1981) and the section holdup against
 * Akita & Yoshida (1973) and Hikita et al. (1980), per-class conservation and restart.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { Packr } from 'msgpackr';
import { defaultCase, upgradeCaseDocument, validateCase, type CaseDocument } from '../../solver/case.js';
import type { Results, Simulation } from '../../solver/types.js';
import { createCrossSectionSimulation, crossSectionParameters, FLUX_RELAXATION_HEIGHT_DIAMETERS } from '../../solver/cross-section/index.js';
import { tomiyamaLiftCoefficient } from '../../solver/closures/lift.js';
import { akitaYoshidaHoldup } from '../../solver/correlations/holdup.js';
import { hikitaHoldup } from '../../solver/correlations/churn.js';
import { riquartsCentrelineVelocityMS } from '../../solver/correlations/circulation.js';
import { derivedNumbers } from '../../solver/derived.js';

const rhoL = 998.2;
const muL = 1.002e-3;
const sigma = 0.0727;

/** The default cross-section case (air–water at 20 °C, small + large bubbles, 5 mm small bubbles, 60 cells). */
function classCase(diameterM: number, ugMS: number): CaseDocument {
	const c = defaultCase('cross-section');
	c.geometry.diameterM = diameterM;
	c.sparging.superficialGasVelocityMS = ugMS;
	c.numerics.endTimeS = 600;
	return c;
}

function runToSteady(c: CaseDocument, maxSteps = 40000): { sim: Simulation; results: Results } {
	const sim = createCrossSectionSimulation(c);
	for (let k = 0; k < maxSteps && sim.state.status === 'running'; k++) sim.step();
	return { sim, results: sim.results() };
}

/** Riquarts (1981), formula from memory (PHYSICS §8.7), for air–water at 20 °C. */
function riquarts(diameterM: number, ugMS: number): number {
	return riquartsCentrelineVelocityMS({ diameterM, superficialGasVelocityMS: ugMS, liquidKinematicViscosityM2S: muL / rhoL });
}

/** The mean of Akita & Yoshida (1973) and Hikita et al. (1980) for air–water at the section's gas density. */
function correlationHoldup(c: CaseDocument): number {
	const col = { diameterM: c.geometry.diameterM, superficialGasVelocityMS: c.sparging.superficialGasVelocityMS, liquidDensityKgM3: rhoL, liquidViscosityPaS: muL, surfaceTensionNM: sigma };
	return (akitaYoshidaHoldup(col) + hikitaHoldup({ ...col, gasDensityKgM3: crossSectionParameters(c).gasDensityKgM3, gasViscosityPaS: 1.81e-5 })) / 2;
}

const points = [
	{ diameterM: 0.3, ugMS: 0.02 },
	{ diameterM: 0.3, ugMS: 0.05 },
	{ diameterM: 0.3, ugMS: 0.1 },
	{ diameterM: 0.3, ugMS: 0.2 },
	{ diameterM: 0.3, ugMS: 0.3 },
	{ diameterM: 1, ugMS: 0.05 },
	{ diameterM: 1, ugMS: 0.1 },
	{ diameterM: 1, ugMS: 0.2 },
	{ diameterM: 1, ugMS: 0.3 }
];
const runs = new Map<string, { c: CaseDocument; sim: Simulation; results: Results }>();
const key = (d: number, u: number) => `${d}/${u}`;
const at = (d: number, u: number) => runs.get(key(d, u))!;

beforeAll(() => {
	for (const p of points) {
		const c = classCase(p.diameterM, p.ugMS);
		runs.set(key(p.diameterM, p.ugMS), { c, ...runToSteady(c) });
	}
});

describe('cross-section model with small and large bubbles', () => {
	it('reaches a steady state at every point, 0.02–0.3 m/s in 0.3 m and 1 m columns', () => {
		for (const p of points) expect(at(p.diameterM, p.ugMS).sim.state.status, key(p.diameterM, p.ugMS)).toBe('converged');
	});

	it('divides the gas as at the sparger of a height profile, and each class carries its share of U_g', () => {
		const { c, results } = at(0.3, 0.2);
		const p = crossSectionParameters(c);
		expect(p.classes.map((k) => k.id)).toEqual(['small', 'large']);
		// Krishna's picture: the small bubbles carry U_trans, the rest rises as large bubbles
		expect(p.classes[0].superficialGasVelocityMS + p.classes[1].superficialGasVelocityMS).toBeCloseTo(0.2, 12);
		expect(p.classes[1].superficialGasVelocityMS).toBeGreaterThan(0.1);
		// the section fluxes ⟨α_k u_g,k⟩ (area averages over the cell volumes r Δr) meet the shares to the steady tolerance
		const f = results.profiles.fields;
		const x = results.profiles.x;
		const dr = 2 * x[0];
		const v = Array.from(x, (r) => r * dr);
		const vs = v.reduce((s, a) => s + a, 0);
		const flux = (a: Float64Array, u: Float64Array) => a.reduce((s, ai, i) => s + ai * u[i] * v[i], 0) / vs;
		expect(Math.abs(flux(f.holdupSmall, f.gasVelocitySmall) / p.classes[0].superficialGasVelocityMS - 1)).toBeLessThan(1e-4);
		expect(Math.abs(flux(f.holdupLarge, f.gasVelocityLarge) / p.classes[1].superficialGasVelocityMS - 1)).toBeLessThan(1e-4);
		// and the holdup is the sum of the classes
		for (let i = 0; i < x.length; i++) expect(f.holdup[i]).toBeCloseTo(f.holdupSmall[i] + f.holdupLarge[i], 14);
	});

	it('below the transition has only small bubbles, wall-peaked by their positive lift (homogeneous flow)', () => {
		const d = at(0.3, 0.02).results.design;
		expect(d.sectionHoldupLarge.value).toBe(0);
		expect(d.peakLocation.label).toBe('Holdup peak: wall-peaked');
	});

	it('separates the classes by the sign of Tomiyama’s lift: small bubbles at the wall, large bubbles in the core', () => {
		// Tomiyama et al. (2002): C_L > 0 for air–water bubbles below about 5.8 mm, −0.27 for Eo_d > 10.7
		const p = crossSectionParameters(at(0.3, 0.1).c);
		const lift = (d: number) => tomiyamaLiftCoefficient({ diameterM: d, reynolds: 1000, liquidDensityKgM3: rhoL, gasDensityKgM3: p.gasDensityKgM3, surfaceTensionNM: sigma });
		expect(lift(p.classes[0].diameterM)).toBeGreaterThan(0);
		expect(lift(p.classes[1].diameterM)).toBe(-0.27);
		for (const pt of points.filter((q) => q.ugMS >= 0.05)) {
			const d = at(pt.diameterM, pt.ugMS).results.design;
			expect(d.peakLocationSmall.label, key(pt.diameterM, pt.ugMS)).toMatch(/wall-peaked/);
			expect(d.peakLocationLarge.label, key(pt.diameterM, pt.ugMS)).toMatch(/core-peaked/);
		}
	});

	it('gives a core-peaked holdup in churn-turbulent flow, with the liquid reversing at r/R 0.6–0.75', () => {
		// measured reversal near r/R ≈ 0.7 (Ueyama & Miyauchi 1979, PHYSICS §7, from memory)
		for (const pt of points.filter((q) => q.ugMS >= 0.1)) {
			const d = at(pt.diameterM, pt.ugMS).results.design;
			expect(d.peakLocation.label, key(pt.diameterM, pt.ugMS)).toBe('Holdup peak: core-peaked');
			expect(d.reversalRadiusRatio.value).toBeGreaterThan(0.6);
			expect(d.reversalRadiusRatio.value).toBeLessThan(0.75);
		}
		// The centreline holdup over the section average: measured profiles α ∝ 1 − (r/R)^m with m ≈ 2 give 2 (Ueyama &
		// Miyauchi 1979, from memory). The model over-peaks the core: 2.8 at 0.3 m/s in the 0.3 m column, because the
		// large bubbles gather on the axis (measured 2.2–2.9 over 0.1–0.3 m/s). The bound keeps that gap from growing.
		const { results } = at(0.3, 0.3);
		const peakRatio = results.profiles.fields.holdup[0] / results.design.sectionHoldup.value;
		expect(peakRatio).toBeGreaterThan(1.5);
		expect(peakRatio).toBeLessThan(3.2);
	});

	it('gives a centreline liquid velocity within ±30 % of Riquarts (1981) in the 0.3 m column at 0.05–0.3 m/s and in the 1 m column at 0.1 m/s', () => {
		// Tolerance: measured centreline velocities scatter about ±30 % round such correlations (common practice), and
		// the formula is from memory. Measured ratios: 0.3 m 0.76, 1.14, 1.11, 1.01; 1 m at 0.1 m/s 1.08.
		const inBand = [...points.filter((q) => q.diameterM === 0.3 && q.ugMS >= 0.05), { diameterM: 1, ugMS: 0.1 }];
		for (const pt of inBand) {
			const ratio = at(pt.diameterM, pt.ugMS).results.design.centrelineLiquidVelocityMS.value / riquarts(pt.diameterM, pt.ugMS);
			expect(Math.abs(ratio - 1), `${key(pt.diameterM, pt.ugMS)}: ${ratio.toFixed(2)}`).toBeLessThan(0.3);
		}
	});

	it('in the 1 m column keeps within the gap it is known to have: too slow at 0.05 m/s, too fast at 0.2–0.3 m/s', () => {
		// Measured ratios to Riquarts (1981): 0.53 at 0.05 m/s (near the transition the wall-peaked small bubbles hold
		// most of the gas), 1.36 and 1.48 at 0.2 and 0.3 m/s (the large bubbles gather on the axis, where the mixing
		// length gives little eddy viscosity). README "Cross-section bubble classes" states the gap; these bounds keep it
		// from growing unseen.
		const ratio = (u: number) => at(1, u).results.design.centrelineLiquidVelocityMS.value / riquarts(1, u);
		expect(ratio(0.05)).toBeGreaterThan(0.45);
		expect(ratio(0.05)).toBeLessThan(0.7);
		for (const u of [0.2, 0.3]) {
			expect(ratio(u)).toBeGreaterThan(1.2);
			expect(ratio(u)).toBeLessThan(1.6);
		}
	});

	it('gives a section holdup within ±30 % of the mean of Akita & Yoshida (1973) and Hikita et al. (1980) in the 0.3 m column, and rising with U_g', () => {
		// measured model ÷ correlations: 0.91 (0.02), 1.04, 0.94, 0.87, 0.85 (0.3 m/s); in the 1 m column 1.05, 0.93,
		// 0.76 and 0.66 at 0.3 m/s, where the fast core liquid carries the core-gathered large bubbles out quickly
		let last = 0;
		for (const pt of points.filter((q) => q.diameterM === 0.3)) {
			const { c, results } = at(pt.diameterM, pt.ugMS);
			const a = results.design.sectionHoldup.value;
			expect(Math.abs(a / correlationHoldup(c) - 1), key(pt.diameterM, pt.ugMS)).toBeLessThan(0.3);
			expect(a).toBeGreaterThan(last);
			last = a;
		}
		const big = at(1, 0.3);
		expect(big.results.design.sectionHoldup.value / correlationHoldup(big.c)).toBeGreaterThan(0.55);
	});

	it('warns in the editor outside the column sizes it is checked in, and fails a runaway on the axis with a diagnosis', () => {
		const warned = (d: number, u: number) => derivedNumbers(classCase(d, u)).warnings.some((w) => w.includes('checked against the centreline velocity of Riquarts'));
		expect(warned(0.3, 0.2)).toBe(false);
		expect(warned(1, 0.2)).toBe(true);
		expect(warned(0.15, 0.3)).toBe(true);
		// below the transition there is only one class and nothing to warn of
		expect(warned(1, 0.02)).toBe(false);
		// one bubble size above the transition (Reilly et al. 1994: about 0.03 m/s for air–water) is warned of, in both
		// models; the issue's own table: 4 mm bubbles 1.7–2.6 times Akita–Yoshida at 0.02–0.06 m/s, failing from 0.08
		const single = (kind: 'cross-section' | 'height-profile', u: number) => {
			const c = kind === 'cross-section' ? classCase(0.3, u) : defaultCase('height-profile');
			c.sparging.superficialGasVelocityMS = u;
			c.bubbles.classes = 'single';
			return derivedNumbers(c).warnings.some((w) => w.startsWith('One bubble size above the regime transition'));
		};
		expect(single('cross-section', 0.2)).toBe(true);
		expect(single('height-profile', 0.1)).toBe(true);
		expect(single('height-profile', 0.02)).toBe(false);
		expect(derivedNumbers(classCase(0.3, 0.2)).warnings.some((w) => w.startsWith('One bubble size'))).toBe(false);
		// 1 m at 0.4 m/s: the large bubbles gather on the axis until the holdup limit; the run fails within seconds
		// of simulated time and says which class holds the gas (measured: large 0.70, small 0.10 at t ≈ 4.5 s)
		const { sim } = runToSteady(classCase(1, 0.4));
		expect(sim.state.status).toBe('failed');
		expect(sim.state.message).toMatch(/^Gas holdup 0\.8\d* in cell 1 of 60 .*small bubbles 0\.\d+, large bubbles 0\.\d+: the large bubbles gather on the axis/);
		expect(sim.state.timeS).toBeLessThan(10);
	});

	it('conserves each class’s gas in the section to round-off: it changes only by the class’s own flux-constraint source', () => {
		const c = classCase(0.3, 0.2);
		const sim = createCrossSectionSimulation(c);
		const H = FLUX_RELAXATION_HEIGHT_DIAMETERS * c.geometry.diameterM;
		const shares = crossSectionParameters(c).classes.map((k) => k.superficialGasVelocityMS);
		let before = sim.snapshot();
		const dr = 2 * before.x[0];
		const v = Array.from(before.x, (r) => r * dr);
		const vs = v.reduce((s, x) => s + x, 0);
		let worst = 0;
		for (let step = 0; step < 300; step++) {
			sim.step();
			const after = sim.snapshot();
			['Small', 'Large'].forEach((id, k) => {
				const a0 = before.fields[`holdup${id}`];
				const u0 = before.fields[`gasVelocity${id}`];
				const q0 = a0.reduce((s, a, i) => s + a * v[i], 0);
				const jg0 = a0.reduce((s, a, i) => s + a * u0[i] * v[i], 0) / vs;
				const q1 = after.fields[`holdup${id}`].reduce((s, a, i) => s + a * v[i], 0);
				const ubar = jg0 / (q0 / vs);
				const expected = (sim.state.dtS * (shares[k] - (ubar * q1) / vs) * vs) / H;
				worst = Math.max(worst, Math.abs(q1 - q0 - expected) / q0);
			});
			before = after;
		}
		expect(worst).toBeLessThan(1e-12);
	});

	it('continues bit-identically from a checkpoint after a msgpackr round trip', () => {
		const c = classCase(0.3, 0.1);
		const a = createCrossSectionSimulation(c);
		for (let k = 0; k < 200; k++) a.step();
		const packr = new Packr({ useRecords: false });
		const cp = packr.unpack(packr.pack(a.checkpoint()));
		const b = createCrossSectionSimulation(c);
		b.restore(cp);
		for (let k = 0; k < 200; k++) {
			a.step();
			b.step();
		}
		const fa = a.snapshot().fields;
		const fb = b.snapshot().fields;
		for (const f of ['holdupSmall', 'holdupLarge', 'gasVelocitySmall', 'gasVelocityLarge', 'liquidVelocity']) expect(Array.from(fb[f])).toEqual(Array.from(fa[f]));
	});

	it('refuses a checkpoint of solver 1.2.0 for two classes, whose cross-sections were computed with one bubble size', () => {
		const c = classCase(0.3, 0.1);
		const a = createCrossSectionSimulation(c);
		a.step();
		const cp = { ...a.checkpoint(), solverVersion: '1.2.0' };
		expect(() => createCrossSectionSimulation(c).restore(cp)).toThrow(/solver 1\.2\.0 cannot continue/);
	});
});

describe('schema version 3: stored cross-sections keep their one bubble size', () => {
	it('upgrades a version-2 cross-section to one class and leaves a version-2 height profile’s classes alone', () => {
		const cross = { ...defaultCase('cross-section'), schemaVersion: 2 };
		const height = { ...defaultCase('height-profile'), schemaVersion: 2 };
		const up = upgradeCaseDocument(cross) as CaseDocument;
		expect(up.schemaVersion).toBe(3);
		expect(up.bubbles.classes).toBe('single');
		expect(cross.bubbles.classes).toBe('small-large');
		const h = validateCase(height);
		expect(h.ok && h.value.bubbles.classes).toBe('small-large');
		expect(h.ok && h.value.schemaVersion).toBe(3);
		// a version-1 document goes through both steps
		const v1 = validateCase({ schemaVersion: 1, kind: 'cross-section' });
		expect(v1.ok && v1.value.bubbles.classes).toBe('single');
		expect(v1.ok && v1.value.bubbles.diameterM).toBe(0.004);
	});
});
