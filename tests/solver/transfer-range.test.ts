/**
 * The mass-transfer model of the height profile (`solver/height/transfer.ts`) across the operating range users meet:
 * superficial gas velocity 0.005–0.4 m/s, column diameter 0.1–3 m, top pressure 1–30 bar, water, ethanol and two
 * glycerol–water mixtures, against published kLa correlations. Every run is the default two-class case (small and
 * large bubbles, Higbie k_L) in steady transfer mode: the design numbers compared are those of the converged
 * hydrodynamics (the kLa a clean-water re-aeration test would measure, per liquid volume), so no re-aeration needs to
 * be marched.
 *
 * References (each check names the one it uses):
 * - Akita & Yoshida (1973), Ind. Eng. Chem. Process Des. Dev. 12(1), 76–80, doi 10.1021/i260045a015:
 *   k_L a D²/D_L = 0.6 Sc^0.5 Bo^0.62 Ga^0.31 ε^1.1 with their holdup ε/(1 − ε)⁴ = 0.2 Bo^(1/8) Ga^(1/12) Fr.
 *   The form and the constants agree with a secondary transcription of the paper (the paper itself not seen); their
 *   data: D = 0.15–0.6 m, U_G up to about 0.33 m/s, water, glycol, glycerol and methanol solutions; for D > 0.6 m use
 *   D = 0.6 m (from memory, as for their holdup, PHYSICS §8.1).
 * - Shah, Kelkar, Godbole & Deckwer (1982), AIChE J. 28(3), 353–379: k_L a = 0.467 U_G^0.82 (1/s, U_G in m/s) for
 *   air–water (from memory: not verified; independent of the column diameter).
 * - Common practice (from memory): k_L a/ε ≈ 0.5 1/s for air–water at 1 bar, roughly constant over the velocity.
 * - Gas density: k_L a rises with pressure at fixed U_G, mainly through the holdup and smaller bubbles (Wilkinson,
 *   Haringa & van Dierendonck 1994, Chem. Eng. Sci. 49, 1417, from memory). Dewes & Schumpe (1997), Chem. Eng. Sci. 52,
 *   4105: k_L a ∝ U_G^0.90 μ_l^−0.55 ρ_g^0.46 for ρ_g = 0.4–18.8 kg/m³ (form and range as transcribed in a secondary
 *   source; only the gas-density exponent is used here).
 */
import { describe, expect, it } from 'vitest';
import { defaultCase, type CaseDocument } from '../../solver/case.js';
import { createHeightSimulation } from '../../solver/height/simulation.js';
import { applyFluidPreset, idealGasDensity } from '../../solver/fluids.js';
import { akitaYoshidaKLa } from '../../solver/correlations/mass-transfer.js';
import { akitaYoshidaHoldup } from '../../solver/correlations/holdup.js';
import { columnGroups } from '../../solver/correlations/groups.js';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

interface Point {
	ug: number;
	d?: number;
	topPressurePa?: number;
	liquid?: 'water' | 'ethanol' | 'glycerol-50' | 'glycerol-80';
	heightM?: number;
	cells?: number;
	sizing?: 'fixed' | 'akita-yoshida';
}

/** 2 m of clear liquid, 40 cells; taller columns where the swell would reach the top outlet. */
function column(p: Point): CaseDocument {
	const c = defaultCase();
	if (p.liquid === 'ethanol') c.fluids = applyFluidPreset(c.fluids, 'air-ethanol-20C');
	if (p.liquid === 'glycerol-80') c.fluids = applyFluidPreset(c.fluids, 'air-glycerol-water-80wt-20C');
	if (p.liquid === 'glycerol-50') {
		// glycerol–water 50 wt %, PHYSICS §14: ρ 1126 (from memory), μ 6.0 mPa·s (Cheng 2008), σ 0.068 (from memory);
		// O₂ diffusivity scaled from water by the viscosity ratio to the power −2/3 (estimate, as the 80 wt % preset)
		c.fluids.preset = null;
		c.fluids.liquid = { name: 'glycerol–water 50 wt %', densityKgM3: 1126, viscosityPaS: 0.006, surfaceTensionNM: 0.068 };
		c.fluids.soluteDiffusivityM2S = 2.0e-9 * Math.pow(0.006 / 1.002e-3, -2 / 3);
	}
	c.fluids.topPressurePa = p.topPressurePa ?? 101325;
	c.geometry = { heightM: p.heightM ?? 3, diameterM: p.d ?? 0.2, clearLiquidLevelM: 2 };
	c.sparging.superficialGasVelocityMS = p.ug;
	c.bubbles.sizing = p.sizing ?? 'fixed';
	c.numerics.cells = p.cells ?? 40;
	c.numerics.endTimeS = 200;
	c.numerics.snapshotIntervalS = 10;
	c.transfer.mode = 'steady';
	return c;
}

