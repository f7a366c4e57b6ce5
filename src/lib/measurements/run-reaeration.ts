/**
 * The re-aeration analysis of a batch run's own dissolved-oxygen series, as the product analyses an
 * uploaded test (ASCE/EWRI 2-06): fit all points, keep those between 20 % and 98 % of C∞, fit again,
 * then kLa20, C∞20 and SOTR for the run's liquid volume. Beside it, what the fit implies for the
 * column: the effective saturation depth and the standard oxygen transfer efficiency.
 *
 * SI throughout: s, kg/m³, 1/s, m, kg/s, Pa.
 */
import type { CaseDocument } from '$solver/case';
import { gasMassFlux } from '$solver/derived';
import { bensonKrauseWaterVapourPressurePa, effectiveSaturationDepthM, solutes } from '$solver/correlations/solubility';
import { analyseReaeration, fitReaeration, truncateReaerationSeries, type ReaerationAnalysis } from './reaeration.js';

export interface RunReaeration {
	analysis: ReaerationAnalysis;
	/** the points the final fit used (20 %–98 % of the first fit's C∞) */
	fitted: { timeS: number[]; concentrationKgM3: number[] };
	truncation: { kept: number; of: number };
	liquidVolumeM3: number;
	/** depth below the surface at which the gas fed is in equilibrium with the fitted C∞, m (NaN without a surface saturation) */
	effectiveSaturationDepthM: number;
	/** SOTR of the fit ÷ oxygen mass flow fed, % */
	sotePercent: number;
}

export type RunReaerationResult = { ok: true; result: RunReaeration } | { ok: false; message: string };

/** The series of a batch oxygen run, analysed; null when the run has no oxygen series (another solute, or not batch). */
export function analyseRunReaeration(o: {
	doc: CaseDocument;
	series: { timeS: number[]; concentrationKgM3: number[] } | undefined;
	/** saturation with the gas fed at the top pressure (the run's design number), kg/m³ */
	surfaceSaturationKgM3?: number;
}): RunReaerationResult | null {
	const { doc, series } = o;
	if (!series || doc.transfer.mode !== 'batch' || doc.transfer.solute !== 'oxygen') return null;
	const first = fitReaeration(series);
	if (!first.ok) return first;
	const kept = truncateReaerationSeries({ ...series, saturationKgM3: first.fit.saturationKgM3.value });
	// too few points between 20 % and 98 % (a short run): keep them all rather than fail
	const used = kept.timeS.length >= 6 ? kept : { timeS: series.timeS, concentrationKgM3: series.concentrationKgM3 };
	const areaM2 = (Math.PI * doc.geometry.diameterM ** 2) / 4;
	const liquidVolumeM3 = areaM2 * doc.geometry.clearLiquidLevelM;
	const topPa = doc.fluids.topPressurePa;
	const a = analyseReaeration({ ...used, temperatureK: doc.fluids.temperatureK, liquidVolumeM3, barometricPressurePa: topPa });
	if (!a.ok) return a;
	const pw = doc.transfer.gasHumidity === 'saturated' ? bensonKrauseWaterVapourPressurePa(doc.fluids.temperatureK) : 0;
	const surface = o.surfaceSaturationKgM3 ?? Number.NaN;
	const depth = effectiveSaturationDepthM({ equilibriumKgM3: a.analysis.fit.saturationKgM3.value, surfaceSaturationKgM3: surface, topPressurePa: topPa, vapourPressurePa: pw, liquidDensityKgM3: doc.fluids.liquid.densityKgM3 });
	const oxygenFedKgS = ((doc.transfer.inletGasMoleFraction * gasMassFlux(doc) * solutes.oxygen.molarMassKgMol) / doc.fluids.gas.molarMassKgMol) * areaM2;
	return {
		ok: true,
		result: {
			analysis: a.analysis,
			fitted: { timeS: Array.from(used.timeS), concentrationKgM3: Array.from(used.concentrationKgM3) },
			truncation: { kept: used.timeS.length, of: series.timeS.length },
			liquidVolumeM3,
			effectiveSaturationDepthM: depth,
			sotePercent: oxygenFedKgS > 0 ? (100 * a.analysis.sotrKgS.value) / oxygenFedKgS : Number.NaN
		}
	};
}
