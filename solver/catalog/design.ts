/**
 * The catalogue of the numbers the solver reports: for every design number of `results().design` and
 * every residual id, a label, the formula it is computed with, its SI unit and its source. The run,
 * comparison and case pages show these on hover or focus; tests/solver/catalog.test.ts runs the models
 * and fails when the solver emits an id without an entry here (or with another unit), so the two cannot
 * drift apart. Symbols: ε holdup, α local gas fraction, z height above the sparger, H the aerated height,
 * U_G the superficial gas velocity, u_r the slip, d the bubble diameter, ⟨·⟩ the section average.
 */

export interface QuantityEntry {
	/** short name */
	label: string;
	/** how the solver computes it, in words and symbols */
	formula: string;
	/** SI unit as the solver writes it (`1` dimensionless) */
	unit: string;
	/** published source, or "definition" / "common practice" */
	source: string;
}

/** The per-class numbers of the size classes (`holdupSize1`, `slipSize1MS`, `diameterSize1M`, …), classes 1 … n. */
function sizeClassEntries(n: number): Record<string, QuantityEntry> {
	const out: Record<string, QuantityEntry> = {};
	for (let k = 1; k <= n; k++) {
		out[`holdupSize${k}`] = { label: `Holdup of size class ${k}`, formula: `ε_${k} = (volume of class-${k} bubbles below the level)/H`, unit: '1', source: 'definition' };
		out[`slipSize${k}MS`] = { label: `Slip of size class ${k}`, formula: `volume-weighted mean of u_${k} − u_l below the level`, unit: 'm/s', source: 'definition' };
		out[`diameterSize${k}M`] = {
			label: `Diameter of size class ${k}`,
			formula: `d_${k} = d_min (d_max/d_min)^((${k} − 1)/(n − 1)), the pivot of the fixed-pivot class method`,
			unit: 'm',
			source: 'Kumar & Ramkrishna (1996), Chem. Eng. Sci. 51, 1311'
		};
	}
	return out;
}

