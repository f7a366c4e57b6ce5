/**
 * Ransom's sedimentation problem (Ransom 1987; setup from memory, PHYSICS §11.2): a closed 7.5 m tube,
 * α_g = 0.5 at rest, separates into liquid below and gas above.
 */
import { describe, expect, it } from 'vitest';
import { defaultCase } from '../../solver/case.js';
import { createHeightSimulationFromConfig } from '../../solver/height/simulation.js';
import { sedimentationConfig } from '../../solver/height/problems.js';

describe("Ransom's sedimentation", () => {
	const cells = 50;
	const sim = createHeightSimulationFromConfig(defaultCase(), sedimentationConfig({ cells, endTimeS: 50 }));
	const inventory0 = sim.liquidInventoryM();
	while (sim.state.status === 'running') sim.step();
	const m = sim.model;

	it('separates into liquid below and gas above with the interface at mid-height', () => {
		expect(sim.state.status).toBe('finished');
		// liquid volume 7.5 m × 0.5 = 3.75 m of liquid: the interface sits at 3.75 m (exact)
		expect(Math.abs(sim.level() - 3.75)).toBeLessThan(7.5 / cells);
		for (let i = 0; i < cells; i++) {
			const z = m.zCentre[i];
			const a = 1 - m.liquidFraction[i];
			if (z < 3.75 - 7.5 / cells) expect(a).toBeLessThan(1e-6);
			if (z > 3.75 + 7.5 / cells) expect(a).toBeGreaterThan(1 - 1e-6);
			// no void overshoot
			expect(a).toBeGreaterThanOrEqual(-1e-12);
			expect(a).toBeLessThanOrEqual(1 + 1e-12);
		}
	});

	it('ends at rest with the hydrostatic bottom pressure', () => {
		// PHYSICS §15 #25 [D]: p_bot = 1e5 + 1.16·9.81·3.75 + 1000·9.81·3.75 = 1.36830e5 Pa
		const pBottom = sim.results().design.spargerPressurePa.value;
		expect(Math.abs(pBottom - 1.3683e5) / 1.3683e5).toBeLessThan(1e-4);
		let maxLiquidSpeed = 0;
		for (let j = 1; j < cells; j++) if (m.liquidFraction[j - 1] > 0.5 || m.liquidFraction[j] > 0.5) maxLiquidSpeed = Math.max(maxLiquidSpeed, Math.abs(m.liquidVelocity[j]));
		expect(maxLiquidSpeed).toBeLessThan(1e-9);
	});

	it('conserves the liquid to round-off', () => {
		expect(Math.abs(sim.liquidInventoryM() - inventory0) / inventory0).toBeLessThan(1e-12);
	});
});
