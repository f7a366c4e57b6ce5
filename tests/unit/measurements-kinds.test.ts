import { describe, expect, it } from 'vitest';
import { measurementKindEnum } from '../../src/lib/server/db/schema.js';
import { findUnit, fromSi, kindSpecs, measurementKinds, operatingPointUnits, toSi, unitsByQuantity } from '../../src/lib/measurements/index.js';

describe('measurement kinds and units', () => {
	it('offers the kinds the database stores', () => {
		expect([...measurementKinds].sort()).toEqual([...measurementKindEnum.enumValues].sort());
		for (const k of measurementKinds) expect(kindSpecs[k].kind).toBe(k);
	});

	it('converts units to SI by their definitions', () => {
		// exact definitions: 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 atm = 101325 Pa, 1 bar = 1e5 Pa
		expect(toSi(10, findUnit('height', 'ft')!)).toBeCloseTo(3.048, 14);
		expect(toSi(1, findUnit('height', 'in')!)).toBe(0.0254);
		expect(toSi(1, findUnit('pressure', 'atm')!)).toBe(101325);
		expect(toSi(1.5, findUnit('pressure', 'bar')!)).toBe(150000);
		// 1 psi = 6894.757 Pa (common practice)
		expect(toSi(1, findUnit('pressure', 'psi')!)).toBeCloseTo(6894.757, 3);
		expect(toSi(2, findUnit('time', 'h')!)).toBe(7200);
		// 0 °C = 273.15 K (definition)
		const celsius = operatingPointUnits.temperature[1];
		expect(toSi(20, celsius)).toBeCloseTo(293.15, 12);
		expect(fromSi(293.15, celsius)).toBeCloseTo(20, 12);
		expect(findUnit('holdup', 'ppm')).toBeNull();
	});

	it('offers the default unit of every column among its units', () => {
		for (const k of measurementKinds) {
			const s = kindSpecs[k];
			expect(unitsByQuantity[s.x.quantity].map((u) => u.id)).toContain(s.x.defaultUnit);
			expect(unitsByQuantity[s.y.quantity].map((u) => u.id)).toContain(s.y.defaultUnit);
		}
	});
});
