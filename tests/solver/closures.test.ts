import { describe, expect, it } from 'vitest';
import { dragCoefficient, dragPerVolume, eotvosNumber, hadamardRybczynskiVelocity, stokesVelocity, terminalVelocity } from '../../solver/closures/drag.js';
import { hyperbolicityLimitHoldup, virtualMassCoefficient, zuberVirtualMassCoefficient } from '../../solver/closures/virtual-mass.js';
import { darcyFrictionFactor } from '../../solver/closures/friction.js';
import { swarmDragFactor } from '../../solver/closures/swarm.js';
import { closureCatalog } from '../../solver/closures/catalog.js';
import {
	bubbleClassModels,
	transitionCorrelations,
	largeBubbleSizings,
	largeBubbleDrags,
	bubbleInducedTurbulenceModels,
	bubbleSizings,
	convectionSchemes,
	dragLaws,
	liftModels,
	swarmCorrections,
	turbulentDispersionModels,
	virtualMassModels,
	wallFrictionModels,
	wallLubricationModels,
	transferSolutes,
	liquidDispersionModels,
	massTransferCoefficientModels
} from '../../solver/case.js';
import { graceVelocity, mendelsonVelocity } from '../../solver/correlations/terminal-velocity.js';
import { CLIFT_GRACE_WEBER_CONTAMINATED } from '../../solver/verification/problems.js';

