import { describe, expect, it } from 'vitest';
import { dimensionOf, displayValue, formatNumber, formatQuantity, fromSI, toSI } from '../../src/lib/units';

describe('unit choice on entry', () => {
	// NIST SP 811 (2008), appendix B: 1 in = 0.0254 m and 1 ft = 0.3048 m exactly
	it('converts inches and feet to metres by the exact definitions', () => {
		expect(toSI({ value: 12, dimension: 'length', unit: 'in' })).toBeCloseTo(0.3048, 12);
		expect(toSI({ value: 10, dimension: 'length', unit: 'ft' })).toBeCloseTo(3.048, 12);
		expect(toSI({ value: 4, dimension: 'length', unit: 'mm' })).toBeCloseTo(0.004, 15);
	});

	// NIST SP 811: 1 bar = 1e5 Pa, 1 atm = 101 325 Pa (exact), 1 psi = 6.894 757 kPa
	it('converts bar, standard atmospheres and psi to pascals', () => {
		expect(toSI({ value: 1, dimension: 'pressure', unit: 'atm' })).toBe(101325);
		expect(toSI({ value: 2.5, dimension: 'pressure', unit: 'bar' })).toBe(250000);
		expect(toSI({ value: 14.696, dimension: 'pressure', unit: 'psi' })).toBeCloseTo(101325, -1);
	});

	it('converts centimetres per second and feet per second to metres per second', () => {
		expect(toSI({ value: 5, dimension: 'velocity', unit: 'cm/s' })).toBeCloseTo(0.05, 15);
		expect(toSI({ value: 1, dimension: 'velocity', unit: 'ft/s' })).toBeCloseTo(0.3048, 15);
	});

	it('round-trips a value through another unit without binary noise in the input box', () => {
		const si = toSI({ value: 0.3, dimension: 'length', unit: 'ft' });
		expect(fromSI({ value: si, dimension: 'length', unit: 'ft' })).toBeCloseTo(0.3, 14);
		expect(displayValue({ valueSI: 0.05, dimension: 'velocity', unit: 'cm/s' })).toBe(5);
		expect(displayValue({ valueSI: 0.1 + 0.2, dimension: 'length', unit: 'm' })).toBe(0.3);
	});

	it('offers a choice only for lengths, velocities and pressures', () => {
		expect(dimensionOf('m')).toBe('length');
		expect(dimensionOf('m/s')).toBe('velocity');
		expect(dimensionOf('Pa')).toBe('pressure');
		expect(dimensionOf('kg/m³')).toBeNull();
	});

	it('refuses an unknown unit rather than guessing', () => {
		expect(() => toSI({ value: 1, dimension: 'length', unit: 'furlong' })).toThrow(/Unknown length unit/);
	});

	it('formats numbers with their unit and a dash for missing values', () => {
		expect(formatQuantity(0.1234567, 'm/s')).toBe('0.1235 m/s');
		expect(formatQuantity(101325, 'Pa')).toBe('101300 Pa');
		expect(formatQuantity(2.3e-9, 'm²/s')).toBe('2.3e-9 m²/s');
		expect(formatQuantity(0.25, '1')).toBe('0.25');
		expect(formatNumber(null)).toBe('—');
		expect(formatNumber(Number.NaN)).toBe('—');
	});
});
