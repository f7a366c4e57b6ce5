import { describe, expect, it } from 'vitest';
import { eotvosNumber } from '../../solver/closures/drag.js';
import { horizontalDiameterM, radialLiftForce, tomiyamaLiftCoefficient, tomiyamaLiftPolynomial } from '../../solver/closures/lift.js';
import { ANTAL_CW1, ANTAL_CW2, FRANK_CWC, hosokawaWallCoefficient, tomiyamaWallCoefficient, wallLubricationForce, type WallLubricationModel } from '../../solver/closures/wall-lubrication.js';
import { BURNS_SIGMA_TD, dispersionDiffusivityM2S, radialDispersionForce } from '../../solver/closures/dispersion.js';
import { liftSignChangeDiameterM } from '../../solver/verification/problems.js';
import { KARMAN_KAPPA, LOG_LAW_E, SUBLAYER_Y_PLUS, logLawWallFunction, nikuradseMixingLengthM, satoViscosityPaS } from '../../solver/closures/turbulence.js';

// Reference property set of PHYSICS §0: water and air at 20 °C, 1 atm
const water = { liquidDensityKgM3: 998.2, gasDensityKgM3: 1.204, surfaceTensionNM: 0.0727 };
const lift = (diameterM: number, reynolds = 1000) => tomiyamaLiftCoefficient({ diameterM, reynolds, ...water });

describe('Tomiyama et al. (2002) lift coefficient with the Wellek et al. (1966) bubble width', () => {
	it('changes sign at a volume-equivalent diameter of 5.8 mm for air–water (PHYSICS §15 #10)', () => {
		// #10 [D]: f(Eo_d) = 0 at Eo_d = 6.061, d_H = 6.71 mm, d = 5.84 mm; assert 5.8 ± 0.1 mm (Tomiyama coefficients
		// other than 0.00105 and the Wellek constants 0.163/0.757 from memory, PHYSICS §4)
		expect(lift(5e-3)).toBeGreaterThan(0);
		expect(lift(7e-3)).toBeLessThan(0);
		const lo = liftSignChangeDiameterM();
		expect(Math.abs(lo - 5.8e-3)).toBeLessThan(0.1e-3);
		expect(Math.abs(lo - 5.84e-3)).toBeLessThan(0.01e-3);
		const dH = horizontalDiameterM({ diameterM: lo, eotvos: eotvosNumber({ diameterM: lo, ...water }) });
		expect(Math.abs(dH - 6.71e-3)).toBeLessThan(0.01e-3);
		expect(Math.abs(eotvosNumber({ diameterM: dH, ...water }) - 6.061)).toBeLessThan(0.005);
	});

	it('gives the check values of PHYSICS §15 #11 at 5 mm, 7 mm and on the saturated branch', () => {
		// #11 [D]: C_L(5 mm) = 0.183, C_L(7 mm) = −0.247, f(10.7) = −0.278, C_L(Eo_d > 10.7) = −0.27, abs 1e-3 (from memory)
		expect(Math.abs(lift(5e-3) - 0.183)).toBeLessThan(1e-3);
		expect(Math.abs(lift(7e-3) - -0.247)).toBeLessThan(1e-3);
		expect(Math.abs(tomiyamaLiftPolynomial(10.7) - -0.278)).toBeLessThan(1e-3);
		expect(lift(10e-3)).toBe(-0.27);
		// PHYSICS §4 [D]: Eo_d = 4 at d = 4.88 mm and Eo_d = 10.7 at d = 7.41 mm
		const eoH = (d: number) => eotvosNumber({ diameterM: horizontalDiameterM({ diameterM: d, eotvos: eotvosNumber({ diameterM: d, ...water }) }), ...water });
		expect(Math.abs(eoH(4.88e-3) - 4)).toBeLessThan(0.02);
		expect(Math.abs(eoH(7.41e-3) - 10.7)).toBeLessThan(0.05);
	});

	it('caps small bubbles at 0.288 tanh(0.121 Re), below the polynomial', () => {
		// Tomiyama et al. (2002): the small-bubble branch (from memory); at d = 3 mm f(Eo_d) ≈ 0.38 exceeds the 0.288 plateau
		expect(lift(3e-3, 700)).toBeCloseTo(0.288 * Math.tanh(0.121 * 700), 12);
		expect(lift(3e-3, 5)).toBeCloseTo(0.288 * Math.tanh(0.605), 12);
	});

	it('pushes a bubble with positive C_L towards the wall where the up-flow slows towards the wall', () => {
		// PHYSICS §4 [D]: radial component −C_L α ρ_l u_r du_l/dr; 0.3·0.1·998.2·0.25·5 = 37.43 N/m³
		const f = radialLiftForce({ coefficient: 0.3, holdup: 0.1, liquidDensityKgM3: 998.2, slipVelocityMS: 0.25, liquidShearS: -5 });
		expect(f).toBeCloseTo(37.4325, 10);
		expect(radialLiftForce({ coefficient: -0.27, holdup: 0.1, liquidDensityKgM3: 998.2, slipVelocityMS: 0.25, liquidShearS: -5 })).toBeLessThan(0);
	});
});