// Reference property set of PHYSICS §0: water and air at 20 °C, 1 atm
const water = { liquidDensityKgM3: 998.2, gasDensityKgM3: 1.204, liquidViscosityPaS: 1.002e-3, surfaceTensionNM: 0.0727 };
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('single-bubble drag and terminal velocity (PHYSICS §15)', () => {
	it('gives the Schiller–Naumann terminal velocity of a 1 mm and a 3 mm rigid bubble in water (#1, #2)', () => {
		// #1, #2 [D]: root of (4/3) g d Δρ = C_D ρ_l U² with C_D = 24/Re (1 + 0.15 Re^0.687) (Schiller & Naumann
		// 1933, formula from memory, PHYSICS §1.3)
		const u1 = terminalVelocity({ law: 'schiller-naumann', diameterM: 1e-3, ...water });
		expect(rel(u1, 0.1122)).toBeLessThan(0.005);
		const re1 = (998.2 * u1 * 1e-3) / 1.002e-3;
		expect(rel(re1, 111.8)).toBeLessThan(0.005);
		expect(rel(dragCoefficient({ law: 'schiller-naumann', reynolds: re1, eotvos: 0, holdup: 0 }), 1.037)).toBeLessThan(0.005);
		const u3 = terminalVelocity({ law: 'schiller-naumann', diameterM: 3e-3, ...water });
		expect(rel(u3, 0.2919)).toBeLessThan(0.005);
		expect(rel((998.2 * u3 * 3e-3) / 1.002e-3, 872)).toBeLessThan(0.005);
	});

	it('gives the Stokes and Hadamard–Rybczynski velocity of a 0.1 mm bubble in glycerol and in water (#3, #4)', () => {
		// #3 [D]: 1259.8·9.81·1e-8/(18·1.412) with glycerol ρ 1261, μ 1.412 (properties from memory); Stokes (1851) and
		// Hadamard–Rybczynski (1911) laws from memory (PHYSICS §1.1, §1.2)
		const glycerol = { diameterM: 1e-4, liquidDensityKgM3: 1261, gasDensityKgM3: 1.204, liquidViscosityPaS: 1.412 };
		expect(rel(stokesVelocity(glycerol), 4.863e-6)).toBeLessThan(1e-3);
		expect(rel(hadamardRybczynskiVelocity(glycerol), 7.294e-6)).toBeLessThan(1e-3);
		// the root solve with the Stokes law must reproduce the closed form
		expect(rel(terminalVelocity({ law: 'stokes', surfaceTensionNM: 0.0634, ...glycerol }), stokesVelocity(glycerol))).toBeLessThan(1e-9);
		// #4 [D]
		expect(rel(stokesVelocity({ diameterM: 1e-4, ...water }), 5.42e-3)).toBeLessThan(0.005);
	});

	it('gives the Tomiyama (1998) terminal velocities for the three purity levels (#5, #6)', () => {
		// #5 [D]: d = 1 mm, Eo = 0.1345
		expect(rel(eotvosNumber({ diameterM: 1e-3, ...water }), 0.1345)).toBeLessThan(0.002);
		expect(rel(terminalVelocity({ law: 'tomiyama-pure', diameterM: 1e-3, ...water }), 0.2711)).toBeLessThan(0.01);
		expect(rel(terminalVelocity({ law: 'tomiyama-slightly-contaminated', diameterM: 1e-3, ...water }), 0.1808)).toBeLessThan(0.01);
		expect(rel(terminalVelocity({ law: 'tomiyama-contaminated', diameterM: 1e-3, ...water }), 0.1122)).toBeLessThan(0.01);
		// #6 [D]: d = 3 mm, the Eo branch controls all three: C_D = 8/3·1.2108/5.2108
		for (const law of ['tomiyama-pure', 'tomiyama-slightly-contaminated', 'tomiyama-contaminated'] as const) {
			const u = terminalVelocity({ law, diameterM: 3e-3, ...water });
			expect(rel(u, 0.2515)).toBeLessThan(0.01);
			const re = (998.2 * u * 3e-3) / 1.002e-3;
			expect(rel(dragCoefficient({ law, reynolds: re, eotvos: 1.2108, holdup: 0 }), 0.6196)).toBeLessThan(0.01);
		}
	});

	it('gives the Ishii–Zuber distorted-regime drag and rise velocity (#7)', () => {
		// #7 [D]: C_D = (2/3)√Eo·E(α)², U_∞ = √2 (σgΔρ/ρ_l²)^(1/4) = 0.2311 m/s (Ishii & Zuber 1979, formulas from memory)
		const re = (998.2 * 0.23 * 3e-3) / 1.002e-3;
		expect(rel(dragCoefficient({ law: 'ishii-zuber', reynolds: re, eotvos: 1.2108, holdup: 0 }), 0.7336)).toBeLessThan(0.005);
		expect(rel(dragCoefficient({ law: 'ishii-zuber', reynolds: re, eotvos: 1.2108, holdup: 0.1 }), 0.7794)).toBeLessThan(0.005);
		expect(rel(terminalVelocity({ law: 'ishii-zuber', diameterM: 3e-3, ...water }), 0.2311)).toBeLessThan(0.005);
		expect(rel(terminalVelocity({ law: 'ishii-zuber', diameterM: 5e-3, ...water }), 0.2311)).toBeLessThan(0.005);
	});

	it('reproduces the Mendelson and Grace comparison velocities (#8, #9)', () => {
		// #8 [D] Mendelson (1967) wave analogy (formula from memory)
		expect(rel(mendelsonVelocity({ diameterM: 3e-3, ...water }), 0.2515)).toBeLessThan(0.005);
		expect(rel(mendelsonVelocity({ diameterM: 1e-3, ...water }), 0.388)).toBeLessThan(0.005);
		expect(rel(mendelsonVelocity({ diameterM: 5e-3, ...water }), 0.2316)).toBeLessThan(0.005);
		// #9 [D] Grace, Wairegi & Nguyen (1976), constants from memory
		expect(rel(graceVelocity({ diameterM: 3e-3, ...water }), 0.2528)).toBeLessThan(0.01);
	});

	it('agrees with the Clift, Grace & Weber (1978) contaminated-water curve for the Tomiyama contaminated law', () => {
		// Clift, Grace & Weber (1978), Bubbles, Drops and Particles, Fig. 7.3, readings from memory (PHYSICS §10):
		// the readings themselves are uncertain by about ±15 %, so that is the stated tolerance; ranges use their midpoint
		for (const [d, u] of CLIFT_GRACE_WEBER_CONTAMINATED) {
			const ut = terminalVelocity({ law: 'tomiyama-contaminated', diameterM: d, ...water });
			expect(rel(ut, u)).toBeLessThan(0.15);
		}
	});

	it('gives the drag coefficient per volume of a bubble swarm (#33)', () => {
		// #33 [D]: 0.75·0.1·998.2·0.62·0.25/0.003
		expect(rel(dragPerVolume({ holdup: 0.1, liquidDensityKgM3: 998.2, dragCoefficient: 0.62, slipMS: 0.25, diameterM: 3e-3 }), 3868)).toBeLessThan(2e-4);
	});

	it('keeps the Schiller–Naumann coefficient at 0.44 above Re = 1000 and Stokes at 24/Re', () => {
		// Schiller & Naumann (1933) Newton-range constant; Stokes (1851) 24/Re (both from memory)
		expect(dragCoefficient({ law: 'schiller-naumann', reynolds: 5000, eotvos: 0, holdup: 0 })).toBeCloseTo(0.44, 12);
		expect(dragCoefficient({ law: 'stokes', reynolds: 0.01, eotvos: 0, holdup: 0 })).toBeCloseTo(2400, 9);
	});
});

