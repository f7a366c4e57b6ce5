import { describe, expect, it } from 'vitest';
import { Packr } from 'msgpackr';
import { defaultCase, type CaseDocument } from '../../solver/case.js';
import type { Results, Simulation } from '../../solver/types.js';
import { SOLVER_VERSION } from '../../solver/version.js';
import {
	FLUX_RELAXATION_HEIGHT_DIAMETERS,
	createCrossSectionSimulation,
	crossSectionParameters,
	createRadialGrid,
	solveAxialMomentum,
	transportHoldup
} from '../../solver/cross-section/index.js';
import { blasiusFrictionFactor, colebrookFrictionFactor, pipeCase, recirculationProfile } from '../../solver/verification/problems.js';
import { riquartsCentrelineVelocityMS } from '../../solver/correlations/circulation.js';

type Overrides = { [K in keyof CaseDocument]?: Partial<CaseDocument[K]> };

/**
 * A one-class cross-section case: the defaults (air–water at 20 °C, 0.2 m, U_g 0.05 m/s, 60 cells) with the gas as
 * one bubble size, with overrides. The bubble classes have their own suite (`cross-section-classes.test.ts`).
 */
function crossCase(o: Overrides = {}): CaseDocument {
	const c = defaultCase('cross-section');
	c.bubbles.classes = 'single';
	for (const [section, values] of Object.entries(o)) Object.assign((c as unknown as Record<string, object>)[section], values);
	return c;
}

function runToSteady(c: CaseDocument, maxSteps = 20000): { sim: Simulation; results: Results } {
	const sim = createCrossSectionSimulation(c);
	for (let k = 0; k < maxSteps; k++) if (sim.step().status !== 'running') break;
	return { sim, results: sim.results() };
}

function argmax(a: Float64Array): number {
	let m = 0;
	for (let i = 1; i < a.length; i++) if (a[i] > a[m]) m = i;
	return m;
}

/** Cell volumes per radian, r Δr, from the cell centres of a snapshot (uniform grid). */
function volumesOf(x: Float64Array): Float64Array {
	const dr = 2 * x[0];
	return x.map((r) => r * dr);
}

const rhoL = 998.2;
const g = 9.81;
const nuL = 1.002e-3 / rhoL;

describe('cross-section model, single-phase limit (no gas)', () => {
	// smooth-pipe references: Blasius (1913) f = 0.3164 Re^−0.25 (Re < 1e5) and Colebrook (1939) with zero roughness
	const blasius = blasiusFrictionFactor;
	const colebrook = colebrookFrictionFactor;

	it.each([
		// first-cell y⁺ ≈ 30 and ≈ 60: inside the log layer, where the wall function holds
		{ diameterM: 0.05, velocityMS: 0.4, cells: 10 },
		{ diameterM: 0.2, velocityMS: 0.5, cells: 20 }
	])('reproduces the Blasius and Colebrook friction factor and the velocity-defect law in a $diameterM m pipe at $velocityMS m/s', ({ diameterM, velocityMS, cells }) => {
		const c = pipeCase({ diameterM, velocityMS, cells });
		const { sim, results } = runToSteady(c);
		expect(sim.state.status).toBe('converged');
		const re = (velocityMS * diameterM) / nuL;
		// −dp/dz = ρ g + 4 τ_w/D and f = 8 τ_w/(ρ U²) (Darcy)
		const dpdz = results.design.axialPressureGradientPaM.value;
		const frictionGradient = -dpdz - rhoL * g;
		const f = (2 * diameterM * frictionGradient) / (rhoL * velocityMS * velocityMS);
		// Blasius and Colebrook differ by 2.7 % at Re = 2e4 themselves
		expect(Math.abs(f / blasius(re) - 1)).toBeLessThan(0.05);
		expect(Math.abs(f / colebrook(re) - 1)).toBeLessThan(0.03);
		// profile: centreline minus bulk velocity in friction velocities, (u_c − U)/u_τ ≈ 4.07 from Nikuradse's
		// measurements as given by Schlichting (from memory); 3/(2κ) = 3.66 from the bare log law [D]
		const uTau = Math.sqrt((frictionGradient * diameterM) / 4 / rhoL);
		const defect = (results.design.centrelineLiquidVelocityMS.value - velocityMS) / uTau;
		expect(defect).toBeGreaterThan(3.66);
		expect(Math.abs(defect / 4.07 - 1)).toBeLessThan(0.1);
		// no gas: no holdup, no peak, no reversal
		expect(results.design.sectionHoldup.value).toBe(0);
		expect(Number.isNaN(results.design.reversalRadiusRatio.value)).toBe(true);
		expect(results.design.peakLocation.label).toMatch(/no gas/);
	});
});

