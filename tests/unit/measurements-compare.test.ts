import { describe, expect, it } from 'vitest';
import { defaultCase } from '../../solver/case.js';
import { errorMeasures, interpolateLinear, operatingPointMatches, operatingPointOfCase, profileForMeasurement, rankByRmse } from '../../src/lib/measurements/index.js';

describe('holding a run against a measurement', () => {
	it('interpolates linearly and holds the end values outside the profile', () => {
		const x = [0.05, 0.15, 0.25];
		const y = [0.1, 0.2, 0.4];
		expect(interpolateLinear({ x, y, at: 0.1 })).toBeCloseTo(0.15, 15);
		expect(interpolateLinear({ x, y, at: 0.2375 })).toBeCloseTo(0.375, 15);
		expect(interpolateLinear({ x, y, at: 0 })).toBe(0.1);
		expect(interpolateLinear({ x, y, at: 1 })).toBe(0.4);
		expect(interpolateLinear({ x: new Float64Array(x), y: new Float64Array(y), at: 0.15 })).toBe(0.2);
	});

	it('gives mean bias, RMSE and the largest deviation as computed by hand', () => {
		// by hand: the profile at 0.5 and 1.5 is 0.05 and 0.2; deviations −0.01 and +0.02;
		// bias (−0.01 + 0.02)/2 = 0.005; RMSE √((1e-4 + 4e-4)/2) = 0.0158114; largest +0.02 at 1.5
		const m = errorMeasures({ profile: { x: [0, 1, 2], y: [0, 0.1, 0.3] }, measurement: { x: [0.5, 1.5], y: [0.06, 0.18] } });
		expect(m.count).toBe(2);
		expect(m.predicted[0]).toBeCloseTo(0.05, 15);
		expect(m.predicted[1]).toBeCloseTo(0.2, 15);
		expect(m.meanBias).toBeCloseTo(0.005, 15);
		expect(m.rmse).toBeCloseTo(0.0158113883, 10);
		expect(m.largestDeviation).toBeCloseTo(0.02, 15);
		expect(m.largestDeviationAt).toBe(1.5);
		expect(m.heldAtEnd).toBe(0);
	});

	it('keeps the sign of the largest deviation when the run under-predicts', () => {
		// by hand: deviations 0.1 − 0.15 = −0.05 and 0.1 − 0.12 = −0.02
		const m = errorMeasures({ profile: { x: [0, 1], y: [0.1, 0.1] }, measurement: { x: [-0.5, 0.5], y: [0.15, 0.12] } });
		expect(m.largestDeviation).toBeCloseTo(-0.05, 15);
		expect(m.largestDeviationAt).toBe(-0.5);
		expect(m.meanBias).toBeCloseTo(-0.035, 15);
		expect(m.heldAtEnd).toBe(1);
	});

	it('ranks runs by RMSE, runs without a profile last', () => {
		const measurement = { x: [0.5], y: [0.1] };
		const ranked = rankByRmse({
			measurement,
			runs: [
				{ id: 'a', profile: { x: [0, 1], y: [0.3, 0.3] } },
				{ id: 'b', profile: null },
				{ id: 'c', profile: { x: [0, 1], y: [0.12, 0.12] } }
			]
		});
		expect(ranked.map((r) => r.id)).toEqual(['c', 'a', 'b']);
		expect(ranked[0].measures?.rmse).toBeCloseTo(0.02, 15);
		expect(ranked[2].measures).toBeNull();
	});

	it('matches an operating point within 10 % in gas velocity and pressure and 5 K in temperature', () => {
		const measurement = { superficialGasVelocityMS: 0.05, temperatureK: 293.15, pressurePa: 101325 };
		expect(operatingPointMatches({ run: { superficialGasVelocityMS: 0.055, temperatureK: 298.15, pressurePa: 111457 }, measurement }).matches).toBe(true);
		const off = operatingPointMatches({ run: { superficialGasVelocityMS: 0.056, temperatureK: 298.2, pressurePa: 120000 }, measurement });
		expect(off.matches).toBe(false);
		expect(off.reasons).toHaveLength(3);
		expect(off.reasons[0]).toBe('superficial gas velocity 0.056 m/s is not within ±10 % of 0.05 m/s');
		expect(operatingPointMatches({ run: { ...measurement, superficialGasVelocityMS: 0 }, measurement: { ...measurement, superficialGasVelocityMS: 0 } }).matches).toBe(true);
	});

	it('takes the operating point of a case from its sparging and fluids', () => {
		const c = defaultCase();
		expect(operatingPointOfCase(c)).toEqual({ superficialGasVelocityMS: c.sparging.superficialGasVelocityMS, temperatureK: c.fluids.temperatureK, pressurePa: c.fluids.topPressurePa });
	});

	it('picks the run field for each kind and scales the radius to r/R', () => {
		const snapshot = { x: new Float64Array([0.025, 0.075]), fields: { holdup: new Float64Array([0.2, 0.1]), liquidVelocity: new Float64Array([0.3, -0.1]), pressure: new Float64Array([1.1e5, 1.05e5]) } };
		const radial = defaultCase('cross-section');
		radial.geometry.diameterM = 0.2;
		const v = profileForMeasurement({ kind: 'liquid-velocity-radial', caseDoc: radial, snapshot });
		expect(v!.x[0]).toBeCloseTo(0.25, 15);
		expect(v!.x[1]).toBeCloseTo(0.75, 15);
		expect(Array.from(v!.y)).toEqual([0.3, -0.1]);
		const height = defaultCase('height-profile');
		expect(Array.from(profileForMeasurement({ kind: 'pressure-height', caseDoc: height, snapshot })!.y)).toEqual([1.1e5, 1.05e5]);
		expect(profileForMeasurement({ kind: 'holdup-radial', caseDoc: height, snapshot })).toBeNull();
		expect(profileForMeasurement({ kind: 'dissolved-oxygen', caseDoc: height, snapshot })).toBeNull();
	});
});