describe('virtual mass, swarm and friction closures', () => {
	it('gives the Zuber (1964) virtual-mass coefficient at α = 0.1 (#12)', () => {
		// #12 [D]: 0.5·1.2/0.9 (Zuber 1964, formula from memory)
		expect(zuberVirtualMassCoefficient(0.1)).toBeCloseTo(0.5 * 1.2 / 0.9, 14);
		expect(virtualMassCoefficient({ model: 'zuber', holdup: 0.1 })).toBeCloseTo(0.66667, 4);
		expect(virtualMassCoefficient({ model: 'constant', holdup: 0.3, constant: 0.5 })).toBe(0.5);
		expect(virtualMassCoefficient({ model: 'none', holdup: 0.3 })).toBe(0);
	});

	it('finds the hyperbolicity limit α = 1 − 1/√2 for C_VM = 0.5, C_p = 0.25 (#13)', () => {
		// #13 [D], PHYSICS §3.3, ρ_g → 0
		expect(Math.abs(hyperbolicityLimitHoldup({ virtualMassCoefficient: 0.5, interfacialPressureCoefficient: 0.25 }) - (1 - Math.SQRT1_2))).toBeLessThan(1e-4);
	});

	it('turns the single-bubble slip into the Richardson–Zaki and Wallis swarm slip for a Re-independent C_D', () => {
		// Wallis (1969) n = 2 (from memory): slip U_t(1 − α), so h = (1 − α)^−2; derived from the force balance C_D h u² = C_D U_t²
		expect(swarmDragFactor({ model: 'wallis', holdup: 0.2, terminalReynolds: 1000 })).toBeCloseTo(1 / 0.64, 12);
		// Richardson & Zaki (1954), Re_t > 500: n = 2.39 (from memory)
		expect(swarmDragFactor({ model: 'richardson-zaki', holdup: 0.2, terminalReynolds: 1000 })).toBeCloseTo(Math.pow(0.8, -2 * 1.39), 12);
		expect(swarmDragFactor({ model: 'none', holdup: 0.2, terminalReynolds: 1000 })).toBe(1);
	});

	it('gives the Blasius and laminar friction factors', () => {
		// Blasius (1913): 0.316·1e4^-0.25 = 0.0316; Hagen–Poiseuille 64/Re (both common practice)
		expect(darcyFrictionFactor(1e4)).toBeCloseTo(0.0316, 10);
		expect(darcyFrictionFactor(1000)).toBeCloseTo(0.064, 12);
	});
});

describe('closure catalogue', () => {
	it('describes every option of every closure choice with a label, a line and a source', () => {
		const pairs: [Record<string, unknown>, readonly string[]][] = [
			[closureCatalog['closures.drag'], dragLaws],
			[closureCatalog['closures.swarm'], swarmCorrections],
			[closureCatalog['closures.virtualMass'], virtualMassModels],
			[closureCatalog['closures.lift'], liftModels],
			[closureCatalog['closures.wallLubrication'], wallLubricationModels],
			[closureCatalog['closures.turbulentDispersion'], turbulentDispersionModels],
			[closureCatalog['closures.bubbleInducedTurbulence'], bubbleInducedTurbulenceModels],
			[closureCatalog['closures.wallFriction'], wallFrictionModels],
			[closureCatalog['numerics.scheme'], convectionSchemes],
			[closureCatalog['bubbles.sizing'], bubbleSizings],
			[closureCatalog['bubbles.classes'], bubbleClassModels],
			[closureCatalog['bubbles.transition'], transitionCorrelations],
			[closureCatalog['bubbles.largeSizing'], largeBubbleSizings],
			[closureCatalog['bubbles.largeDrag'], largeBubbleDrags],
			[closureCatalog['transfer.solute'], transferSolutes],
			[closureCatalog['transfer.dispersion'], liquidDispersionModels],
			[closureCatalog['transfer.massTransferCoefficient'], massTransferCoefficientModels]
		];
		// every catalogued field is covered above
		expect(pairs.length).toBe(Object.keys(closureCatalog).length);
		for (const [cat, options] of pairs) {
			expect(Object.keys(cat).sort()).toEqual([...options].sort());
			for (const o of options) {
				const e = cat[o] as { label: string; models: string; source: string };
				expect(e.label.length).toBeGreaterThan(0);
				expect(e.models.length).toBeGreaterThan(10);
				expect(e.source.length).toBeGreaterThan(0);
			}
		}
	});
});
