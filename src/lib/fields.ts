/**
 * Names and SI units of the snapshot fields and residuals the solver writes, for chart axes,
 * tables and CSV headers. Unknown names fall back to the id itself and a '?' unit.
 */
export const fieldInfo: Record<string, { label: string; unit: string }> = {
	holdup: { label: 'gas holdup', unit: '1' },
	gasVelocity: { label: 'gas velocity', unit: 'm/s' },
	liquidVelocity: { label: 'liquid velocity', unit: 'm/s' },
	slip: { label: 'slip velocity', unit: 'm/s' },
	pressure: { label: 'pressure', unit: 'Pa' },
	gasDensity: { label: 'gas density', unit: 'kg/m³' },
	sauterDiameter: { label: 'Sauter mean diameter', unit: 'm' },
	holdupSmall: { label: 'small-bubble holdup', unit: '1' },
	holdupLarge: { label: 'large-bubble holdup', unit: '1' },
	gasVelocitySmall: { label: 'small-bubble velocity', unit: 'm/s' },
	gasVelocityLarge: { label: 'large-bubble velocity', unit: 'm/s' },
	dissolvedConcentration: { label: 'dissolved concentration', unit: 'kg/m³' },
	saturationConcentration: { label: 'saturation concentration', unit: 'kg/m³' },
	gasMoleFraction: { label: 'solute mole fraction in the gas', unit: '1' },
	gasMoleFractionSmall: { label: 'solute mole fraction, small bubbles', unit: '1' },
	gasMoleFractionLarge: { label: 'solute mole fraction, large bubbles', unit: '1' },
	transferRate: { label: 'transfer rate into the liquid', unit: 'kg/(m³·s)' },
	effectiveViscosity: { label: 'effective viscosity', unit: 'Pa·s' },
	liftForce: { label: 'lift force', unit: 'N/m³' },
	wallLubricationForce: { label: 'wall-lubrication force', unit: 'N/m³' },
	dispersionForce: { label: 'turbulent-dispersion force', unit: 'N/m³' },
	dragForce: { label: 'radial drag force', unit: 'N/m³' }
};

/** Per-class fields of the size classes: `holdupSize3` → size class 3. */
const sizeClassField = /^(holdup|gasVelocity|gasMoleFraction)Size(\d+)$/;
const sizeClassInfo: Record<string, { label: string; unit: string }> = {
	holdup: { label: 'holdup', unit: '1' },
	gasVelocity: { label: 'velocity', unit: 'm/s' },
	gasMoleFraction: { label: 'solute mole fraction', unit: '1' }
};

export function fieldLabel(id: string): { label: string; unit: string } {
	const known = fieldInfo[id];
	if (known) return known;
	const m = sizeClassField.exec(id);
	if (m) return { label: `${sizeClassInfo[m[1]].label}, size class ${m[2]}`, unit: sizeClassInfo[m[1]].unit };
	return { label: id, unit: '?' };
}

/**
 * Charts show pressures in kPa: axis labels of six-digit pascals overlap. Everything else is
 * drawn in its SI unit.
 */
const chartUnits: Record<string, { unit: string; factor: number }> = {
	Pa: { unit: 'kPa', factor: 1e-3 }
};
/** Fields drawn in a unit of their own: bubble diameters of a few millimetres read badly in metres. */
const fieldChartUnits: Record<string, { unit: string; factor: number }> = {
	sauterDiameter: { unit: 'mm', factor: 1e3 },
	dissolvedConcentration: { unit: 'mg/L', factor: 1e3 },
	saturationConcentration: { unit: 'mg/L', factor: 1e3 }
};

/** Axis title with the unit as drawn, e.g. `gas velocity (m/s)`; dimensionless shows `(–)`. */
export function axisTitle(id: string): string {
	const f = fieldLabel(id);
	const u = fieldChartUnits[id]?.unit ?? chartUnits[f.unit]?.unit ?? f.unit;
	return `${f.label} (${u === '1' ? '–' : u})`;
}

/**
 * Below this volume fraction a phase carries no mass worth drawing: its velocity there is a
 * numerical by-product (e.g. the fall speed of stray drops in the freeboard), so charts leave a gap.
 */
export const ABSENT_PHASE_FRACTION = 1e-3;

/**
 * A field's values in the unit its chart axis states. With the holdup given, velocities of a
 * phase that is (nearly) absent in a cell become gaps: gas velocity where α < 1e-3, liquid velocity
 * where 1 − α < 1e-3, slip where either phase is absent.
 */
export function chartValues(id: string, values: ArrayLike<number>, holdup?: ArrayLike<number>): ArrayLike<number> {
	const c = fieldChartUnits[id] ?? chartUnits[fieldLabel(id).unit];
	const scaled = c ? Array.from(values, (v) => v * c.factor) : values;
	if (!holdup || holdup.length !== values.length) return scaled;
	const gasAbsent = (a: number) => a < ABSENT_PHASE_FRACTION;
	const liquidAbsent = (a: number) => 1 - a < ABSENT_PHASE_FRACTION;
	const absent =
		id === 'gasVelocity' || id === 'gasVelocitySmall' || id === 'gasVelocityLarge' || /^gasVelocitySize\d+$/.test(id) ? gasAbsent : id === 'liquidVelocity' ? liquidAbsent : id === 'slip' ? (a: number) => gasAbsent(a) || liquidAbsent(a) : null;
	if (!absent) return scaled;
	return Array.from(scaled, (v, i) => (absent(holdup[i]) ? Number.NaN : v));
}