interface Measured {
	status: string;
	kLa: number;
	apparentKLa: number;
	holdup: number;
	small: number;
	large: number;
	areaPerM: number;
	sote: number;
	/** Akita & Yoshida (1973) kLa with their own holdup, D capped at 0.6 m: the correlation's prediction */
	akitaYoshida: number;
	/** Akita & Yoshida (1973) kLa with the model's holdup: the k_L a/ε part of the correlation alone */
	akitaYoshidaAtModelHoldup: number;
	akitaYoshidaHoldup: number;
	shah: number;
}

const cache = new Map<string, Measured>();
function measure(p: Point): Measured {
	// the same column however it is spelt: defaults filled in before the look-up
	const full: Required<Point> = { d: 0.2, topPressurePa: 101325, liquid: 'water', heightM: 3, cells: 40, sizing: 'fixed', ...p };
	const key = JSON.stringify(Object.entries(full).sort(([a], [b]) => (a < b ? -1 : 1)));
	const hit = cache.get(key);
	if (hit) return hit;
	const c = column(p);
	const sim = createHeightSimulation(c);
	while (sim.state.status === 'running') sim.step();
	const r = sim.results();
	const d = r.design;
	const l = c.fluids.liquid;
	const props = { superficialGasVelocityMS: p.ug, liquidDensityKgM3: l.densityKgM3, liquidViscosityPaS: l.viscosityPaS, surfaceTensionNM: l.surfaceTensionNM };
	const capped = { ...props, diameterM: Math.min(c.geometry.diameterM, 0.6) };
	const epsAY = akitaYoshidaHoldup(capped);
	const diff = c.fluids.soluteDiffusivityM2S;
	const m: Measured = {
		status: r.status,
		kLa: d.transferKLaPerS.value,
		apparentKLa: d.apparentKLaPerS.value,
		holdup: d.overallHoldup.value,
		small: d.holdupSmall.value,
		large: d.holdupLarge.value,
		areaPerM: d.interfacialAreaPerM.value,
		sote: d.sotePercent.value,
		akitaYoshida: akitaYoshidaKLa({ ...capped, holdup: epsAY, diffusivityM2S: diff }),
		akitaYoshidaAtModelHoldup: akitaYoshidaKLa({ ...capped, holdup: d.overallHoldup.value, diffusivityM2S: diff }),
		akitaYoshidaHoldup: epsAY,
		shah: 0.467 * Math.pow(p.ug, 0.82)
	};
	cache.set(key, m);
	return m;
}

/** Air–water, D = 0.2 m, 1 bar; the swell at 0.2 and 0.4 m/s needs a taller column. */
const velocities: Point[] = [{ ug: 0.005 }, { ug: 0.02 }, { ug: 0.05 }, { ug: 0.1 }, { ug: 0.2, heightM: 5 }, { ug: 0.4, heightM: 6, cells: 60 }];

describe('the Akita–Yoshida (1973) kLa the comparisons use', () => {
	it('is the published form, by hand: 0.0282 1/s at D = 0.2 m, ε = 0.1073 (PHYSICS §15 #17)', () => {
		// Sc = 1.002e-3/(998.2 · 2e-9) = 501.9, Bo = 9.81 · 0.2² · 998.2/0.0727 = 5388, Ga = 9.81 · 0.2³/(1.00381e-6)² = 7.789e10;
		// 0.6 · 501.9^0.5 · 5388^0.62 · (7.789e10)^0.31 · 0.1073^1.1 = 5.649e5 → k_L a = 5.649e5 · 2e-9/0.04 = 0.02824 1/s
		const column = { diameterM: 0.2, superficialGasVelocityMS: 0.05, liquidDensityKgM3: 998.2, liquidViscosityPaS: 1.002e-3, surfaceTensionNM: 0.0727 };
		const g = columnGroups(column);
		expect(rel(g.bond, 5388)).toBeLessThan(1e-3);
		expect(rel(g.galilei, 7.789e10)).toBeLessThan(1e-3);
		const kla = akitaYoshidaKLa({ ...column, holdup: 0.1073, diffusivityM2S: 2e-9 });
		const sc = 1.002e-3 / 998.2 / 2e-9;
		const byHand = (0.6 * Math.sqrt(sc) * Math.pow(g.bond, 0.62) * Math.pow(g.galilei, 0.31) * Math.pow(0.1073, 1.1) * 2e-9) / 0.04;
		expect(rel(kla, byHand)).toBeLessThan(1e-12);
		expect(rel(kla, 0.02824)).toBeLessThan(1e-3);
		// the groups put D to the power 2·0.62 + 3·0.31 − 2 = 0.17: +20.5 % from 0.2 to 0.6 m at the same holdup
		expect(rel(akitaYoshidaKLa({ ...column, diameterM: 0.6, holdup: 0.1073, diffusivityM2S: 2e-9 }) / kla, Math.pow(3, 0.17))).toBeLessThan(1e-12);
	});
});

