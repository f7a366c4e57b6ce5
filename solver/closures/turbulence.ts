/**
 * Liquid turbulence for the cross-section model: shear-induced mixing length, bubble-induced
 * eddy viscosity, a turbulent kinetic energy estimate and the log-law wall function.
 *
 * Effective viscosity of the liquid: μ_eff = μ_l + μ_t,SI + μ_t,BI.
 * - Shear-induced, Prandtl mixing length with Nikuradse's pipe distribution (as given in
 *   Schlichting, Boundary-Layer Theory; from memory):
 *     μ_t,SI = ρ_l ℓ² |∂u_l/∂r|,  ℓ/R = 0.14 − 0.08 (1 − y/R)² − 0.06 (1 − y/R)⁴, y = R − r.
 *   ℓ/R = 0.14 on the axis and ℓ ≈ 0.4 y at the wall.
 * - Bubble-induced, Sato & Sekoguchi (1975), Int. J. Multiphase Flow 2, 79–95:
 *     μ_t,BI = C_μb ρ_l α d |u_r|,  C_μb = 0.6 (from memory, PHYSICS §7).
 *   Example: α = 0.1, d = 3 mm, u_r = 0.25 m/s → 0.0449 Pa·s.
 * - Wall: the standard log-law wall function, u/u_τ = ln(E y⁺)/κ, κ = 0.41, E = 9.793 (common
 *   practice), switched to the viscous sublayer u⁺ = y⁺ below the intersection y⁺ ≈ 11.5.
 */

export const KARMAN_KAPPA = 0.41;
export const LOG_LAW_E = 9.793;
export const SATO_C_MUB = 0.6;
/** C_μ of the k–ε family, used to turn an eddy viscosity and a shear rate into k (common practice). */
export const C_MU = 0.09;

/** Nikuradse mixing length in a pipe or column of radius R, m. */
export function nikuradseMixingLengthM(o: { radiusM: number; wallDistanceM: number }): number {
	const s = 1 - Math.min(Math.max(o.wallDistanceM / o.radiusM, 0), 1);
	const s2 = s * s;
	return o.radiusM * (0.14 - 0.08 * s2 - 0.06 * s2 * s2);
}

/** Shear-induced eddy viscosity ρ ℓ² |du/dr|, Pa·s. */
export function mixingLengthViscosityPaS(o: { densityKgM3: number; mixingLengthM: number; shearRateS: number }): number {
	return o.densityKgM3 * o.mixingLengthM * o.mixingLengthM * Math.abs(o.shearRateS);
}

/** Sato & Sekoguchi (1975) bubble-induced eddy viscosity, Pa·s. */
export function satoViscosityPaS(o: { liquidDensityKgM3: number; holdup: number; diameterM: number; slipVelocityMS: number; coefficient?: number }): number {
	return (o.coefficient ?? SATO_C_MUB) * o.liquidDensityKgM3 * Math.max(o.holdup, 0) * o.diameterM * Math.abs(o.slipVelocityMS);
}

/**
 * Turbulent kinetic energy of the liquid, m²/s²: the shear part from local equilibrium
 * (−u'v' = ν_t |du/dr| = √C_μ k), the bubble part as the pseudo-turbulence of potential flow
 * round the bubbles, ½ C_VM α u_r² with C_VM = 1/2 (from memory). Used only by the
 * Lopez de Bertodano dispersion law.
 */
export function turbulentKineticEnergyM2S2(o: { shearEddyViscosityM2S: number; shearRateS: number; holdup: number; slipVelocityMS: number }): number {
	return (o.shearEddyViscosityM2S * Math.abs(o.shearRateS)) / Math.sqrt(C_MU) + 0.25 * Math.max(o.holdup, 0) * o.slipVelocityMS * o.slipVelocityMS;
}

/** y⁺ where the viscous sublayer u⁺ = y⁺ meets the log law u⁺ = ln(E y⁺)/κ. */
export const SUBLAYER_Y_PLUS = (() => {
	let y = 11;
	for (let i = 0; i < 60; i++) y = Math.log(LOG_LAW_E * y) / KARMAN_KAPPA;
	return y;
})();

export interface WallFunctionResult {
	/** friction velocity, m/s */
	frictionVelocityMS: number;
	yPlus: number;
	/** wall shear stress per unit velocity of the first cell, τ_w = coefficient · u, Pa·s/m */
	coefficientPaSM: number;
}

/**
 * Log-law wall function: from the speed |u| of the first cell centre at distance y from the wall,
 * the friction velocity u_τ solving |u| = u_τ ln(E y u_τ/ν)/κ (Newton), and the linear coefficient
 * λ with τ_w = λ u. Below the sublayer intersection λ = μ/y (no slip resolved linearly).
 */
export function logLawWallFunction(o: { speedMS: number; wallDistanceM: number; densityKgM3: number; viscosityPaS: number }): WallFunctionResult {
	const nu = o.viscosityPaS / o.densityKgM3;
	const y = o.wallDistanceM;
	const u = Math.abs(o.speedMS);
	const laminar = o.viscosityPaS / y;
	const uTauLam = Math.sqrt(nu * u / y);
	if ((uTauLam * y) / nu <= SUBLAYER_Y_PLUS) {
		return { frictionVelocityMS: uTauLam, yPlus: (uTauLam * y) / nu, coefficientPaSM: laminar };
	}
	// Newton on g(t) = t ln(E y t/ν) − κ u, g' = ln(E y t/ν) + 1; start from the sublayer guess,
	// which lies above the root when y⁺ exceeds the intersection
	let t = uTauLam;
	for (let i = 0; i < 50; i++) {
		const l = Math.log((LOG_LAW_E * y * t) / nu);
		const dt = (t * l - KARMAN_KAPPA * u) / (l + 1);
		t -= dt;
		if (Math.abs(dt) <= 1e-14 * t) break;
	}
	const yPlus = (t * y) / nu;
	return { frictionVelocityMS: t, yPlus, coefficientPaSM: (o.densityKgM3 * t * t) / u };
}