/** The same for a value with an explicit SI unit (time histories). */
export function chartUnit(unit: string): { unit: string; factor: number } {
	return chartUnits[unit] ?? { unit, factor: 1 };
}

/** What the position axis of a case kind means. */
export function positionTitle(kind: string): string {
	return kind === 'cross-section' ? 'radius (m)' : 'height above sparger (m)';
}

/** Order in which the run page shows a kind's profiles. */
export function profileOrder(kind: string): string[] {
	return kind === 'cross-section'
		? [
				'holdup',
				'holdupSmall',
				'holdupLarge',
				'sauterDiameter',
				'liquidVelocity',
				'gasVelocity',
				'gasVelocitySmall',
				'gasVelocityLarge',
				'effectiveViscosity',
				'liftForce',
				'wallLubricationForce',
				'dispersionForce',
				'dragForce'
			]
		: [
				'holdup',
				'holdupSmall',
				'holdupLarge',
				// size classes (at most 16): the holdup of each class; their velocities are in the CSV
				...Array.from({ length: 16 }, (_, k) => `holdupSize${k + 1}`),
				'sauterDiameter',
				'gasVelocity',
				'gasVelocitySmall',
				'gasVelocityLarge',
				'liquidVelocity',
				'slip',
				'pressure',
				'gasDensity',
				'dissolvedConcentration',
				'saturationConcentration',
				'gasMoleFraction',
				'gasMoleFractionSmall',
				'gasMoleFractionLarge',
				'transferRate'
			];
}

/** Design numbers whose value is a category (0/1) named by their label after ': ', e.g. `Holdup peak: core-peaked`. */
export const categoricalDesign: ReadonlySet<string> = new Set(['regime', 'peakLocation', 'peakLocationSmall', 'peakLocationLarge']);

/** A categorical number's label as its name and its category: `Holdup peak: core-peaked` → both parts ('' without one). */
export function categoryParts(label: string): { name: string; category: string } {
	const [name, ...rest] = label.split(': ');
	return { name, category: rest.join(': ') };
}

/** Design numbers that are published correlations, shown beside the run's own holdup as checks. */
export const correlationChecks = ['akitaYoshidaHoldup', 'hughmarkHoldup', 'hikitaHoldup', 'driftFluxHoldup'];

/** Reading order of design numbers (the stored jsonb summary does not keep key order). */
export const designOrder = [
	'overallHoldup',
	'aeratedHeightM',
	'levelSwellM',
	'spargerPressurePa',
	'gasResidenceTimeS',
	'meanSlipMS',
	'interfacialAreaPerM',
	'kLaPerS',
	'sauterDiameterM',
	'sauterDiameterBottomM',
	'sauterDiameterTopM',
	'holdupSmall',
	'holdupLarge',
	'diameterSmallM',
	'diameterLargeM',
	'slipSmallMS',
	'slipLargeMS',
	'transitionVelocityMS',
	'transitionHoldup',
	'largeGasShare',
	'largeAccelerationFactor',
	'largeWallFactor',
	'regime',
	'sectionHoldup',
	'centrelineLiquidVelocityMS',
	'reversalRadiusRatio',
	'peakLocation',
	'sectionHoldupSmall',
	'sectionHoldupLarge',
	'peakLocationSmall',
	'peakLocationLarge',
	'axialPressureGradientPaM',
	'transferRateKgH',
	'transferEfficiencyPercent',
	'sotrKgH',
	'sotePercent',
	'sotePerMetrePercentM',
	'transferKLaPerS',
	'apparentKLaPerS',
	'equilibriumConcentrationKgM3',
	'surfaceSaturationKgM3',
	'bottomSaturationKgM3',
	'effectiveSaturationDepthM',
	'meanConcentrationKgM3',
	'outletConcentrationKgM3',
	'outletGasMoleFraction',
	'transferredGasShare',
	'liquidDispersionM2S',
	'bodensteinNumber',
	'wallHeatTransferWM2K',
	'liquidMassErrorRel'
];

/**
 * The unit a design number is shown in, wherever it is shown (run page, comparison, report): pressures in
 * kPa, dissolved concentrations in mg/L (1 mg/L = 1e-3 kg/m³, the unit oxygen specifications are written in),
 * dimensionless as a dash; everything else in its SI unit.
 */
export function designUnit(id: string, unit: string): { unit: string; factor: number } {
	if (unit === 'Pa') return { unit: 'kPa', factor: 1e-3 };
	if (unit === 'kg/m³' && /(Concentration|Saturation)KgM3$/.test(id)) return { unit: 'mg/L', factor: 1e3 };
	if (unit === '1') return { unit: '–', factor: 1 };
	return { unit, factor: 1 };
}

export function designRank(id: string): number {
	return designOrder.indexOf(id) + 1 || designOrder.length + 1;
}
