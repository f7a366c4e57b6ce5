import { describe, expect, it } from 'vitest';
import { validateUploadMeta } from '../../src/lib/measurements/upload.js';

const form = {
	kind: 'holdup-height',
	name: 'Pilot 0.3 m, run 4',
	sourceNote: 'conductivity probes, 2019 campaign',
	xUnit: 'cm',
	yUnit: '%',
	superficialGasVelocity: '4.5',
	superficialGasVelocityUnit: 'cm/s',
	temperature: '18.5',
	temperatureUnit: 'C',
	pressure: '1.013',
	pressureUnit: 'bar'
};

describe('upload form fields', () => {
	it('converts the operating point to SI', () => {
		const r = validateUploadMeta(form);
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		// 1 cm/s = 0.01 m/s; T[K] = T[°C] + 273.15; 1 bar = 1e5 Pa (definitions)
		expect(r.meta.operatingPoint.superficialGasVelocityMS).toBeCloseTo(0.045, 15);
		expect(r.meta.operatingPoint.temperatureK).toBeCloseTo(291.65, 12);
		expect(r.meta.operatingPoint.pressurePa).toBeCloseTo(101300, 9);
		expect(r.meta.units).toEqual({ x: 'cm', y: '%' });
	});

	it('names each wrong field', () => {
		const r = validateUploadMeta({ ...form, name: ' ', temperature: 'warm', pressure: '0.01', pressureUnit: 'bar', yUnit: 'ppm' });
		expect(r).toEqual({ ok: false, fieldErrors: { name: 'Give the measurement a name' } });
		const r2 = validateUploadMeta({ ...form, temperature: 'warm', pressure: '0.01', yUnit: 'ppm' });
		expect(r2).toEqual({
			ok: false,
			fieldErrors: {
				yUnit: 'Choose a unit for gas holdup',
				temperature: 'The temperature must be a number',
				pressure: 'The pressure must lie between 10000 and 10000000 Pa'
			}
		});
	});
});