/** Design numbers of both models, by their stable id. */
export const designCatalog: Record<string, QuantityEntry> = {
	// height profile
	overallHoldup: {
		label: 'Overall gas holdup',
		formula: 'ε = 1 − (liquid volume below the level)/H, the gas fraction of the aerated region',
		unit: '1',
		source: 'definition'
	},
	aeratedHeightM: {
		label: 'Aerated height',
		formula: 'H: the height where α crosses 0.5, searched from the top, interpolated linearly between cell centres',
		unit: 'm',
		source: 'definition'
	},
	levelSwellM: { label: 'Level swell', formula: 'H − clear-liquid level', unit: 'm', source: 'definition' },
	spargerPressurePa: {
		label: 'Pressure at the sparger',
		formula: 'pressure of the first cell extrapolated to z = 0 by the mixture head of half a cell',
		unit: 'Pa',
		source: 'definition'
	},
	gasResidenceTimeS: { label: 'Gas residence time', formula: 'gas mass below the level / gas mass flux fed', unit: 's', source: 'definition' },
	meanSlipMS: { label: 'Mean slip velocity', formula: 'gas-volume-weighted mean of u_g − u_l below the level', unit: 'm/s', source: 'definition' },
	interfacialAreaPerM: {
		label: 'Interfacial area',
		formula: 'a = 6ε/d (one class); a = Σ 6ε_k/d_k (small + large bubbles)',
		unit: '1/m',
		source: 'spheres of the class diameters (common practice)'
	},
	kLaPerS: {
		label: 'kLa per aerated volume',
		formula: 'k_L a with k_L = 2 √(D_L/(π t_c)), contact time t_c = d/u_r, summed over the classes, per unit aerated (gas + liquid) volume: 1 − ε times the same per liquid volume',
		unit: '1/s',
		source: 'Higbie (1935), Trans. AIChE 31, 365'
	},
	sauterDiameterM: {
		label: 'Sauter mean diameter',
		formula: 'd₃₂ = Σ ε_k / Σ(ε_k/d_k) over the classes below the level (the bubble diameter with one class)',
		unit: 'm',
		source: 'definition'
	},
	regime: {
		label: 'Flow regime',
		formula: '0 homogeneous, 1 heterogeneous: U_G against the two-class transition velocity, or against the common-practice band 0.03–0.05 m/s with one class',
		unit: '1',
		source: 'Reilly et al. (1994) transition; band: common practice'
	},
	liquidMassErrorRel: {
		label: 'Liquid inventory error',
		formula: '|V_l(t) − V_l(0) − ∫(liquid in − out) dt| / V_l(0), liquid volume per cross-section',
		unit: '1',
		source: 'definition (conservation check)'
	},
	akitaYoshidaHoldup: {
		label: 'Akita–Yoshida holdup',
		formula: 'ε/(1 − ε)⁴ = 0.2 Bo^(1/8) Ga^(1/12) Fr with Bo = gD²ρ_l/σ, Ga = gD³/ν_l², Fr = U_G/√(gD), D at most 0.6 m',
		unit: '1',
		source: 'Akita & Yoshida (1973), Ind. Eng. Chem. Process Des. Dev. 12, 76'
	},
	hughmarkHoldup: {
		label: 'Hughmark holdup',
		formula: 'ε = 1/[2 + (0.35/U_G)(ρ_l σ/72)^(1/3)], ρ_l in g/cm³, σ in mN/m, U_G in m/s',
		unit: '1',
		source: 'Hughmark (1967), Ind. Eng. Chem. Process Des. Dev. 6, 218'
	},
	hikitaHoldup: {
		label: 'Hikita holdup',
		formula: 'ε = 0.672 (U_G μ_l/σ)^0.578 (μ_l⁴g/(ρ_l σ³))^−0.131 (ρ_g/ρ_l)^0.062 (μ_g/μ_l)^0.107',
		unit: '1',
		source: 'Hikita, Asai, Tanigawa, Segawa & Kitao (1980), Chem. Eng. J. 20, 59'
	},
	driftFluxHoldup: {
		label: 'Drift-flux holdup',
		formula: 'ε = U_G/(C₀ (U_G + U_L) + V_gj), C₀ = 1.2, V_gj = 1.53 (σ g Δρ/ρ_l²)^(1/4)',
		unit: '1',
		source: 'Zuber & Findlay (1965), J. Heat Transfer 87, 453; V_gj after Harmathy (1960)'
	},
	holdupSmall: { label: 'Small-bubble holdup', formula: 'ε_small = (small-bubble volume below the level)/H', unit: '1', source: 'definition' },
	holdupLarge: { label: 'Large-bubble holdup', formula: 'ε_large = (large-bubble volume below the level)/H', unit: '1', source: 'definition' },
	slipSmallMS: { label: 'Small-bubble slip', formula: 'volume-weighted mean of u_small − u_l below the level', unit: 'm/s', source: 'definition' },
	slipLargeMS: { label: 'Large-bubble slip', formula: 'volume-weighted mean of u_large − u_l below the level', unit: 'm/s', source: 'definition' },
	diameterSmallM: {
		label: 'Small-bubble diameter',
		formula: 'the case’s bubble diameter, or d₃₂ = 26 D Bo^−0.5 Ga^−0.12 Fr^−0.12 when sized by Akita–Yoshida',
		unit: 'm',
		source: 'entered, or Akita & Yoshida (1974), Ind. Eng. Chem. Process Des. Dev. 13, 84'
	},
	diameterLargeM: {
		label: 'Large-bubble diameter',
		formula: 'd_b = 0.069 (U_G − U_trans)^0.376 m (U in m/s), or entered',
		unit: 'm',
		source: 'Krishna & Ellenberger (1996), AIChE J. 42, 2627'
	},
	transitionVelocityMS: {
		label: 'Transition gas velocity',
		formula: 'U_trans = ε_trans (1 − ε_trans) U_sb, U_sb = (1/2.84) ρ_g^−0.04 σ^0.12 (SI), at the sparger gas density; or entered',
		unit: 'm/s',
		source: 'Reilly, Scott, de Bruijn & MacIntyre (1994), Can. J. Chem. Eng. 72, 3'
	},
	transitionHoldup: {
		label: 'Transition holdup',
		formula: 'ε_trans = 0.59 B^1.5 √(ρ_g^0.96 σ^0.12/ρ_l), B = 3.85 (SI); or entered',
		unit: '1',
		source: 'Reilly, Scott, de Bruijn & MacIntyre (1994), Can. J. Chem. Eng. 72, 3'
	},
	largeGasShare: { label: 'Share of gas fed as large bubbles', formula: '(U_G − U_trans)/U_G above the transition, 0 below', unit: '1', source: 'Krishna & Ellenberger (1996)' },
	largeAccelerationFactor: {
		label: 'Large-bubble acceleration factor',
		formula: 'AF = 2.73 + 4.505 (U_G − U_trans), U in m/s',
		unit: '1',
		source: 'Krishna, Urseanu, van Baten & Ellenberger (1999), Chem. Eng. Sci. 54, 171'
	},
	largeWallFactor: {
		label: 'Large-bubble wall factor',
		formula: 'SF = 1 for d_b/D < 0.125, 1.13 exp(−d_b/D) up to 0.6, 0.496 √(D/d_b) beyond',
		unit: '1',
		source: 'Collins (1967), J. Fluid Mech. 28, 97'
	},
	sauterDiameterBottomM: { label: 'Sauter diameter at the sparger', formula: 'd₃₂ = 1/Σ(y_k/d_k) of the first cell, y_k the gas share of size class k', unit: 'm', source: 'definition' },
	sauterDiameterTopM: {
		label: 'Sauter diameter below the level',
		formula: 'd₃₂ = 1/Σ(y_k/d_k) of the cell below the one holding the level (the top of the bubbly region)',
		unit: 'm',
		source: 'definition'
	},
	bubbleNumberDensityBottomPerM3: { label: 'Bubble number density at the sparger', formula: 'Σ α_k/(π d_k³/6) of the first cell', unit: '1/m³', source: 'definition' },
	bubbleNumberDensityTopPerM3: { label: 'Bubble number density below the level', formula: 'Σ α_k/(π d_k³/6) of the cell below the one holding the level', unit: '1/m³', source: 'definition' },
	sizeClassDiameterRatio: { label: 'Size-class diameter ratio', formula: 'd_{k+1}/d_k = (d_max/d_min)^(1/(n − 1)), a geometric grid', unit: '1', source: 'definition' },
	dissipationRateM2S3: {
		label: 'Turbulence dissipation rate',
		formula: 'ε = g U_G at the sparger gas density, the power input of the gas per unit liquid mass (the kernels use g G/ρ_g of each cell)',
		unit: 'W/kg',
		source: 'common practice'
	},
	...sizeClassEntries(16),
	// cross-section
	sectionHoldup: { label: 'Section-average gas holdup', formula: '⟨α⟩ = (2/R²) ∫₀^R α r dr', unit: '1', source: 'definition' },
	centrelineLiquidVelocityMS: {
		label: 'Centreline liquid velocity',
		formula: 'u_l on the axis from u = a + b r² through the two cells next to it',
		unit: 'm/s',
		source: 'definition'
	},
	reversalRadiusRatio: {
		label: 'Flow reversal radius',
		formula: 'r/R where u_l first changes sign going out from the axis (linear interpolation); none when the liquid does not reverse',
		unit: '1',
		source: 'definition'
	},
	peakLocation: {
		label: 'Holdup peak',
		formula: '1 wall-peaked (largest α beyond r/R = 0.5), 0 core-peaked; none for a flat profile or no gas',
		unit: '1',
		source: 'definition'
	},
	sectionHoldupSmall: { label: 'Section-average small-bubble holdup', formula: '⟨α_small⟩ over the section', unit: '1', source: 'definition' },
	sectionHoldupLarge: { label: 'Section-average large-bubble holdup', formula: '⟨α_large⟩ over the section', unit: '1', source: 'definition' },
	peakLocationSmall: {
		label: 'Small-bubble holdup peak',
		formula: '1 wall-peaked (largest α_small beyond r/R = 0.5), 0 core-peaked; none for a flat profile or no small bubbles',
		unit: '1',
		source: 'definition'
	},
	peakLocationLarge: {
		label: 'Large-bubble holdup peak',
		formula: '1 wall-peaked (largest α_large beyond r/R = 0.5), 0 core-peaked; none for a flat profile or no large bubbles',
		unit: '1',
		source: 'definition'
	},
	axialPressureGradientPaM: {
		label: 'Axial pressure gradient',
		formula: 'dp/dz, set each step so that the section carries the liquid flux exactly (⟨α_l u_l⟩ = U_L)',
		unit: 'Pa/m',
		source: 'definition'
	},
	// mass transfer along the height profile (transfer.mode other than none)
	transferRateKgH: {
		label: 'Transfer rate',
		formula: 'Σ over cells and classes of k_L a (c* − c) Δz × column area, c* = H(T)(p − p_w) y; positive into the liquid',
		unit: 'kg/h',
		source: 'definition (Henry’s law; k_L from Higbie 1935 or Frössling 1938)'
	},
	transferEfficiencyPercent: { label: 'Transfer efficiency', formula: 'transfer rate / solute mass flow in the gas fed × 100', unit: '%', source: 'definition' },
	sotrKgH: {
		label: 'Standard oxygen transfer rate',
		formula: 'SOTR = V kLa20 C∞20 = R(0) θ^(20 − T) / (τ Ω): R(0) the rate into oxygen-free, well-mixed water, θ = 1.024, τ = C_s(T)/C_s(20 °C), Ω = p_top/101.325 kPa',
		unit: 'kg/h',
		source: 'ASCE/EWRI 2-06; C_s from Benson & Krause (1984)'
	},
	sotePercent: {
		label: 'Standard oxygen transfer efficiency',
		formula: 'SOTE = SOTR / oxygen mass flow in the gas fed × 100; SOTR is referred to 1 atm (Ω = p_top/101.325 kPa), so above 1 bar SOTE falls as 1/p_top and is not the efficiency at the operating pressure (that is the transfer efficiency)',
		unit: '%',
		source: 'ASCE/EWRI 2-06'
	},
	sotePerMetrePercentM: { label: 'SOTE per metre of submergence', formula: 'SOTE / clear-liquid level above the sparger', unit: '%/m', source: 'definition (common practice for diffusers)' },
	transferKLaPerS: {
		label: 'Volume-averaged kLa',
		formula: 'Σ_cells Σ_classes k_L a Δz / Σ_cells α_l Δz (per liquid volume), a = 6 α_k/d_k below the free surface',
		unit: '1/s',
		source: 'Higbie (1935) or Frössling (1938) k_L; a for spheres'
	},
	apparentKLaPerS: {
		label: 'Re-aeration kLa',
		formula: 'B/V_l with R(c) = R(0) − B c the rate into a well-mixed liquid of concentration c, each class in its steady state (what a clean-water test measures)',
		unit: '1/s',
		source: 'ASCE/EWRI 2-06 model C(t) = C∞ − (C∞ − C₀) e^(−kLa t)'
	},
	equilibriumConcentrationKgM3: { label: 'Equilibrium concentration C∞', formula: 'R(0)/B: where the well-mixed liquid stops taking up solute', unit: 'kg/m³', source: 'ASCE/EWRI 2-06 model' },
	surfaceSaturationKgM3: { label: 'Surface saturation', formula: 'H(T) y_fed (p_top − p_w)', unit: 'kg/m³', source: 'Henry’s law; oxygen from Benson & Krause (1984)' },
	bottomSaturationKgM3: { label: 'Bottom saturation', formula: 'H(T) y_fed (p_sparger − p_w)', unit: 'kg/m³', source: 'Henry’s law; oxygen from Benson & Krause (1984)' },
	effectiveSaturationDepthM: {
		label: 'Effective saturation depth',
		formula: 'd_e = (C∞/C_s,surface − 1)(p_top − p_w)/(ρ_l g): the depth at which the gas fed is in equilibrium with C∞',
		unit: 'm',
		source: 'ASCE/EWRI 2-06 (form from memory)'
	},
	meanConcentrationKgM3: { label: 'Mean dissolved concentration', formula: 'Σ α_l c / Σ α_l', unit: 'kg/m³', source: 'definition' },
	outletConcentrationKgM3: { label: 'Outlet dissolved concentration', formula: 'c of the end cell the liquid leaves from', unit: 'kg/m³', source: 'definition' },
	outletGasMoleFraction: { label: 'Outlet gas mole fraction', formula: 'gas-flux-weighted solute mole fraction of the classes leaving at the top', unit: '1', source: 'definition' },
	transferredGasShare: {
		label: 'Gas share dissolving',
		formula: 'solute moles transferred / gas moles fed; the gas flow of the hydrodynamics is not reduced by it (dilute transfer)',
		unit: '1',
		source: 'definition'
	},
	liquidDispersionM2S: {
		label: 'Liquid axial dispersion',
		formula: 'D_L = 0.678 D^1.4 U_G^0.3 (Deckwer et al. 1974), 0.35 D^(4/3) (g U_G)^(1/3) (Baird & Rice 1975), or entered',
		unit: 'm²/s',
		source: 'Deckwer, Burckhart & Zoll (1974), Chem. Eng. Sci. 29, 2177; Baird & Rice (1975), Chem. Eng. J. 9, 171'
	},
	bodensteinNumber: { label: 'Liquid Bodenstein number', formula: '|U_L| H / ((1 − ε) D_L); 0 for a batch liquid', unit: '1', source: 'definition' },
	wallHeatTransferWM2K: {
		label: 'Wall heat-transfer coefficient',
		formula: 'h = 0.1 ρ_l c_p (U_G g μ_l/ρ_l)^(1/4) Pr^(−1/2), i.e. St = 0.1 (Re Fr Pr²)^(−1/4)',
		unit: 'W/(m²·K)',
		source: 'Deckwer (1980), Chem. Eng. Sci. 35, 1341 (form and validity from memory)'
	}
};

