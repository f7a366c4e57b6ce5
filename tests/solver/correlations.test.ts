import { describe, expect, it } from 'vitest';
import {
	akitaYoshidaHoldup,
	akitaYoshidaKLa,
	akitaYoshidaSauterDiameter,
	bubbleVelocityScale,
	columnGroups,
	higbieMassTransferCoefficient,
	hughmarkHoldup,
	interfacialArea,
	ishiiBubblyHoldup,
	ishiiChurnHoldup,
	ishiiDistributionParameter,
	regimeFromBand,
	wallisHoldup,
	zuberFindlayHoldup
} from '../../solver/correlations/index.js';
import { derivedNumbers } from '../../solver/derived.js';
import { applyFluidPreset, fluidPresets, idealGasDensity } from '../../solver/fluids.js';
import { defaultCase } from '../../solver/case.js';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
// PHYSICS §0 property set; column D = 0.2 m, U_G = 0.05 m/s
const column = { diameterM: 0.2, superficialGasVelocityMS: 0.05, liquidDensityKgM3: 998.2, liquidViscosityPaS: 1.002e-3, surfaceTensionNM: 0.0727 };
const driftInput = { superficialGasVelocityMS: 0.05, liquidDensityKgM3: 998.2, gasDensityKgM3: 1.204, surfaceTensionNM: 0.0727 };

