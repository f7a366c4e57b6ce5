/**
 * Measurement kinds: what a member may upload, the two columns of each file, the units each
 * column may be given in, and the conversion to SI.
 *
 * SI inside: every stored and computed value is SI (m, Pa, s, kg/m³, m/s, fraction); the units
 * below exist only at the edge, for reading files and for display. A unit converts by
 * `si = value · factor + offset` (the offset is only non-zero for °C).
 */

export const measurementKinds = ['holdup-height', 'pressure-height', 'holdup-radial', 'liquid-velocity-radial', 'dissolved-oxygen'] as const;
export type MeasurementKind = (typeof measurementKinds)[number];

export interface Unit {
	/** as written in forms and files, e.g. `cm` */
	id: string;
	label: string;
	factor: number;
	offset?: number;
}

/** The quantity in one column of a measurement file. */
export type Quantity = 'height' | 'radial-position' | 'holdup' | 'pressure' | 'velocity' | 'time' | 'concentration';

export const unitsByQuantity: Record<Quantity, readonly Unit[]> = {
	height: [
		{ id: 'm', label: 'm', factor: 1 },
		{ id: 'cm', label: 'cm', factor: 0.01 },
		{ id: 'mm', label: 'mm', factor: 0.001 },
		{ id: 'ft', label: 'ft', factor: 0.3048 },
		{ id: 'in', label: 'in', factor: 0.0254 }
	],
	'radial-position': [
		{ id: '1', label: 'r/R (0–1)', factor: 1 },
		{ id: '%', label: 'r/R in %', factor: 0.01 }
	],
	holdup: [
		{ id: '1', label: 'fraction (0–1)', factor: 1 },
		{ id: '%', label: '%', factor: 0.01 }
	],
	// Absolute pressures only: a gauge reading needs the local barometric pressure, which the
	// file does not carry, so the analyst converts it before the upload.
	pressure: [
		{ id: 'Pa', label: 'Pa (absolute)', factor: 1 },
		{ id: 'kPa', label: 'kPa (absolute)', factor: 1e3 },
		{ id: 'MPa', label: 'MPa (absolute)', factor: 1e6 },
		{ id: 'bar', label: 'bar (absolute)', factor: 1e5 },
		{ id: 'mbar', label: 'mbar (absolute)', factor: 100 },
		{ id: 'atm', label: 'atm (absolute)', factor: 101325 },
		{ id: 'psi', label: 'psi (absolute)', factor: 6894.757293168361 }
	],
	velocity: [
		{ id: 'm/s', label: 'm/s', factor: 1 },
		{ id: 'cm/s', label: 'cm/s', factor: 0.01 },
		{ id: 'mm/s', label: 'mm/s', factor: 0.001 }
	],
	time: [
		{ id: 's', label: 's', factor: 1 },
		{ id: 'min', label: 'min', factor: 60 },
		{ id: 'h', label: 'h', factor: 3600 }
	],
	// mg/L and g/m³ are the same quantity; SI is kg/m³.
	concentration: [
		{ id: 'mg/L', label: 'mg/L', factor: 1e-3 },
		{ id: 'g/m3', label: 'g/m³', factor: 1e-3 },
		{ id: 'kg/m3', label: 'kg/m³', factor: 1 }
	]
};

export interface ColumnSpec {
	/** stable key used in stored tables and exports */
	key: string;
	label: string;
	quantity: Quantity;
	/** the SI unit the column is converted to */
	siUnit: string;
	/** unit preselected in the upload form */
	defaultUnit: string;
}

export interface KindSpec {
	kind: MeasurementKind;
	label: string;
	/** the position or time column: must be strictly increasing */
	x: ColumnSpec;
	y: ColumnSpec;
	/** true when x is a height above the sparger and must lie inside the column */
	xIsHeight: boolean;
	/** inclusive bounds of x in SI (height kinds are bounded by the column height instead) */
	xRange: readonly [number, number];
	/** inclusive bounds of y in SI, with the wording used when a value is refused */
	yRange: readonly [number, number];
	yRangeText: string;
}