describe('wall lubrication laws', () => {
	const d = 4e-3;
	const base = { holdup: 0.1, liquidDensityKgM3: 998.2, slipVelocityMS: 0.25, diameterM: d, columnDiameterM: 0.2, reynolds: 1000, eotvos: eotvosNumber({ diameterM: d, ...water }) };
	const force = (model: WallLubricationModel, y: number) => wallLubricationForce({ model, wallDistanceM: y, ...base });

	it('pushes bubbles away from the wall near it, for every law', () => {
		for (const model of ['antal', 'tomiyama', 'hosokawa', 'frank'] as const) {
			expect(force(model, 0.5 * d)).toBeGreaterThan(0);
			expect(force(model, 0.5 * d)).toBeGreaterThan(force(model, 2 * d));
		}
		expect(force('none', 0.5 * d)).toBe(0);
	});

	it('Antal: vanishes beyond y = (C_W2/−C_W1) d = 5 d and has its published value inside', () => {
		// Antal et al. (1991) with the −0.01/0.05 pair (from memory): zero for y ≥ 5 d
		expect(ANTAL_CW2 / -ANTAL_CW1).toBe(5);
		expect(force('antal', 5 * d)).toBe(0);
		expect(force('antal', 5.01 * d)).toBe(0);
		expect(force('antal', 4.99 * d)).toBeGreaterThan(0);
		// at y = d: (α ρ u_r²/d)(−0.01 + 0.05) = 0.1·998.2·0.0625/0.004·0.04 = 62.3875 N/m³ [D]
		expect(force('antal', d)).toBeCloseTo(62.3875, 9);
	});

	it('Frank: vanishes beyond y = C_WC d = 10 d', () => {
		// Frank et al. (2008), C_WC = 10 (from memory)
		expect(force('frank', FRANK_CWC * d)).toBe(0);
		expect(force('frank', 12 * d)).toBe(0);
		expect(force('frank', 9.9 * d)).toBeGreaterThan(0);
	});

	it('Tomiyama: the two walls of the pipe balance on the axis, and C_W(Eo) is continuous', () => {
		// Tomiyama (1998), pipe form [1/y² − 1/(D − y)²] (from memory): zero at y = D/2
		expect(force('tomiyama', 0.1)).toBe(0);
		expect(force('tomiyama', 0.099)).toBeGreaterThan(0);
		// PHYSICS §5 [D]: 0.4705 at Eo = 1; 0.01127 vs 0.01125 at Eo = 5; 0.1790 at Eo = 33
		expect(tomiyamaWallCoefficient(1)).toBeCloseTo(0.4705, 4);
		expect(Math.abs(tomiyamaWallCoefficient(5) - (0.00599 * 5.000001 - 0.0187))).toBeLessThan(3e-5);
		expect(tomiyamaWallCoefficient(33)).toBeCloseTo(0.179, 4);
	});

	it('Hosokawa: decays as 1/y², so it is negligible a few diameters out', () => {
		// Hosokawa et al. (2002), from memory: F ∝ C_W d/(2 y²)
		expect(force('hosokawa', 2 * d) / force('hosokawa', d)).toBeCloseTo(0.25, 12);
		expect(force('hosokawa', 10 * d) / force('hosokawa', 0.5 * d)).toBeCloseTo(0.0025, 12);
		// C_W = max(7/Re^1.9, 0.0217 Eo): the Eo branch for a 4 mm bubble at Re = 1000
		expect(hosokawaWallCoefficient({ reynolds: 1000, eotvos: 2 })).toBeCloseTo(0.0434, 12);
		expect(hosokawaWallCoefficient({ reynolds: 1, eotvos: 2 })).toBe(7);
	});
});