describe('kLa over the superficial gas velocity (air–water, D = 0.2 m, 1 bar)', () => {
	// Measured (kLa in 1/s; model per liquid volume):
	//  U_G    ε model  ε A–Y   kLa model  A–Y    Shah    kLa/ε   SOTE %
	//  0.005  0.0152   0.0158  0.00778    0.00345 0.00606 0.51    8.9
	//  0.02   0.0633   0.0541  0.0328     0.0133  0.0189  0.52    9.3
	//  0.05   0.127    0.107   0.0601     0.0282  0.0400  0.47    6.8
	//  0.1    0.178    0.165   0.0675     0.0452  0.0707  0.38    3.8
	//  0.2    0.264    0.233   0.0795     0.0664  0.125   0.30    2.2
	//  0.4    0.386    0.309   0.103      0.0903  0.220   0.27    1.4
	const runs = velocities.map(measure);

	it('converges at every velocity, with the gas in the small class below the transition and shared above it', () => {
		for (const r of runs) {
			expect(r.status).toBe('converged');
			// the per-class holdups add up to the overall holdup of the aerated region
			expect(Math.abs(r.small + r.large - r.holdup)).toBeLessThan(1e-3);
			// the kLa a re-aeration test would see is a few per cent below the volume average (the gas loses some oxygen)
			expect(r.apparentKLa / r.kLa).toBeGreaterThan(0.9);
			expect(r.apparentKLa / r.kLa).toBeLessThan(1);
		}
		// below the Reilly et al. transition (about 0.03 m/s for air–water, PHYSICS §8.6) there are no large bubbles
		expect(runs[0].large).toBe(0);
		expect(runs[1].large).toBe(0);
		expect(runs[5].large).toBeGreaterThan(0.2);
		// the small-bubble holdup levels off at about 0.1 above the transition (0.098–0.113 measured)
		for (const r of runs.slice(2)) {
			expect(r.small).toBeGreaterThan(0.09);
			expect(r.small).toBeLessThan(0.12);
		}
		// kLa rises with the gas rate, and more slowly above the transition
		for (let k = 1; k < runs.length; k++) expect(runs[k].kLa).toBeGreaterThan(runs[k - 1].kLa);
		expect(Math.log(runs[5].kLa / runs[2].kLa) / Math.log(0.4 / 0.05)).toBeLessThan(0.4);
	});

	it('is within a factor of 2 of Shah et al. (1982) up to 0.2 m/s and half of it at 0.4 m/s (known gap)', () => {
		// measured ratios model/Shah: 1.28, 1.74, 1.50, 0.95, 0.64, 0.47
		for (const r of runs.slice(0, 5)) {
			expect(r.kLa / r.shah).toBeGreaterThan(0.5);
			expect(r.kLa / r.shah).toBeLessThan(2);
		}
		// known gap: above the transition the extra gas goes into large bubbles that add holdup with little area, so the
		// model's kLa grows as U_G^0.27 from 0.05 to 0.4 m/s against the correlation's 0.82
		expect(runs[5].kLa / runs[5].shah).toBeGreaterThan(0.35);
		expect(runs[5].kLa / runs[5].shah).toBeLessThan(0.6);
	});

	it('is 2–2.5 times Akita–Yoshida (1973) in bubbly flow (known gap) and within 1.5 times of it at 0.1–0.4 m/s', () => {
		// measured ratios model/A–Y (their holdup): 2.26, 2.47, 2.13, 1.49, 1.20, 1.14. The holdups agree (model 0.96–1.25
		// times theirs); the gap is in k_L a/ε: mobile-interface (Higbie) 5 mm bubbles against data from a single-orifice
		// sparger (A–Y at the model's holdup: 2.37, 2.08, 1.77, 1.37, 1.05, 0.89)
		for (const r of runs.slice(0, 3)) {
			expect(r.kLa / r.akitaYoshida).toBeGreaterThan(1.9);
			expect(r.kLa / r.akitaYoshida).toBeLessThan(2.8);
			expect(r.kLa / r.akitaYoshidaAtModelHoldup).toBeGreaterThan(1.6);
			expect(r.kLa / r.akitaYoshidaAtModelHoldup).toBeLessThan(2.6);
		}
		for (const r of runs.slice(3)) {
			expect(r.kLa / r.akitaYoshida).toBeGreaterThan(1);
			expect(r.kLa / r.akitaYoshida).toBeLessThan(1.5);
		}
		for (const r of runs) {
			expect(r.holdup / r.akitaYoshidaHoldup).toBeGreaterThan(0.9);
			expect(r.holdup / r.akitaYoshidaHoldup).toBeLessThan(1.3);
		}
	});

	it('keeps kLa/ε near 0.5 1/s in bubbly flow and lets it fall to about 0.3 in churn-turbulent flow (known gap)', () => {
		// common practice (from memory): kLa/ε ≈ 0.5 1/s for air–water; measured 0.51, 0.52, 0.47 up to 0.05 m/s, then
		// 0.38, 0.30, 0.27: the large bubbles (16–47 mm, slip 0.7–1.5 m/s) carry most of the added holdup
		for (const r of runs.slice(0, 3)) expect(rel(r.kLa / r.holdup, 0.5)).toBeLessThan(0.1);
		for (let k = 3; k < runs.length; k++) {
			expect(runs[k].kLa / runs[k].holdup).toBeGreaterThan(0.22);
			expect(runs[k].kLa / runs[k].holdup).toBeLessThan(runs[k - 1].kLa / runs[k - 1].holdup);
		}
	});

	it('gives a SOTE that falls with the gas rate, from about 9 % to about 1.4 % over 2 m of water', () => {
		// 5 mm mobile-interface bubbles: 4.4–4.7 %/m below the transition, the range common practice (from memory) gives
		// fine-pore diffusers in clean water (4–8 %/m), then coarse-bubble values (1–2.5 %/m) once large bubbles form
		expect(runs[0].sote / 2).toBeGreaterThan(4);
		expect(runs[0].sote / 2).toBeLessThan(5);
		for (let k = 2; k < runs.length; k++) expect(runs[k].sote).toBeLessThan(runs[k - 1].sote);
		expect(runs[4].sote / 2).toBeGreaterThan(1);
		expect(runs[4].sote / 2).toBeLessThan(2.5);
		// the interfacial area at 0.05 m/s against 6 ε/d₃₂ of the Akita & Yoshida correlations (PHYSICS §15 #16: 123.5 1/m):
		// measured 129.0 1/m
		expect(rel(runs[2].areaPerM, 123.5)).toBeLessThan(0.1);
	});
});

