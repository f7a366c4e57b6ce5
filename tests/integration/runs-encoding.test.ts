/**
 * What runs store and stream, without a database: snapshot and checkpoint encodings, event
 * cursors, and which steps keep a residual row.
 */
import { describe, expect, it } from 'vitest';
import { decodeCheckpoint, decodeSnapshot, encodeCheckpoint, encodeSnapshot } from '../../src/lib/server/runs/codec.js';
import { formatCursor, parseCursor, START_CURSOR, statusKey } from '../../src/lib/server/runs/events.js';
import { storesResidualStep } from '../../worker/jobs/solve-protocol.js';
import { createSimulation, defaultCase } from '../../solver/index.js';
import type { Snapshot } from '../../solver/types.js';

function bits(a: Float64Array): string {
	return Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('hex');
}

/** IEEE 754 special values (common practice for codec tests): zeros, extremes, subnormals, NaN, infinities. */
const SPECIAL = [0, -0, 1, -1, Number.MIN_VALUE, -Number.MIN_VALUE, 2.2250738585072014e-308, Number.MAX_VALUE, Number.EPSILON, NaN, Infinity, -Infinity];

function snapshotOf(values: number[]): Snapshot {
	const n = values.length;
	return {
		step: 12,
		timeS: 0.75,
		x: Float64Array.from({ length: n }, (_, i) => (i + 0.5) / n),
		fields: { holdup: Float64Array.from(values), pressure: Float64Array.from(values, (v) => -v) }
	};
}

describe('snapshot encoding', () => {
	it('keeps a Float64 snapshot bit for bit, special values included', () => {
		const snap = snapshotOf(SPECIAL);
		const back = decodeSnapshot(encodeSnapshot(snap, { precision: 'float64' }));
		expect(back.step).toBe(12);
		expect(back.timeS).toBe(0.75);
		expect(Object.keys(back.fields)).toEqual(['holdup', 'pressure']);
		expect(bits(back.fields.holdup)).toBe(bits(snap.fields.holdup));
		expect(bits(back.fields.pressure)).toBe(bits(snap.fields.pressure));
		expect(bits(back.x)).toBe(bits(snap.x));
	});

	it('rounds a Float32 snapshot exactly as IEEE 754 single precision does (Math.fround)', () => {
		const values = [0.1, 1 / 3, 101325.123456, 1e-7, 0.987654321, ...SPECIAL];
		const back = decodeSnapshot(encodeSnapshot(snapshotOf(values), { precision: 'float32' }));
		// Math.fround is the ECMAScript definition of rounding to the nearest binary32 value
		expect(Array.from(back.fields.holdup)).toEqual(values.map(Math.fround));
		expect(back.fields.holdup).toBeInstanceOf(Float64Array);
		// 1/3 survives to 7 significant digits, the resolution of binary32 (24-bit significand)
		expect(back.fields.holdup[1]).toBeCloseTo(1 / 3, 7);
	});

	it('stores about 4 bytes per value per cell in Float32 and 8 in Float64, positions and header included', () => {
		const cells = 100;
		const snap: Snapshot = {
			step: 1,
			timeS: 1,
			x: Float64Array.from({ length: cells }, (_, i) => i / cells),
			fields: Object.fromEntries(['holdup', 'gasVelocity', 'liquidVelocity', 'pressure', 'gasDensity', 'slip'].map((f, k) => [f, Float64Array.from({ length: cells }, (_, i) => Math.sin(i + k))]))
		};
		const valuesPerSnapshot = 6 * cells;
		const f32 = encodeSnapshot(snap, { precision: 'float32' }).byteLength / valuesPerSnapshot;
		const f64 = encodeSnapshot(snap, { precision: 'float64' }).byteLength / valuesPerSnapshot;
		// 7 arrays of 100 (six fields + positions) over 600 values: 4·7/6 ≈ 4.67 and 8·7/6 ≈ 9.33, plus a header
		expect(f32).toBeGreaterThan(4.67);
		expect(f32).toBeLessThan(5.0);
		expect(f64).toBeGreaterThan(9.33);
		expect(f64).toBeLessThan(9.7);
	});
});

describe('checkpoint encoding', () => {
	it('lets a restored simulation continue bit-identically to one that never stopped', () => {
		const c = defaultCase('height-profile');
		c.geometry.heightM = 1;
		c.geometry.clearLiquidLevelM = 0.7;
		c.numerics.cells = 40;
		const a = createSimulation(c);
		for (let i = 0; i < 60; i++) a.step();
		const bytes = encodeCheckpoint({ solver: a.checkpoint(), nextSnapshotIndex: 3, wallTimeS: 1.25 });
		const stored = decodeCheckpoint(bytes);
		expect(stored.nextSnapshotIndex).toBe(3);
		expect(stored.wallTimeS).toBe(1.25);
		const b = createSimulation(c);
		b.restore(stored.solver);
		for (let i = 0; i < 60; i++) {
			a.step();
			b.step();
		}
		expect(b.state.step).toBe(a.state.step);
		expect(b.state.timeS).toBe(a.state.timeS);
		expect(b.residuals()).toEqual(a.residuals());
		for (const name of Object.keys(a.snapshot().fields)) expect(bits(b.snapshot().fields[name])).toBe(bits(a.snapshot().fields[name]));
	});
});

describe('event cursors', () => {
	it('round-trip through text and treat anything malformed as the start', () => {
		const c = { step: 1234, snapshotId: 56, statusKey: 7 };
		expect(formatCursor(c)).toBe('1234.56.7');
		expect(parseCursor('1234.56.7')).toEqual(c);
		for (const bad of [null, undefined, '', 'abc', '1.2', '-1.0.0', '1.2.3.4', '1e3.0.0']) expect(parseCursor(bad)).toEqual(START_CURSOR);
	});

	it('give every status change of a run a larger key, through a crash and a resume', () => {
		const life = [
			{ status: 'queued', attempts: 0 },
			{ status: 'running', attempts: 1 },
			{ status: 'queued', attempts: 1 },
			{ status: 'running', attempts: 2 },
			{ status: 'finished', attempts: 2 }
		];
		const keys = life.map(statusKey);
		for (let i = 1; i < keys.length; i++) expect(keys[i]).toBeGreaterThan(keys[i - 1]);
		// cancelled while still queued also moves forward
		expect(statusKey({ status: 'cancelled', attempts: 0 })).toBeGreaterThan(statusKey({ status: 'queued', attempts: 0 }));
		expect(keys[0]).toBeGreaterThan(START_CURSOR.statusKey);
	});
});

describe('stored residual steps', () => {
	it('keeps every step below 1000 and then 900 per decade', () => {
		const count = (from: number, to: number) => {
			let n = 0;
			for (let s = from; s <= to; s++) if (storesResidualStep(s)) n++;
			return n;
		};
		expect(count(1, 999)).toBe(999);
		expect(count(1000, 9999)).toBe(900);
		expect(count(10_000, 99_999)).toBe(900);
		expect(storesResidualStep(1000)).toBe(true);
		expect(storesResidualStep(1005)).toBe(false);
		expect(storesResidualStep(12_300)).toBe(true);
		expect(storesResidualStep(12_310)).toBe(false);
	});
});
