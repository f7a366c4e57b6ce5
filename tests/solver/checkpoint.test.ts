import { describe, expect, it } from 'vitest';
import { Packr } from 'msgpackr';
import { createSimulation, defaultCase, InvalidCaseError, oneClassCase, SOLVER_VERSION, validateCase } from '../../solver/index.js';
import type { Simulation } from '../../solver/types.js';

function sameBits(a: Float64Array, b: Float64Array): boolean {
	if (a.length !== b.length) return false;
	const x = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
	const y = new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
	for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return false;
	return true;
}

function stepN(sim: Simulation, n: number) {
	for (let k = 0; k < n && sim.state.status === 'running'; k++) sim.step();
}

describe('checkpoint and restore', () => {
	it('continues bit-identically after a msgpackr round trip of the checkpoint', () => {
		const c = defaultCase();
		c.numerics.scheme = 'van-leer';
		const straight = createSimulation(c);
		stepN(straight, 300);

		const first = createSimulation(c);
		stepN(first, 120);
		const packr = new Packr({ moreTypes: true });
		const bytes = packr.pack(first.checkpoint());
		const resumed = createSimulation(c);
		resumed.restore(packr.unpack(bytes));
		expect(resumed.state.step).toBe(120);
		stepN(resumed, 180);

		expect(resumed.state.step).toBe(straight.state.step);
		expect(Object.is(resumed.state.timeS, straight.state.timeS)).toBe(true);
		const a = straight.snapshot().fields;
		const b = resumed.snapshot().fields;
		for (const name of ['holdup', 'gasVelocity', 'liquidVelocity', 'pressure', 'gasDensity', 'slip']) expect(sameBits(a[name], b[name])).toBe(true);
		expect(resumed.residuals()).toEqual(straight.residuals());
	});

	it('keeps the checkpoint itself bit-identical through msgpackr', () => {
		const sim = createSimulation(defaultCase());
		stepN(sim, 50);
		const cp = sim.checkpoint();
		const packr = new Packr({ moreTypes: true });
		const back = packr.unpack(packr.pack(cp));
		for (const [k, v] of Object.entries(cp.data)) {
			if (v instanceof Float64Array) expect(sameBits(v, back.data[k])).toBe(true);
			else expect(back.data[k]).toEqual(v);
		}
		expect(cp.solverVersion.length).toBeGreaterThan(0);
		expect(SOLVER_VERSION).toMatch(/^\d+\.\d+\.\d+$/);
	});

	it('refuses a checkpoint written by another solver version', () => {
		const sim = createSimulation(defaultCase());
		const cp = { ...sim.checkpoint(), solverVersion: '0.0.1' };
		expect(() => createSimulation(defaultCase()).restore(cp)).toThrow(/solver 0\.0\.1 cannot continue/);
	});

	it('refuses a checkpoint of another grid', () => {
		const sim = createSimulation(defaultCase());
		const other = defaultCase();
		other.numerics.cells = 50;
		expect(() => createSimulation(other).restore(sim.checkpoint())).toThrow(/cells/);
	});
});