describe('kLa over the column diameter (air–water, 0.05 m/s, 1 bar)', () => {
	const diameters = [0.1, 0.2, 0.6, 1, 3];
	const runs = diameters.map((d) => measure({ ug: 0.05, d }));

	it('does not depend on the diameter, as Shah et al. (1982) and common practice for D > 0.15 m have it', () => {
		// the height profile is one-dimensional: D enters only the large bubbles' wall factor (measured: 0.1 m +0.2 %) and the
		// liquid dispersion, which leaves the design kLa unchanged. Common practice (from memory): kLa does not depend on D
		// above about 0.15 m
		for (const r of runs) {
			expect(r.status).toBe('converged');
			expect(rel(r.kLa, runs[1].kLa)).toBeLessThan(0.01);
		}
		// Akita–Yoshida rises as D^0.17 to 0.6 m (their limit) and is held there: model/A–Y 2.40, 2.13, 1.77, 1.77, 1.77
		for (const r of runs) {
			expect(r.kLa / r.akitaYoshida).toBeGreaterThan(1.6);
			expect(r.kLa / r.akitaYoshida).toBeLessThan(2.6);
			expect(rel(r.kLa / r.shah, 1.5)).toBeLessThan(0.05);
		}
	});

	it('with the Akita–Yoshida (1974) bubble size extrapolates the size beyond 0.6 m and gains 2.3 times from 0.2 to 1 m (known gap)', () => {
		// the sizing option takes d₃₂ ∝ D^−0.30 at any diameter (not held at 0.6 m): 5.2 mm at 0.2 m, 3.2 mm at 1 m.
		// Measured kLa 0.0561 and 0.1315 1/s; A–Y kLa (held at 0.6 m) 0.0282 and 0.0340: ratios 1.99 and 3.87
		const d02 = measure({ ug: 0.05, d: 0.2, sizing: 'akita-yoshida' });
		const d1 = measure({ ug: 0.05, d: 1, sizing: 'akita-yoshida' });
		expect(d02.status).toBe('converged');
		expect(d1.status).toBe('converged');
		expect(rel(d02.kLa, runs[1].kLa)).toBeLessThan(0.1);
		expect(d1.kLa / d02.kLa).toBeGreaterThan(2);
		expect(d1.kLa / d02.kLa).toBeLessThan(2.7);
		expect(d1.kLa / d1.akitaYoshida).toBeLessThan(4.5);
	});
});

