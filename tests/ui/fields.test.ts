import { describe, expect, it } from 'vitest';
import { chartValues, fieldLabel, profileOrder } from '../../src/lib/fields';

describe('chart values of a profile', () => {
	const holdup = [0.15, 0.2, 0.9995, 0.0002];

	it('leaves a gap where the phase whose velocity is drawn is nearly absent', () => {
		// a freeboard cell (α = 0.9995) has no liquid velocity to speak of; a clear-liquid cell no gas velocity
		expect(Array.from(chartValues('liquidVelocity', [0.1, 0.05, -4.1, 0], holdup))).toEqual([0.1, 0.05, NaN, 0]);
		expect(Array.from(chartValues('gasVelocity', [0.4, 0.35, 0.3, 0.2], holdup))).toEqual([0.4, 0.35, 0.3, NaN]);
		expect(Array.from(chartValues('slip', [0.3, 0.3, 4.4, 0.25], holdup))).toEqual([0.3, 0.3, NaN, NaN]);
	});

	it('draws pressures in kPa and leaves other fields untouched', () => {
		expect(Array.from(chartValues('pressure', [101325, 116020], [0.1, 0.1]))).toEqual([101.325, 116.02]);
		expect(Array.from(chartValues('holdup', holdup, holdup))).toEqual(holdup);
	});
});

describe('size-class fields', () => {
	it('are named by their class, and the class velocities leave gaps where there is no gas', () => {
		expect(fieldLabel('holdupSize3')).toEqual({ label: 'holdup, size class 3', unit: '1' });
		expect(fieldLabel('gasVelocitySize12')).toEqual({ label: 'velocity, size class 12', unit: 'm/s' });
		expect(fieldLabel('holdupSizeX').unit).toBe('?');
		expect(Array.from(chartValues('gasVelocitySize2', [0.4, 0.35, 0.3, 0.2], [0.15, 0.2, 0.9995, 0.0002]))).toEqual([0.4, 0.35, 0.3, NaN]);
		const order = profileOrder('height-profile');
		expect(order.indexOf('holdupSize1')).toBeGreaterThan(order.indexOf('holdupLarge'));
		expect(order).toContain('holdupSize16');
	});
});