describe('radial liquid momentum against the analytic recirculation profile (PHYSICS §7, §15 #36)', () => {
	it('puts the flow reversal at r/R = 1/√3 and the centreline velocity at ᾱ g R²/(24 ν_t)', () => {
		// constant eddy viscosity, α = 2ᾱ(1 − ξ²), no slip, zero net liquid flow, mixture stress (weight 1) [D].
		// The model's constraint is ⟨α_l u_l⟩ = 0, the analytic one ⟨u⟩ = 0: they differ by O(ᾱ), so the
		// comparison is made in the dilute limit, where the velocity scale ᾱ g R²/(24 ν_t) is still exact.
		const R = 0.1;
		const n = 400;
		const grid = createRadialGrid({ radiusM: R, cells: n });
		const abar = 1e-4;
		const nuT = 2e-3;
		const holdup = grid.centresM.map((r) => 2 * abar * (1 - (r / R) ** 2));
		const ones = new Float64Array(n + 1).fill(1);
		const ul = new Float64Array(n);
		const ug = new Float64Array(n);
		solveAxialMomentum({
			grid,
			dtS: Infinity,
			liquidDensityKgM3: rhoL,
			gasDensityKgM3: 0,
			gravityMS2: g,
			holdup,
			stressWeight: ones,
			faceViscosityPaS: new Float64Array(n + 1).fill(rhoL * nuT),
			wallCoefficientPaSM: (rhoL * nuT) / (0.5 * grid.drM),
			virtualMassCoefficient: new Float64Array(n),
			dragSlope: new Float64Array(n).fill(1e4),
			dragOffset: new Float64Array(n),
			liquidVelocityOld: new Float64Array(n),
			gasVelocityOld: new Float64Array(n),
			superficialLiquidVelocityMS: 0,
			liquidVelocity: ul,
			gasVelocity: ug,
			work: new Float64Array(8 * n)
		});
		const exact = (abar * g * R * R) / (24 * nuT);
		const uc = (9 * ul[0] - ul[1]) / 8;
		expect(Math.abs(uc / exact - 1)).toBeLessThan(1e-3);
		let reversal = NaN;
		for (let i = 0; i < n - 1; i++) {
			if (ul[i] > 0 && ul[i + 1] <= 0) {
				reversal = (grid.centresM[i] + (grid.drM * ul[i]) / (ul[i] - ul[i + 1])) / R;
				break;
			}
		}
		expect(Math.abs(reversal - 1 / Math.sqrt(3))).toBeLessThan(1e-4);
		// the profile itself: u(ξ) = u(0)(1 − 4ξ² + 3ξ⁴)
		for (const i of [50, 200, 300]) {
			const xi = grid.centresM[i] / R;
			expect(Math.abs(ul[i] - exact * (1 - 4 * xi * xi + 3 * xi ** 4))).toBeLessThan(1e-3 * exact);
		}
		// symmetry: an even profile a + b r² near the axis, so differences over the centres ½, 3⁄2, 5⁄2 Δr
		// go as (9 − 1):(25 − 9) = 1:2
		expect(Math.abs((ul[1] - ul[0]) / (ul[2] - ul[1]) - 0.5)).toBeLessThan(1e-3);
		// gas rises at the slip set by its drag: (G − ρ_g g)/f' with ρ_g = 0 and G = ρ_l g (1 − 4ᾱ/3)
		const G = rhoL * g * (1 - (4 * abar) / 3);
		expect(Math.abs((ug[100] - ul[100]) / (G / 1e4) - 1)).toBeLessThan(1e-6);
	});
});

