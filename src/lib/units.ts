/**
 * Unit choice on entry. Everything is stored and computed in SI; these helpers only convert what
 * an analyst types (in the unit they picked) to SI and back for display. Factors are exact by
 * definition where a definition exists (inch, foot, bar, standard atmosphere); the psi factor is
 * the rounded NIST SP 811 value.
 */

export type Dimension = 'length' | 'velocity' | 'pressure';

export interface UnitOption {
	/** symbol shown to the user */
	symbol: string;
	/** SI value of one of this unit (SI = value × factor) */
	factor: number;
}

export const unitOptions: Record<Dimension, UnitOption[]> = {
	length: [
		{ symbol: 'm', factor: 1 },
		{ symbol: 'cm', factor: 0.01 },
		{ symbol: 'mm', factor: 0.001 },
		{ symbol: 'ft', factor: 0.3048 },
		{ symbol: 'in', factor: 0.0254 }
	],
	velocity: [
		{ symbol: 'm/s', factor: 1 },
		{ symbol: 'cm/s', factor: 0.01 },
		{ symbol: 'mm/s', factor: 0.001 },
		{ symbol: 'ft/s', factor: 0.3048 }
	],
	pressure: [
		{ symbol: 'Pa', factor: 1 },
		{ symbol: 'kPa', factor: 1e3 },
		{ symbol: 'MPa', factor: 1e6 },
		{ symbol: 'bar', factor: 1e5 },
		{ symbol: 'atm', factor: 101325 },
		{ symbol: 'psi', factor: 6894.757 }
	]
};

/** Which dimension an SI unit symbol belongs to, or null when the field offers no choice. */
export function dimensionOf(siUnit: string): Dimension | null {
	if (siUnit === 'm') return 'length';
	if (siUnit === 'm/s') return 'velocity';
	if (siUnit === 'Pa') return 'pressure';
	return null;
}

function factorOf(options: { dimension: Dimension; unit: string }): number {
	const u = unitOptions[options.dimension].find((o) => o.symbol === options.unit);
	if (!u) throw new Error(`Unknown ${options.dimension} unit "${options.unit}"`);
	return u.factor;
}

/** A value typed in `unit` converted to SI. */
export function toSI(options: { value: number; dimension: Dimension; unit: string }): number {
	return options.value * factorOf(options);
}

/** An SI value expressed in `unit`. */
export function fromSI(options: { value: number; dimension: Dimension; unit: string }): number {
	return options.value / factorOf(options);
}

/**
 * A number for display: up to `digits` significant figures, trailing zeros dropped, exponent
 * notation only for very small or very large magnitudes (so 0.0042 stays readable).
 */
export function formatNumber(value: number | null | undefined, digits = 4): string {
	if (value === null || value === undefined || Number.isNaN(value)) return '—';
	if (!Number.isFinite(value)) return value > 0 ? '∞' : '−∞';
	if (value === 0) return '0';
	const a = Math.abs(value);
	if (a >= 1e-3 && a < 1e6) {
		const s = Number(value.toPrecision(digits));
		return String(s);
	}
	const [m, e] = value.toExponential(digits - 1).split('e');
	return `${Number(m)}e${Number(e)}`;
}

/** `value unit` with the unit always shown (dimensionless numbers show nothing after the value). */
export function formatQuantity(value: number | null | undefined, unit: string, digits = 4): string {
	const v = formatNumber(value, digits);
	return unit && unit !== '1' ? `${v} ${unit}` : v;
}

/** Round-trip safe conversion for an input box: avoids 0.30000000000000004-style noise. */
export function displayValue(options: { valueSI: number; dimension: Dimension | null; unit: string }): number {
	if (!options.dimension) return options.valueSI;
	const v = fromSI({ value: options.valueSI, dimension: options.dimension, unit: options.unit });
	return Number(v.toPrecision(12));
}