describe('liquid turbulence closures', () => {
	it('gives the Sato bubble-induced viscosity of PHYSICS §15 #34', () => {
		// #34 [D]: 0.6·998.2·0.1·0.003·0.25 = 0.0449 Pa·s (Sato & Sekoguchi 1975, C_μb = 0.6 from memory)
		expect(satoViscosityPaS({ liquidDensityKgM3: 998.2, holdup: 0.1, diameterM: 0.003, slipVelocityMS: 0.25 })).toBeCloseTo(0.044919, 6);
	});

	it('gives Nikuradse’s mixing length: 0.14 R on the axis and 0.4 y at the wall', () => {
		// Nikuradse via Schlichting (from memory): ℓ/R = 0.14 − 0.08(1 − y/R)² − 0.06(1 − y/R)⁴
		const R = 0.1;
		expect(nikuradseMixingLengthM({ radiusM: R, wallDistanceM: R })).toBeCloseTo(0.014, 15);
		expect(nikuradseMixingLengthM({ radiusM: R, wallDistanceM: 0 })).toBeCloseTo(0, 15);
		const y = 1e-6;
		expect(nikuradseMixingLengthM({ radiusM: R, wallDistanceM: y }) / y).toBeCloseTo(0.4, 4);
	});

	it('recovers the friction velocity of a point on the log law and joins the viscous sublayer continuously', () => {
		// log law u⁺ = ln(E y⁺)/κ (common practice, κ = 0.41, E = 9.793)
		const nu = 1.002e-3 / 998.2;
		const uTau = 0.03;
		const y = 2e-3;
		const u = (uTau * Math.log((LOG_LAW_E * y * uTau) / nu)) / KARMAN_KAPPA;
		const wf = logLawWallFunction({ speedMS: u, wallDistanceM: y, densityKgM3: 998.2, viscosityPaS: 1.002e-3 });
		expect(Math.abs(wf.frictionVelocityMS / uTau - 1)).toBeLessThan(1e-12);
		expect(wf.coefficientPaSM * u).toBeCloseTo(998.2 * uTau * uTau, 10);
		// the sublayer meets the log law where y⁺ = ln(E y⁺)/κ, about 11.5
		expect(SUBLAYER_Y_PLUS).toBeCloseTo(Math.log(LOG_LAW_E * SUBLAYER_Y_PLUS) / KARMAN_KAPPA, 12);
		expect(SUBLAYER_Y_PLUS).toBeGreaterThan(11);
		expect(SUBLAYER_Y_PLUS).toBeLessThan(12);
		const slow = logLawWallFunction({ speedMS: 1e-4, wallDistanceM: y, densityKgM3: 998.2, viscosityPaS: 1.002e-3 });
		expect(slow.coefficientPaSM).toBeCloseTo(1.002e-3 / y, 15);
	});
});

describe('turbulent dispersion', () => {
	it('Burns: the force under drag balance equals holdup diffusion with 𝒟 = C_TD ν_t/σ_TD', () => {
		// Burns et al. (2004), σ_TD = 0.9 (from memory); radial gas flux α(1 − α) F/K = −𝒟 ∂α/∂r [D]
		const o = { model: 'burns' as const, coefficient: 1, holdup: 0.2, liquidDensityKgM3: 998.2, eddyViscosityM2S: 1e-3, turbulentKineticEnergyM2S2: 0.01, dragPerGasVolume: 3e4 };
		expect(BURNS_SIGMA_TD).toBe(0.9);
		const dA = -2;
		const f = radialDispersionForce({ ...o, holdupGradientPerM: dA });
		expect(f).toBeGreaterThan(0);
		const flux = (o.holdup * (1 - o.holdup) * f) / (o.holdup * o.dragPerGasVolume);
		expect(flux).toBeCloseTo(-dispersionDiffusivityM2S(o) * dA, 12);
		expect(dispersionDiffusivityM2S(o)).toBeCloseTo(1e-3 / 0.9, 15);
	});

	it('Lopez de Bertodano: the force −C_TD ρ_l k ∂α/∂r gives the same flux as its diffusivity', () => {
		const o = { model: 'lopez-de-bertodano' as const, coefficient: 0.3, holdup: 0.15, liquidDensityKgM3: 998.2, eddyViscosityM2S: 1e-3, turbulentKineticEnergyM2S2: 0.02, dragPerGasVolume: 2.5e4 };
		const dA = 3;
		const f = radialDispersionForce({ ...o, holdupGradientPerM: dA });
		expect(f).toBeCloseTo(-0.3 * 998.2 * 0.02 * 3, 12);
		const flux = (o.holdup * (1 - o.holdup) * f) / (o.holdup * o.dragPerGasVolume);
		expect(flux).toBeCloseTo(-dispersionDiffusivityM2S(o) * dA, 14);
	});
});