describe('radial liquid momentum, observed order of accuracy', () => {
	it('converges at second order in the cell size towards the analytic recirculation profile', () => {
		// same problem as above (PHYSICS §7 [D]); ᾱ = 1e-8 makes the O(ᾱ) constraint difference negligible,
		// the equations being linear in ᾱ. Central differences on a uniform grid: order 2 expected.
		const error = (n: number) => recirculationProfile(n).error;
		const e = [20, 40, 80].map(error);
		// measured: 4.68e-3, 1.18e-3, 2.94e-4 (orders 1.99, 2.00)
		expect(Math.abs(Math.log2(e[0] / e[1]) - 2)).toBeLessThan(0.1);
		expect(Math.abs(Math.log2(e[1] / e[2]) - 2)).toBeLessThan(0.1);
	});
});

describe('cross-section model, where the gas gathers', () => {
	// co-current up-flow in a 50 mm pipe, U_l = 0.5 m/s, U_g = 0.03 m/s, contaminated-water drag
	const upflow = (diameterM: number, wallLubrication: CaseDocument['closures']['wallLubrication'] = 'antal') =>
		crossCase({
			geometry: { diameterM: 0.05 },
			sparging: { superficialGasVelocityMS: 0.03, superficialLiquidVelocityMS: 0.5 },
			bubbles: { diameterM },
			closures: { drag: 'tomiyama-contaminated', lift: 'tomiyama', wallLubrication, turbulentDispersion: 'burns' },
			numerics: { cells: 40 }
		});

	it.each([3e-3, 4e-3])('gives a wall-peaked holdup for %s m bubbles in up-flow (Tomiyama C_L > 0)', (d) => {
		// Tomiyama et al. (2002): C_L > 0 below ≈ 5.8 mm pushes bubbles towards the wall in up-flow
		const { sim, results } = runToSteady(upflow(d));
		expect(sim.state.status).toBe('converged');
		const a = results.profiles.fields.holdup;
		expect(results.design.peakLocation.value).toBe(1);
		expect(results.design.peakLocation.label).toMatch(/wall/);
		expect(a[argmax(a)] / a[0]).toBeGreaterThan(1.5);
		// the lift points to the wall in the outer half of the section
		expect(results.profiles.fields.liftForce[30]).toBeGreaterThan(0);
	});

	it.each([7e-3, 8e-3])('gives a core-peaked holdup for %s m bubbles in up-flow (Tomiyama C_L < 0)', (d) => {
		const { sim, results } = runToSteady(upflow(d));
		expect(sim.state.status).toBe('converged');
		const a = results.profiles.fields.holdup;
		expect(results.design.peakLocation.value).toBe(0);
		expect(argmax(a)).toBeLessThan(5);
		expect(a[0] / a[a.length - 1]).toBeGreaterThan(10);
		expect(results.profiles.fields.liftForce[20]).toBeLessThan(0);
	});

	it('moves the wall peak into the cell at the wall when wall lubrication is off: the wall force is what holds the peak off the wall', () => {
		const on = runToSteady(upflow(3.5e-3, 'antal')).results;
		const off = runToSteady(upflow(3.5e-3, 'none')).results;
		const n = on.profiles.x.length;
		const peakOn = argmax(on.profiles.fields.holdup);
		expect(argmax(off.profiles.fields.holdup)).toBe(n - 1);
		expect(peakOn).toBeLessThan(n - 1);
		expect(peakOn).toBeGreaterThan(n / 2);
		// at steady state the radial forces balance (no radial drag left); near the wall the outward lift is
		// met by the inward wall force, which is absent in the run without it
		const f = on.profiles.fields;
		const i = n - 2;
		expect(f.liftForce[i]).toBeGreaterThan(0);
		expect(f.wallLubricationForce[i]).toBeLessThan(-0.5 * f.liftForce[i]);
		expect(Math.max(...off.profiles.fields.wallLubricationForce.map(Math.abs))).toBe(0);
		const largest = Math.max(...f.liftForce.map(Math.abs));
		for (let k = 0; k < n; k++) expect(Math.abs(f.dragForce[k])).toBeLessThan(1e-3 * largest);
	});
});

