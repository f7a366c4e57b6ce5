import { describe, expect, it } from 'vitest';
import { gridConvergenceIndex } from '../../solver/gci.js';

describe('grid convergence index', () => {
	it("reproduces Celik et al.'s (2008) worked example (#32)", () => {
		// PHYSICS §15 #32 [D]: N = 18000, 8000, 4500 cells in 2-D, so h ∝ N^(-1/2); φ = 6.063, 5.972, 5.863
		// → p = 1.534, φ_ext = 6.1685, e_a = 1.501 %, e_ext = 1.710 %, GCI = 2.175 % (the paper: 1.53, 6.1685, 1.5 %, 1.7 %, 2.2 %)
		const h = [18000, 8000, 4500].map((n) => 1 / Math.sqrt(n)) as [number, number, number];
		const g = gridConvergenceIndex({ cellSizes: h, values: [6.063, 5.972, 5.863] });
		expect(Math.abs(g.order - 1.534)).toBeLessThan(1e-3);
		expect(Math.abs(g.extrapolated - 6.1685)).toBeLessThan(1e-3);
		expect(Math.abs(g.approximateRelativeError - 0.01501)).toBeLessThan(1e-5);
		expect(Math.abs(g.extrapolatedRelativeError - 0.0171)).toBeLessThan(1e-4);
		expect(Math.abs(g.gciFine - 0.02175)).toBeLessThan(1e-4);
		expect(g.oscillatory).toBe(false);
	});

	it('recovers the order and the limit of an exactly second-order sequence', () => {
		// φ(h) = 1 + h²: p = 2 and φ_ext = 1 exactly (Richardson extrapolation)
		const g = gridConvergenceIndex({ cellSizes: [0.1, 0.2, 0.4], values: [1.01, 1.04, 1.16] });
		expect(g.order).toBeCloseTo(2, 10);
		expect(g.extrapolated).toBeCloseTo(1, 10);
	});

	it('flags oscillatory convergence and refuses grids out of order', () => {
		expect(gridConvergenceIndex({ cellSizes: [0.1, 0.2, 0.4], values: [1.0, 1.02, 0.99] }).oscillatory).toBe(true);
		expect(() => gridConvergenceIndex({ cellSizes: [0.2, 0.1, 0.4], values: [1, 1, 1] })).toThrow(/finest/);
	});
});
