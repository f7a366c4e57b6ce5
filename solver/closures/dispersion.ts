/**
 * Turbulent dispersion: the force that drives gas down its own holdup gradient.
 *
 * Force per unit mixture volume on the gas (radial component):
 * - Lopez de Bertodano (1991), PhD thesis RPI (also Nucl. Eng. Des. 179 (1998) 65–74):
 *     F_TD = −C_TD ρ_l k_l ∂α/∂r,  C_TD typically 0.1–0.5 (from memory).
 * - Burns, Frank, Hamill & Shi (2004), 5th Int. Conf. Multiphase Flow, Yokohama (Favre-averaged drag):
 *     F_TD = −C_TD K (ν_t/σ_TD) (∂α/∂r / α − ∂α_l/∂r / α_l) = −C_TD K (ν_t/σ_TD) ∂α/∂r / (α (1 − α)),
 *     C_TD = 1, σ_TD = 0.9 (from memory), K the drag coefficient per unit volume.
 *
 * With drag balancing the force, the radial gas slip is v_r = F/K and the gas flux is
 * α v_g = α (1 − α) v_r (zero net radial volume flux), so both laws act as a holdup
 * diffusivity 𝒟 in the gas continuity equation, α v_g = −𝒟 ∂α/∂r:
 *   Burns:               𝒟 = C_TD ν_t / σ_TD
 *   Lopez de Bertodano:  𝒟 = (1 − α) C_TD ρ_l k_l / k,  k = K/α (drag per unit gas volume and slip)
 * Writing them as diffusivities lets the continuity equation take them implicitly.
 */

export type TurbulentDispersionModel = 'none' | 'lopez-de-bertodano' | 'burns';

export const BURNS_SIGMA_TD = 0.9;

export interface DispersionInput {
	model: TurbulentDispersionModel;
	coefficient: number;
	holdup: number;
	liquidDensityKgM3: number;
	/** liquid turbulent (eddy) kinematic viscosity, m²/s */
	eddyViscosityM2S: number;
	/** liquid turbulent kinetic energy, m²/s² */
	turbulentKineticEnergyM2S2: number;
	/** drag per unit gas volume and unit slip, K/α, kg m⁻³ s⁻¹ */
	dragPerGasVolume: number;
}

/** The holdup diffusivity 𝒟 (m²/s) equivalent to the dispersion force under drag balance. */
export function dispersionDiffusivityM2S(o: DispersionInput): number {
	switch (o.model) {
		case 'none':
			return 0;
		case 'burns':
			return (o.coefficient * o.eddyViscosityM2S) / BURNS_SIGMA_TD;
		case 'lopez-de-bertodano':
			if (!(o.dragPerGasVolume > 0)) return 0;
			return ((1 - o.holdup) * o.coefficient * o.liquidDensityKgM3 * o.turbulentKineticEnergyM2S2) / o.dragPerGasVolume;
	}
}

/** Radial dispersion force per unit mixture volume on the gas, N/m³ (positive = towards the wall). */
export function radialDispersionForce(o: DispersionInput & { holdupGradientPerM: number }): number {
	switch (o.model) {
		case 'none':
			return 0;
		case 'burns': {
			const a = Math.min(Math.max(o.holdup, 1e-12), 1 - 1e-12);
			// K/(α(1−α)) = k/(1−α): finite as α → 0
			return (-o.coefficient * o.dragPerGasVolume * (o.eddyViscosityM2S / BURNS_SIGMA_TD) * o.holdupGradientPerM) / (1 - a);
		}
		case 'lopez-de-bertodano':
			return -o.coefficient * o.liquidDensityKgM3 * o.turbulentKineticEnergyM2S2 * o.holdupGradientPerM;
	}
}