describe('cross-section model, batch air–water column (D = 0.2 m, U_g = 0.05 m/s)', () => {
	// at U_g = 0.05 m/s a 0.2 m air–water column is at or past the regime transition (PHYSICS §8.6, common
	// practice), where large bubbles carry the gas up the core; 7 mm stands for them (Tomiyama C_L = −0.25)
	const batch = crossCase({ bubbles: { diameterM: 7e-3 }, closures: { drag: 'tomiyama-contaminated' } });
	const { sim, results } = runToSteady(batch);

	it('reaches a steady state with the liquid rising in the core and falling at the wall', () => {
		expect(sim.state.status).toBe('converged');
		const u = results.profiles.fields.liquidVelocity;
		expect(u[0]).toBeGreaterThan(0);
		expect(u[u.length - 1]).toBeLessThan(0);
		expect(results.design.peakLocation.value).toBe(0);
		// zero net liquid flow: ⟨α_l u_l⟩ = 0 to round-off
		const x = results.profiles.x;
		const v = volumesOf(x);
		let q = 0;
		let vs = 0;
		for (let i = 0; i < x.length; i++) {
			q += (1 - results.profiles.fields.holdup[i]) * u[i] * v[i];
			vs += v[i];
		}
		expect(Math.abs(q / vs)).toBeLessThan(1e-12);
		// the section gas flux meets U_g (steady tolerance 1e-5)
		let jg = 0;
		for (let i = 0; i < x.length; i++) jg += results.profiles.fields.holdup[i] * results.profiles.fields.gasVelocity[i] * v[i];
		expect(Math.abs(jg / vs / 0.05 - 1)).toBeLessThan(1e-4);
	});

	it('reverses the liquid at r/R between 0.6 and 0.75, as reported for bubble columns', () => {
		// measured reversal near r/R ≈ 0.7 (common practice; Ueyama & Miyauchi 1979, PHYSICS §7, from memory)
		const xi = results.design.reversalRadiusRatio.value;
		expect(xi).toBeGreaterThan(0.6);
		expect(xi).toBeLessThan(0.75);
		// and further out than the constant-viscosity m = 2 analytic profile (1/√3), as the mixing length makes it
		expect(xi).toBeGreaterThan(1 / Math.sqrt(3));
	});

	it('gives a centreline liquid velocity within a factor of two of Riquarts (1981)', () => {
		// Riquarts (1981), Chem.-Ing.-Tech. 53, 60 (formula from memory, PHYSICS §8.7):
		// u_L(0) = 0.21 √(g D) (U_G³/(g ν_l))^(1/8) = 0.404 m/s here (PHYSICS §15 #35)
		const riquarts = riquartsCentrelineVelocityMS({ diameterM: 0.2, superficialGasVelocityMS: 0.05, liquidKinematicViscosityM2S: nuL });
		expect(Math.abs(riquarts - 0.404)).toBeLessThan(0.004);
		// Tolerance: the formula is unverified and measured centreline velocities scatter about ±30 % round
		// such correlations; a one-size model moves its centreline velocity from 0.34 to 0.64 m/s as d goes
		// from 6 to 7 mm (C_L from −0.03 to −0.25), so the bubble-size choice alone spans about a factor of
		// two. The check is therefore a factor-of-two band; the 4 mm wall-peaked case (≈ 0.01 m/s) fails it.
		const uc = results.design.centrelineLiquidVelocityMS.value;
		expect(uc / riquarts).toBeGreaterThan(0.5);
		expect(uc / riquarts).toBeLessThan(2);
	});

	it('is symmetric about the axis: the profiles leave it with zero slope', () => {
		// a profile with a slope at r = 0 would change between the first two cells as much as anywhere
		// (a linear one: exactly as much); an even one changes there by O(Δr²). Measured: 0.003 for the
		// velocity, 0.05 for the holdup, whose diffusivity near the axis is only the bubble-induced part
		// because the mixing-length viscosity vanishes with the shear there.
		for (const f of [results.profiles.fields.liquidVelocity, results.profiles.fields.holdup]) {
			let steepest = 0;
			for (let i = 0; i + 1 < f.length; i++) steepest = Math.max(steepest, Math.abs(f[i + 1] - f[i]));
			expect(Math.abs(f[1] - f[0])).toBeLessThan(0.1 * steepest);
		}
	});
});

