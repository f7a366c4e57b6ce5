import { describe, expect, it } from 'vitest';
import { aeratedMean, areaMean, timeHistories } from '../../src/lib/server/run-results';

describe('time histories from stored snapshots', () => {
	// ∫₀ᴿ (r/R) 2πr dr / (πR²) = 2/3 exactly; the midpoint rule with weights r converges to it
	it('area-weights a radial profile so a linear rise averages to two thirds of its wall value', () => {
		const n = 400;
		const r = Array.from({ length: n }, (_, i) => (i + 0.5) / n);
		expect(areaMean(r, r)).toBeCloseTo(2 / 3, 5);
		expect(areaMean(r, r.map(() => 0.2))).toBeCloseTo(0.2, 12);
	});

	it('averages the holdup only below the free surface, leaving out the gas-filled freeboard', () => {
		expect(aeratedMean([0.1, 0.2, 0.3, 0.99, 1])).toBeCloseTo(0.2, 12);
		expect(Number.isNaN(aeratedMean([0.9, 1]))).toBe(true);
	});

	it('gives the sparger-cell pressure over time for a height profile', () => {
		const snap = (t: number, p0: number) => ({ step: t, timeS: t, x: new Float64Array([0.1, 0.3]), fields: { holdup: new Float64Array([0.1, 0.1]), pressure: new Float64Array([p0, 101325]) } });
		const h = timeHistories({ kind: 'height-profile', snapshots: [snap(1, 115000), snap(2, 116000)] });
		expect(h.find((x) => x.id === 'spargerPressure')?.values).toEqual([115000, 116000]);
		expect(h.find((x) => x.id === 'aeratedHoldup')?.values).toEqual([0.1, 0.1]);
	});
});
