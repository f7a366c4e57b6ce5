/**
 * Reading a stored final snapshot (the `snapshots.data` bytea) for holding runs against
 * measurements. The stored layout (version 1) is the runs module's: msgpackr with `moreTypes`,
 * `{ v: 1, step, timeS, names, shape: [fields, cells], x: Float64Array, values: Float64Array }`,
 * values row-major by field. Kept here so measurements do not depend on the worker's modules.
 */
import { Packr } from 'msgpackr';

const packr = new Packr({ moreTypes: true });

export interface DecodedSnapshot {
	step: number;
	timeS: number;
	x: Float64Array;
	fields: Record<string, Float64Array>;
}

export function decodeStoredSnapshot(bytes: Uint8Array): DecodedSnapshot {
	const s = packr.unpack(bytes) as {
		v?: number;
		step: number;
		timeS: number;
		names: string[];
		shape: [number, number];
		x: Float64Array;
		values: Float64Array;
	};
	if (s?.v !== 1) throw new Error('Unknown snapshot encoding');
	const [count, cells] = s.shape;
	const values = Float64Array.from(s.values);
	const fields: Record<string, Float64Array> = {};
	for (let i = 0; i < count; i++) fields[s.names[i]] = values.subarray(i * cells, (i + 1) * cells);
	return { step: s.step, timeS: s.timeS, x: Float64Array.from(s.x), fields };
}

/** The same layout written (for tests and fixtures). */
export function encodeStoredSnapshot(snapshot: { step: number; timeS: number; x: ArrayLike<number>; fields: Record<string, ArrayLike<number>> }): Uint8Array {
	const names = Object.keys(snapshot.fields);
	const cells = snapshot.x.length;
	const values = new Float64Array(names.length * cells);
	names.forEach((n, i) => values.set(Array.from(snapshot.fields[n]), i * cells));
	return packr.pack({ v: 1, step: snapshot.step, timeS: snapshot.timeS, names, shape: [names.length, cells], x: Float64Array.from(snapshot.x), values });
}