describe('kLa over the top pressure (air–water, 0.05 m/s at the sparger, D = 0.2 m)', () => {
	const pressures = [101325, 2e5, 5e5, 1e6, 3e6];
	const runs = pressures.map((topPressurePa) => measure({ ug: 0.05, topPressurePa }));
	// gas density at the top, 1.20 to 35.6 kg/m³
	const rhoG = pressures.map((p) => idealGasDensity({ pressurePa: p, molarMassKgMol: 0.02896, temperatureK: 293.15 }));

	it('rises with the gas density to 5 bar, through the holdup, and then stays (known gap above 5 bar)', () => {
		// measured kLa 0.0601, 0.0696, 0.0843, 0.0847, 0.0835 1/s; holdup 0.127, 0.137, 0.144, 0.144, 0.144. The denser gas
		// moves the Reilly transition up and the large bubbles disappear by 5 bar (large-class holdup ≤ 0.002), which is
		// the one way the gas density reaches the transfer: the small bubbles stay 5 mm at every pressure
		for (const r of runs) expect(r.status).toBe('converged');
		for (let k = 1; k < 3; k++) {
			expect(runs[k].kLa).toBeGreaterThan(runs[k - 1].kLa);
			expect(runs[k].holdup).toBeGreaterThan(runs[k - 1].holdup);
		}
		for (const r of runs.slice(2)) expect(r.large).toBeLessThan(0.002);
		// Dewes & Schumpe (1997): ρ_g^0.46 gives ×2.09 from 1 to 5 bar; the model gives ×1.40
		const dewes5 = Math.pow(rhoG[2] / rhoG[0], 0.46);
		expect(rel(dewes5, 2.09)).toBeLessThan(0.01);
		const gain5 = runs[2].kLa / runs[0].kLa;
		expect(gain5).toBeGreaterThan(1.25);
		expect(gain5).toBeLessThan(1.6);
		expect(gain5 / dewes5).toBeGreaterThan(0.55);
		expect(gain5 / dewes5).toBeLessThan(0.8);
		// known gap: from 5 to 10 bar Dewes & Schumpe give another ×1.37 (10 bar is inside their 18.8 kg/m³), the model none;
		// at 30 bar (35.6 kg/m³, outside their range) the model is still within 2 % of its 5 bar value
		expect(rel(runs[3].kLa, runs[2].kLa)).toBeLessThan(0.02);
		expect(rel(runs[4].kLa, runs[2].kLa)).toBeLessThan(0.03);
	});

	it('keeps kLa/ε within 0.45–0.6 1/s at every pressure (Wilkinson et al. 1994: the pressure acts through the holdup)', () => {
		// measured 0.47, 0.51, 0.585, 0.587, 0.58: the rise is the large bubbles' share of the holdup going to the small ones
		for (const r of runs) {
			expect(r.kLa / r.holdup).toBeGreaterThan(0.45);
			expect(r.kLa / r.holdup).toBeLessThan(0.6);
		}
	});

	it('reports a SOTE that falls as 1/p: the ASCE/EWRI 2-06 Ω = p/1 atm standardises the saturation to 1 atm', () => {
		// SOTE · Ω / kLa: measured 114, 120, 123, 125, 126 (%·s) — the standard efficiency is that of the column's kLa at
		// 1 atm for the oxygen fed at the top pressure, so 0.35 % at 30 bar where the oxygen-free liquid would take 10.5 %
		const basis = runs[0].sote / runs[0].kLa;
		for (let k = 0; k < runs.length; k++) {
			const omega = pressures[k] / 101325;
			expect(rel((runs[k].sote * omega) / runs[k].kLa, basis)).toBeLessThan(0.12);
		}
		expect(runs[4].sote).toBeLessThan(0.5);
	});
});