export const kindSpecs: Record<MeasurementKind, KindSpec> = {
	'holdup-height': {
		kind: 'holdup-height',
		label: 'Gas holdup along the height',
		x: { key: 'heightM', label: 'height above the sparger', quantity: 'height', siUnit: 'm', defaultUnit: 'm' },
		y: { key: 'holdup', label: 'gas holdup', quantity: 'holdup', siUnit: '1', defaultUnit: '1' },
		xIsHeight: true,
		xRange: [0, Infinity],
		yRange: [0, 1],
		yRangeText: 'a holdup must lie between 0 and 1'
	},
	'pressure-height': {
		kind: 'pressure-height',
		label: 'Pressure taps along the height',
		x: { key: 'heightM', label: 'height above the sparger', quantity: 'height', siUnit: 'm', defaultUnit: 'm' },
		y: { key: 'pressurePa', label: 'absolute pressure', quantity: 'pressure', siUnit: 'Pa', defaultUnit: 'kPa' },
		xIsHeight: true,
		xRange: [0, Infinity],
		yRange: [Number.MIN_VALUE, Infinity],
		yRangeText: 'an absolute pressure must be greater than 0'
	},
	'holdup-radial': {
		kind: 'holdup-radial',
		label: 'Radial gas holdup profile',
		x: { key: 'radiusRatio', label: 'r/R', quantity: 'radial-position', siUnit: '1', defaultUnit: '1' },
		y: { key: 'holdup', label: 'gas holdup', quantity: 'holdup', siUnit: '1', defaultUnit: '1' },
		xIsHeight: false,
		xRange: [0, 1],
		yRange: [0, 1],
		yRangeText: 'a holdup must lie between 0 and 1'
	},
	'liquid-velocity-radial': {
		kind: 'liquid-velocity-radial',
		label: 'Radial liquid velocity profile',
		x: { key: 'radiusRatio', label: 'r/R', quantity: 'radial-position', siUnit: '1', defaultUnit: '1' },
		y: { key: 'liquidVelocityMS', label: 'axial liquid velocity', quantity: 'velocity', siUnit: 'm/s', defaultUnit: 'm/s' },
		xIsHeight: false,
		xRange: [0, 1],
		// downflow near the wall is negative; 20 m/s is far beyond any bubble column and catches unit slips
		yRange: [-20, 20],
		yRangeText: 'a liquid velocity must lie between −20 and 20 m/s'
	},
	'dissolved-oxygen': {
		kind: 'dissolved-oxygen',
		label: 'Dissolved-oxygen series (re-aeration test)',
		x: { key: 'timeS', label: 'time', quantity: 'time', siUnit: 's', defaultUnit: 's' },
		y: { key: 'concentrationKgM3', label: 'dissolved oxygen', quantity: 'concentration', siUnit: 'kg/m³', defaultUnit: 'mg/L' },
		xIsHeight: false,
		xRange: [0, Infinity],
		// 0.1 kg/m³ = 100 mg/L: several times pure-oxygen saturation, so anything above is a unit slip
		yRange: [0, 0.1],
		yRangeText: 'a dissolved-oxygen concentration must lie between 0 and 100 mg/L'
	}
};

export function isMeasurementKind(v: unknown): v is MeasurementKind {
	return typeof v === 'string' && (measurementKinds as readonly string[]).includes(v);
}

/** The unit `id` of a quantity, or `null` if that quantity has no such unit. */
export function findUnit(quantity: Quantity, id: string): Unit | null {
	return unitsByQuantity[quantity].find((u) => u.id === id) ?? null;
}

/** Convert a value given in `unit` to SI. */
export function toSi(value: number, unit: Unit): number {
	return value * unit.factor + (unit.offset ?? 0);
}

/** Convert an SI value to `unit` (for display and exports in the uploader's units). */
export function fromSi(valueSi: number, unit: Unit): number {
	return (valueSi - (unit.offset ?? 0)) / unit.factor;
}

/**
 * The operating point an upload was taken at (and a run is set up for). SI: superficial gas
 * velocity in m/s at the sparger, temperature in K, absolute pressure in Pa at the top of the column.
 */
export interface OperatingPoint {
	superficialGasVelocityMS: number;
	temperatureK: number;
	pressurePa: number;
}

/** Units offered for the operating point in the upload form. */
export const operatingPointUnits = {
	superficialGasVelocity: [
		{ id: 'm/s', label: 'm/s', factor: 1 },
		{ id: 'cm/s', label: 'cm/s', factor: 0.01 },
		{ id: 'mm/s', label: 'mm/s', factor: 0.001 }
	],
	temperature: [
		{ id: 'K', label: 'K', factor: 1 },
		{ id: 'C', label: '°C', factor: 1, offset: 273.15 }
	],
	pressure: unitsByQuantity.pressure
} as const satisfies Record<string, readonly Unit[]>;