describe('cross-section model, conservation and restart', () => {
	it('conserves the section’s gas to round-off: it changes only by the flux-constraint source, so nothing crosses the axis or the wall', () => {
		// reference case: air–water, 0.2 m, U_g 0.05 m/s, 4 mm, Tomiyama lift + Antal + Burns, 60 cells
		const c = crossCase({ closures: { lift: 'tomiyama', wallLubrication: 'antal', turbulentDispersion: 'burns' } });
		const sim = createCrossSectionSimulation(c);
		const H = FLUX_RELAXATION_HEIGHT_DIAMETERS * c.geometry.diameterM;
		let before = sim.snapshot();
		const v = volumesOf(before.x);
		const vs = v.reduce((s, x) => s + x, 0);
		let worst = 0;
		for (let k = 0; k < 300; k++) {
			const a0 = before.fields.holdup;
			const q0 = a0.reduce((s, a, i) => s + a * v[i], 0);
			const jg0 = a0.reduce((s, a, i) => s + a * before.fields.gasVelocity[i] * v[i], 0) / vs;
			sim.step();
			const after = sim.snapshot();
			const q1 = after.fields.holdup.reduce((s, a, i) => s + a * v[i], 0);
			// the model's source: ⟨α⟩ relaxes with d⟨α⟩/dt = (U_g − ū⟨α⟩')/H, ū = ⟨α u_g⟩/⟨α⟩ of the old state
			const ubar = jg0 / (q0 / vs);
			const expected = (sim.state.dtS * (0.05 - (ubar * q1) / vs) * vs) / H;
			worst = Math.max(worst, Math.abs(q1 - q0 - expected) / q0);
			before = after;
		}
		expect(worst).toBeLessThan(1e-13);
	});

	it('lets no gas through the wall or the axis even when every force drives it outwards', () => {
		const grid = createRadialGrid({ radiusM: 0.1, cells: 30 });
		let a = grid.centresM.map(() => 0.1);
		const next = new Float64Array(30);
		const flux = new Float64Array(31);
		const q0 = a.reduce((s, x, i) => s + x * grid.volumes[i], 0);
		for (let k = 0; k < 2000; k++) {
			transportHoldup({ grid, dtS: 0.05, holdupOld: a, faceDriftMS: new Float64Array(31).fill(0.05), faceDiffusivityM2S: new Float64Array(31).fill(1e-6), holdup: next, faceFlux: flux, work: new Float64Array(150) });
			expect(flux[0]).toBe(0);
			expect(flux[30]).toBe(0);
			a = Float64Array.from(next);
		}
		const q1 = a.reduce((s, x, i) => s + x * grid.volumes[i], 0);
		expect(Math.abs(q1 / q0 - 1)).toBeLessThan(1e-13);
		// the gas has piled up against the wall, none below zero
		expect(argmax(a)).toBe(29);
		expect(Math.min(...a)).toBeGreaterThanOrEqual(0);
	});

	it('enforces the liquid flux exactly at every step', () => {
		const sim = createCrossSectionSimulation(crossCase({ sparging: { superficialLiquidVelocityMS: 0.1 } }));
		for (let k = 0; k < 50; k++) {
			sim.step();
			expect(sim.residuals().liquidFluxError).toBeLessThan(1e-12);
		}
	});

	it('continues bit-identically from a checkpoint passed through msgpack', () => {
		const c = crossCase({ bubbles: { diameterM: 7e-3 }, closures: { drag: 'tomiyama-contaminated' } });
		const a = createCrossSectionSimulation(c);
		for (let k = 0; k < 60; k++) a.step();
		const packr = new Packr({ moreTypes: true });
		const cp = packr.unpack(packr.pack(a.checkpoint()));
		for (let k = 0; k < 60; k++) a.step();
		const b = createCrossSectionSimulation(c);
		b.restore(cp);
		expect(b.state.step).toBe(60);
		for (let k = 0; k < 60; k++) b.step();
		expect(b.state.timeS).toBe(a.state.timeS);
		expect(b.residuals()).toEqual(a.residuals());
		const sa = a.snapshot();
		const sb = b.snapshot();
		for (const name of Object.keys(sa.fields)) expect(Buffer.from(sb.fields[name].buffer).equals(Buffer.from(sa.fields[name].buffer))).toBe(true);
		expect(b.results().design.axialPressureGradientPaM.value).toBe(a.results().design.axialPressureGradientPaM.value);
	});

	it('refuses a checkpoint written by another solver version', () => {
		// the README promises it for every model: a restored run must continue with the very same numerics
		const sim = createCrossSectionSimulation(crossCase());
		sim.step();
		const cp = sim.checkpoint();
		expect(cp.solverVersion).toBe(SOLVER_VERSION);
		expect(() => createCrossSectionSimulation(crossCase()).restore({ ...cp, solverVersion: '0.0.1' })).toThrow(/solver 0\.0\.1 cannot continue/);
	});

	it('reports every residual, snapshot field and design number by its stable id', () => {
		const sim = createCrossSectionSimulation(crossCase());
		sim.step();
		expect(Object.keys(sim.residuals()).sort()).toEqual(['gasMassImbalance', 'holdupChangeRate', 'liquidFluxError', 'momentumImbalance']);
		const s = sim.snapshot();
		expect(Object.keys(s.fields).sort()).toEqual(['dispersionForce', 'dragForce', 'effectiveViscosity', 'gasVelocity', 'holdup', 'liftForce', 'liquidVelocity', 'wallLubricationForce']);
		expect(s.x.length).toBe(60);
		expect(s.x[59]).toBeCloseTo(0.1 - 0.1 / 120, 12);
		const d = sim.results().design;
		expect(Object.keys(d).sort()).toEqual(['axialPressureGradientPaM', 'centrelineLiquidVelocityMS', 'peakLocation', 'reversalRadiusRatio', 'sectionHoldup']);
		expect(d.axialPressureGradientPaM.unit).toBe('Pa/m');
	});

	it('takes U_g at sparger conditions, converting a normal-conditions flow by the ideal-gas law', () => {
		const sp = crossSectionParameters(crossCase());
		expect(sp.superficialGasVelocityMS).toBe(0.05);
		// 0.05 m/s at 0 °C and 1 atm becomes 0.05 · (101325/p_sparger) · (293.15/273.15) at the sparger [D]
		const c = crossCase({ sparging: { gasVelocityBasis: 'normal' } });
		const pSparger = c.fluids.topPressurePa + 998.2 * g * c.geometry.clearLiquidLevelM;
		const n = crossSectionParameters(c);
		expect(n.superficialGasVelocityMS / (0.05 * (101325 / pSparger) * (293.15 / 273.15)) - 1).toBeCloseTo(0, 12);
		// gas density at the sparger, p M/(R T)
		expect(n.gasDensityKgM3).toBeCloseTo((pSparger * 0.02896) / (8.314462618 * 293.15), 10);
	});

	it('fails with the cell, the variable and the time when the holdup leaves the bubbly range', () => {
		// 1 mm bubbles (u_t ≈ 0.11 m/s) cannot carry 0.6 m/s of gas in a batch column below α = 0.8
		const sim = createCrossSectionSimulation(crossCase({ sparging: { superficialGasVelocityMS: 0.6 }, bubbles: { diameterM: 1e-3 } }));
		let status = sim.step();
		for (let k = 0; k < 1000 && status.status === 'running'; k++) status = sim.step();
		expect(status.status).toBe('failed');
		expect(status.message).toMatch(/holdup/i);
		expect(status.message).toMatch(/cell \d+ of 60 \(r = [\d.]+ mm\)/);
		expect(status.message).toMatch(/t = [\d.]+ s/);
		// a failed run stays failed
		expect(sim.step().status).toBe('failed');
		expect(sim.results().status).toBe('failed');
	});
});
