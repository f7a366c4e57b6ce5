import { describe, expect, it } from 'vitest';
import { decodeSnapshot as decodeStoredSnapshot, encodeSnapshot as encodeStoredSnapshot } from '../../src/lib/server/runs/codec.js';

describe('stored snapshots', () => {
	it('decode to the fields written, bit for bit', () => {
		const x = new Float64Array([0.05, 0.15, 0.25]);
		const holdup = new Float64Array([0.1, 0.123456789012345, 1 / 3]);
		const pressure = new Float64Array([1.2e5, 1.1e5, 1.0e5]);
		const back = decodeStoredSnapshot(encodeStoredSnapshot({ step: 7, timeS: 1.5, x, fields: { holdup, pressure } }));
		expect(back.step).toBe(7);
		expect(back.timeS).toBe(1.5);
		expect(Array.from(back.x)).toEqual(Array.from(x));
		expect(Array.from(back.fields.holdup)).toEqual(Array.from(holdup));
		expect(Array.from(back.fields.pressure)).toEqual(Array.from(pressure));
	});
});