describe('checkpoints with mass transfer', () => {
	/** A batch re-aeration of the default two-class column, the series sampled every 0.5 s. */
	function transferCase() {
		const c = defaultCase();
		c.numerics.snapshotIntervalS = 0.5;
		c.transfer.mode = 'batch';
		return c;
	}

	it('carry the dissolved and gas-side solute, so a resumed run continues bit-identically', () => {
		const c = transferCase();
		const straight = createSimulation(c);
		stepN(straight, 400);

		const first = createSimulation(c);
		stepN(first, 150);
		const packr = new Packr({ moreTypes: true });
		const resumed = createSimulation(c);
		resumed.restore(packr.unpack(packr.pack(first.checkpoint())));
		stepN(resumed, 250);

		expect(resumed.state.step).toBe(straight.state.step);
		const a = straight.snapshot().fields;
		const b = resumed.snapshot().fields;
		for (const name of ['holdup', 'pressure', 'dissolvedConcentration', 'saturationConcentration', 'gasMoleFraction', 'gasMoleFractionSmall', 'gasMoleFractionLarge', 'transferRate']) {
			expect(sameBits(a[name], b[name])).toBe(true);
		}
		expect(resumed.residuals()).toEqual(straight.residuals());
		const ra = straight.results();
		const rb = resumed.results();
		expect(rb.series).toEqual(ra.series);
		expect(ra.series!.dissolvedOxygen.timeS.length).toBeGreaterThan(5);
		for (const [id, d] of Object.entries(ra.design)) expect(Object.is(rb.design[id].value, d.value)).toBe(true);
	});

	it('continue a one-class checkpoint of 1.1.0 without transfer, and refuse one of two classes or across the transfer change', () => {
		// 1.2.0 and 1.3.0 leave the one-class hydrodynamics operation for operation as in 1.1.0; 1.3.0 changed the
		// several-class height profile (the interfacial pressure capped at the drag)
		const c = oneClassCase();
		const one = createSimulation(c);
		stepN(one, 60);
		const again = createSimulation(c);
		again.restore({ ...one.checkpoint(), solverVersion: '1.1.0' });
		stepN(one, 40);
		stepN(again, 40);
		expect(sameBits(again.snapshot().fields.holdup, one.snapshot().fields.holdup)).toBe(true);
		const two = createSimulation(defaultCase());
		stepN(two, 10);
		expect(() => createSimulation(defaultCase()).restore({ ...two.checkpoint(), solverVersion: '1.2.0' })).toThrow(/cannot continue/);
		const t = createSimulation(transferCase());
		stepN(t, 10);
		expect(() => createSimulation(transferCase()).restore({ ...t.checkpoint(), solverVersion: '1.1.0' })).toThrow(/cannot continue/);
		// a checkpoint with transfer does not restore a case without it, nor the other way round
		expect(() => createSimulation(defaultCase()).restore(t.checkpoint())).toThrow(/mass transfer/);
		expect(() => createSimulation(transferCase()).restore(two.checkpoint())).toThrow(/mass transfer/);
	});
});

describe('invalid cases', () => {
	it('are refused with messages that name the field and the limit', () => {
		const bad = { ...defaultCase(), geometry: { heightM: 0.05, diameterM: 0.2, clearLiquidLevelM: 0.04 } };
		const v = validateCase(bad);
		expect(v.ok).toBe(false);
		if (!v.ok) {
			expect(v.issues[0].path).toBe('geometry.heightM');
			expect(v.issues[0].message).toBe('Column height must be at least 0.1 m');
		}
		try {
			createSimulation(bad);
			expect.unreachable();
		} catch (e) {
			expect(e).toBeInstanceOf(InvalidCaseError);
			expect((e as InvalidCaseError).message).toMatch(/geometry\.heightM: Column height must be at least 0\.1 m/);
		}
	});

	it('refuse an empty solute name with a message that names the field', () => {
		const c = { ...defaultCase(), fluids: { ...defaultCase().fluids, solute: '  ' } };
		const v = validateCase(c);
		expect(v.ok).toBe(false);
		if (!v.ok) expect(v.issues).toContainEqual({ path: 'fluids.solute', message: 'Solute name must not be empty' });
	});

	it('refuse a clear-liquid level at or above the column top', () => {
		const c = defaultCase();
		c.geometry.clearLiquidLevelM = 2.5;
		expect(() => createSimulation(c)).toThrow(/geometry\.clearLiquidLevelM: Clear-liquid level must be below the column height \(2 m\)/);
	});

	it('refuse a cell count that is not a whole number and a negative viscosity', () => {
		const c = defaultCase() as unknown as { numerics: { cells: number }; fluids: { liquid: { viscosityPaS: number } } };
		c.numerics.cells = 10.5;
		c.fluids.liquid.viscosityPaS = -1;
		const v = validateCase(c);
		expect(v.ok).toBe(false);
		if (!v.ok) {
			const paths = v.issues.map((i) => i.path);
			expect(paths).toContain('numerics.cells');
			expect(paths).toContain('fluids.liquid.viscosityPaS');
			expect(v.issues.find((i) => i.path === 'fluids.liquid.viscosityPaS')?.message).toBe('Liquid viscosity must be at least 0.0001 Pa·s');
		}
	});
});