/** Residuals of each model by id: the per-step convergence measures (dimensionless, non-negative). */
export const residualCatalog: Record<'height-profile' | 'cross-section', Record<string, QuantityEntry>> = {
	'height-profile': {
		gasMassImbalance: {
			label: 'Gas mass imbalance',
			formula: '|∫(gas in − gas out) dt| / ∫ gas fed dt over a window of 1 s simulated time',
			unit: '1',
			source: 'definition (integral measure over windows of simulated time)'
		},
		liquidMassImbalance: {
			label: 'Liquid mass imbalance',
			formula: '|∫(liquid in − liquid out) dt| (volume) / ∫ gas fed dt (volume at the sparger) over the window',
			unit: '1',
			source: 'definition (integral measure over windows of simulated time)'
		},
		holdupChangeRate: { label: 'Holdup change rate', formula: 'largest |Δα| of any cell over the window, per second (× 1 s)', unit: '1', source: 'definition' },
		overallHoldupChange: { label: 'Overall holdup change', formula: '|Δε| of the holdup below the level over the window, per second (× 1 s)', unit: '1', source: 'definition' },
		liquidCentreRate: {
			label: 'Liquid centre drift',
			formula: '|Δz_c|/Δt of the liquid’s centre of height over the gas feed velocity (catches liquid still falling back from the freeboard)',
			unit: '1',
			source: 'definition'
		},
		momentumImbalance: {
			label: 'Momentum imbalance',
			formula: 'largest |Δu_k|/Δt of any face over the window, for each phase present there, in units of g',
			unit: '1',
			source: 'definition'
		},
		soluteChangeRate: {
			label: 'Dissolved-gas change rate',
			formula: 'largest |Δc| of any cell holding liquid over the window, per second, over the saturation concentration of the gas fed at the top pressure (runs with mass transfer)',
			unit: '1',
			source: 'definition'
		}
	},
	'cross-section': {
		gasMassImbalance: { label: 'Gas flux error', formula: '|⟨α u_g⟩ − U_G| / U_G', unit: '1', source: 'definition' },
		liquidFluxError: { label: 'Liquid flux error', formula: '|⟨α_l u_l⟩ − U_L| / max(|U_L|, U_G, 1 mm/s); round-off by construction', unit: '1', source: 'definition' },
		holdupChangeRate: { label: 'Holdup change rate', formula: 'largest |∂α/∂t| of any cell × 1 s', unit: '1', source: 'definition' },
		momentumImbalance: {
			label: 'Momentum imbalance',
			formula: 'Σ V |α_l ρ_l ∂u_l/∂t + α ρ_g ∂u_g/∂t| / Σ V (|α_l (G − ρ_l g)| + |α (G − ρ_g g)|)',
			unit: '1',
			source: 'definition'
		}
	}
};

/** The entry of a residual of a model kind, or null. */
export function residualEntry(kind: string, id: string): QuantityEntry | null {
	return (residualCatalog as Record<string, Record<string, QuantityEntry>>)[kind]?.[id] ?? null;
}