describe('kLa in other liquids (0.05 m/s, D = 0.2 m, 1 bar)', () => {
	it('in ethanol (σ = 22 mN/m) agrees with Akita–Yoshida at 0.05 m/s and stays within a factor of 2 of it at 0.02–0.2 m/s', () => {
		// measured model/A–Y: 1.34 (0.02), 1.03 (0.05), 0.59 (0.2 m/s). With the fixed 5 mm small bubbles the model sees
		// the lower surface tension only through the large bubbles and the transition (kLa 0.057 against water's 0.060)
		// where A–Y's Bo^0.62 gives ethanol twice water's kLa: the match at 0.05 m/s is partly the bubbly-flow gap of water
		const runs = [{ ug: 0.02 }, { ug: 0.05 }, { ug: 0.2, heightM: 5 }].map((p) => measure({ ...p, liquid: 'ethanol' }));
		for (const r of runs) {
			expect(r.status).toBe('converged');
			expect(r.kLa / r.akitaYoshida).toBeGreaterThan(0.5);
			expect(r.kLa / r.akitaYoshida).toBeLessThan(2);
		}
		expect(rel(runs[1].kLa / measure({ ug: 0.05 }).kLa, 1)).toBeLessThan(0.1);
		// with the Akita–Yoshida (1974) bubble size (3.6 mm in ethanol, 5.2 mm in water) the model follows the surface
		// tension: measured kLa 0.107 against water's 0.056 (×1.90; A–Y ×1.97) and model/A–Y 1.93
		const sized = measure({ ug: 0.05, liquid: 'ethanol', sizing: 'akita-yoshida' });
		const water = measure({ ug: 0.05, sizing: 'akita-yoshida' });
		expect(rel(sized.kLa / water.kLa, sized.akitaYoshida / water.akitaYoshida)).toBeLessThan(0.1);
		expect(sized.kLa / sized.akitaYoshida).toBeGreaterThan(1.6);
		expect(sized.kLa / sized.akitaYoshida).toBeLessThan(2.3);
	});

	it('in viscous glycerol–water overpredicts the holdup and kLa, by 3 times at 6 mPa·s and 11 times at 61 mPa·s (known gap)', () => {
		// 50 wt % (6.0 mPa·s): holdup 0.152 against A–Y's 0.090, kLa 0.0373 against 0.0118 (×3.2).
		// 80 wt % (61 mPa·s, 4 m column for the swell): holdup 0.354 against 0.069, kLa 0.0361 against 0.00333 (×10.9).
		// The fixed 5 mm small bubbles rise slowly in the viscous liquid (slip 0.10 m/s at 61 mPa·s) and accumulate;
		// viscous liquids in practice form larger bubbles (from memory), which the model has no means to do. A–Y's data
		// include glycerol solutions (from memory, viscosities up to about 20 mPa·s: the 80 wt % case is beyond them)
		const g50 = measure({ ug: 0.05, liquid: 'glycerol-50' });
		const g80 = measure({ ug: 0.05, liquid: 'glycerol-80', heightM: 4 });
		expect(g50.status).toBe('converged');
		expect(g80.status).toBe('converged');
		expect(g50.holdup / g50.akitaYoshidaHoldup).toBeGreaterThan(1.4);
		expect(g50.holdup / g50.akitaYoshidaHoldup).toBeLessThan(2);
		expect(g50.kLa / g50.akitaYoshida).toBeGreaterThan(2.5);
		expect(g50.kLa / g50.akitaYoshida).toBeLessThan(4);
		expect(g80.holdup / g80.akitaYoshidaHoldup).toBeGreaterThan(4);
		expect(g80.holdup / g80.akitaYoshidaHoldup).toBeLessThan(6.5);
		expect(g80.kLa / g80.akitaYoshida).toBeGreaterThan(8);
		expect(g80.kLa / g80.akitaYoshida).toBeLessThan(14);
		// the viscosity lowers the model's kLa (water 0.060) far less than Dewes & Schumpe's μ^−0.55 (×0.37 at 6 mPa·s)
		expect(g50.kLa / measure({ ug: 0.05 }).kLa).toBeGreaterThan(0.5);
	});
});