describe('bubble-column design correlations (PHYSICS §15)', () => {
	it('gives the column groups and the Akita–Yoshida (1973) holdup (#14)', () => {
		// #14 [D]: Bo = 5388, Ga = 7.789e10, Fr = 0.03570; ε = 0.1073 (C = 0.20), 0.1242 (C = 0.25); constants from memory
		const g = columnGroups(column);
		expect(rel(g.bond, 5388)).toBeLessThan(5e-4);
		expect(rel(g.galilei, 7.789e10)).toBeLessThan(5e-4);
		expect(rel(g.froude, 0.0357)).toBeLessThan(5e-4);
		expect(rel(akitaYoshidaHoldup(column), 0.1073)).toBeLessThan(0.005);
		expect(rel(akitaYoshidaHoldup({ ...column, electrolyte: true }), 0.1242)).toBeLessThan(0.005);
	});

	it('gives the Hughmark (1967) holdup in its unit convention (#15)', () => {
		// #15 [D]: 1/(2 + 0.35/0.05·(0.9982·72.7/72)^(1/3)); fit from memory
		expect(rel(hughmarkHoldup(column), 0.1109)).toBeLessThan(0.005);
		expect(rel(hughmarkHoldup({ ...column, superficialGasVelocityMS: 0.02 }), 0.0512)).toBeLessThan(0.005);
	});

	it('gives the Akita–Yoshida (1974) Sauter diameter and interfacial area (#16)', () => {
		// #16 [D]: 5.21 mm; a = 6ε/d32 = 123.5 1/m with ε = 0.1073 (Akita–Yoshida 1974 constants from memory)
		const d32 = akitaYoshidaSauterDiameter(column);
		expect(rel(d32, 5.21e-3)).toBeLessThan(0.01);
		expect(rel(interfacialArea({ holdup: 0.1073, diameterM: d32 }), 123.5)).toBeLessThan(0.01);
	});

	it('gives the Akita–Yoshida (1973) kLa for oxygen in water (#17)', () => {
		// #17 [D]: 0.0282 1/s with D_L = 2.0e-9 m²/s (constants and diffusivity from memory), Sc = 502
		expect(rel(akitaYoshidaKLa({ ...column, holdup: 0.1073, diffusivityM2S: 2e-9 }), 0.0282)).toBeLessThan(0.01);
	});

	it('gives the Higbie (1935) penetration coefficient (#18)', () => {
		// #18 [D]: t_c = 0.012 s, k_L = 2√(2e-9/(π·0.012)) = 4.61e-4 m/s (Higbie formula [S]; t_c = d/u_r from memory)
		expect(rel(higbieMassTransferCoefficient({ diffusivityM2S: 2e-9, diameterM: 3e-3, slipMS: 0.25 }), 4.61e-4)).toBeLessThan(0.005);
	});

	it('gives the drift-flux holdups of a batch column (#19)', () => {
		// #19 [D]: (σgΔρ/ρ_l²)^(1/4) = 0.1634 m/s; Ishii bubbly 0.2513, Ishii churn 0.1719, Zuber–Findlay 0.1613
		// (Ishii 1977 and Zuber–Findlay 1965 coefficients from memory)
		expect(rel(bubbleVelocityScale(driftInput), 0.1634)).toBeLessThan(0.002);
		expect(rel(ishiiDistributionParameter(driftInput), 1.1931)).toBeLessThan(5e-4);
		expect(rel(ishiiBubblyHoldup(driftInput), 0.2513)).toBeLessThan(0.005);
		expect(rel(ishiiChurnHoldup(driftInput), 0.1719)).toBeLessThan(0.005);
		expect(rel(zuberFindlayHoldup(driftInput), 0.1613)).toBeLessThan(0.005);
	});

	it('gives the Wallis n = 2 holdup of a batch column (#20)', () => {
		// #20 [D]: α(1 − α) = 0.05/0.25 = 0.2 → α = 0.2764 (Wallis 1969 drift-flux form, from memory)
		expect(rel(wallisHoldup({ superficialGasVelocityMS: 0.05, swarmVelocityMS: 0.25, exponent: 2 }), 0.2764)).toBeLessThan(0.001);
	});

	it('labels the regime from the common-practice band', () => {
		// PHYSICS §8.6 band 0.03–0.05 m/s, common practice
		expect(regimeFromBand({ superficialGasVelocityMS: 0.01 }).value).toBe(0);
		expect(regimeFromBand({ superficialGasVelocityMS: 0.1 }).value).toBe(1);
		expect(regimeFromBand({ superficialGasVelocityMS: 0.035 }).label).toMatch(/^transitional, leaning homogeneous .*common-practice transition band/);
		expect(regimeFromBand({ superficialGasVelocityMS: 0.1 }).label).toMatch(/^heterogeneous \(common-practice band/);
	});
});

describe('fluid presets and derived numbers', () => {
	it('gives the ideal-gas density of air at 20 °C and 1 atm', () => {
		// PHYSICS §14: air 1.204 kg/m³ [S]
		expect(rel(idealGasDensity({ pressurePa: 101325, molarMassKgMol: 0.02896, temperatureK: 293.15 }), 1.204)).toBeLessThan(1e-3);
	});

	it('names a source for every preset and fills a valid fluids section', () => {
		for (const p of fluidPresets) {
			expect(p.liquid.source.length).toBeGreaterThan(5);
			expect(p.gas.source.length).toBeGreaterThan(5);
			const f = applyFluidPreset(defaultCase().fluids, p.id);
			expect(f.preset).toBe(p.id);
			expect(f.liquid.densityKgM3).toBe(p.liquid.densityKgM3);
		}
	});

	it('scales the oxygen diffusivity of the glycerol–water preset from water as its source line says', () => {
		// preset estimate: D = D_water (μ/μ_water)^(−2/3), D_water = 2.0e-9 m²/s (PHYSICS §13.2, from memory) [D]: 1.29e-10
		const p = fluidPresets.find((x) => x.id === 'air-glycerol-water-80wt-20C')!;
		expect(p.soluteSource).toMatch(/−2\/3/);
		expect(rel(p.soluteDiffusivityM2S, 2.0e-9 * Math.pow(p.liquid.viscosityPaS / 1.002e-3, -2 / 3))).toBeLessThan(0.01);
	});

	it('derives the air–water groups of the default case', () => {
		// PHYSICS §14 [D]: Mo = 2.58e-11; the default 5 mm (small-class) Schiller–Naumann bubble in Newton range: U = √(4/3 g d Δρ/(0.44 ρ_l))
		// (Schiller & Naumann constant 0.44 from memory)
		const d = derivedNumbers(defaultCase());
		expect(rel(d.morton, 2.58e-11)).toBeLessThan(0.01);
		const rhoSp = d.spargerGasDensityKgM3;
		expect(rel(d.terminalVelocityMS, Math.sqrt(((4 / 3) * 9.81 * 0.005 * (998.2 - rhoSp)) / (0.44 * 998.2)))).toBeLessThan(1e-9);
		expect(d.cellSizeM).toBeCloseTo(0.02, 12);
		// sparger pressure at rest: 101325 + 998.2·9.81·1.5 Pa
		expect(rel(rhoSp, idealGasDensity({ pressurePa: 101325 + 998.2 * 9.81 * 1.5, molarMassKgMol: 0.02896, temperatureK: 293.15 }))).toBeLessThan(1e-12);
		expect(d.firstTimeStepS).toBeGreaterThan(0);
		// PHYSICS §15 #13: C_VM = 0.5, C_p = 0.25 is well-posed up to α = 1 − 1/√2
		expect(d.wellPosedUpToHoldup).toBeCloseTo(1 - Math.SQRT1_2, 4);
		expect(d.warnings).toEqual([]);
	});

	it('calls a model without interfacial pressure well-posed nowhere, with or without virtual mass', () => {
		// PHYSICS §3.1 [S], §3.3 [D]: Δp = 0 gives complex characteristics for any u_r ≠ 0 (ρ_g > 0)
		for (const vm of ['none', 'constant'] as const) {
			const c = defaultCase();
			c.closures.virtualMass = vm;
			c.closures.interfacialPressureCoefficient = 0;
			const d = derivedNumbers(c);
			expect(d.wellPosedUpToHoldup).toBe(0);
			expect(d.warnings.some((w) => /not well-posed/.test(w))).toBe(true);
		}
	});

	it('warns about Stokes drag outside its range and a model without virtual mass', () => {
		const c = defaultCase();
		c.closures.drag = 'stokes';
		c.closures.virtualMass = 'none';
		const d = derivedNumbers(c);
		// Stokes (1851) holds for Re ≲ 0.1 (PHYSICS §1.1); a 4 mm bubble in water is far outside
		expect(d.warnings.some((w) => /Stokes drag is valid for Re/.test(w))).toBe(true);
		expect(d.warnings.some((w) => /virtual mass/.test(w))).toBe(true);
	});

	it('warns that Higbie k_L overstates the transfer of small bubbles in tap water', () => {
		const c = defaultCase();
		c.transfer.mode = 'batch';
		c.bubbles.diameterM = 0.002;
		expect(derivedNumbers(c).warnings.filter((w) => /Higbie/.test(w))).toHaveLength(1);
		c.transfer.massTransferCoefficient = 'frossling';
		expect(derivedNumbers(c).warnings.filter((w) => /Higbie/.test(w))).toEqual([]);
		c.transfer.massTransferCoefficient = 'higbie';
		c.bubbles.diameterM = 0.005;
		expect(derivedNumbers(c).warnings.filter((w) => /Higbie/.test(w))).toEqual([]);
	});

	it('warns that a very viscous liquid is outside the checked range', () => {
		const c = defaultCase();
		c.fluids.preset = null;
		c.fluids.liquid.viscosityPaS = 1;
		// the large-bubble swarm drag no longer fails near the sparger (tests/solver/bubble-classes.test.ts): not named
		expect(derivedNumbers(c).warnings.filter((w) => /low-viscosity liquids/.test(w) && !/swarm drag/.test(w))).toHaveLength(1);
		c.fluids.liquid.viscosityPaS = 0.2;
		expect(derivedNumbers(c).warnings.filter((w) => /low-viscosity liquids/.test(w) && !/swarm drag/.test(w))).toHaveLength(1);
		c.fluids.liquid.viscosityPaS = 1.002e-3;
		expect(derivedNumbers(c).warnings.filter((w) => /low-viscosity/.test(w))).toEqual([]);
	});
});
