/**
 * Binary encodings of what the worker stores as `bytea`: snapshots and checkpoints.
 *
 * A snapshot is stored ndarray-shaped: one row-major typed array of shape `[field, cell]` plus the
 * field names and the cell-centre positions. Periodic snapshots (what the live page and the
 * time slider show) are Float32 — 4 bytes per value per cell, 7 significant digits, far below any
 * plotting resolution; the final snapshot of a run, which comparisons and exports read, is Float64
 * and bit-identical to the solver's profiles. Decoding always returns Float64Arrays.
 *
 * msgpackr decodes a packed typed array as a Buffer unless `moreTypes` is on for both sides.
 */
import { Packr } from 'msgpackr';
import type { Checkpoint, Snapshot } from '../../../../solver/types.js';

const packr = new Packr({ moreTypes: true });

export type SnapshotPrecision = 'float32' | 'float64';

/** The stored layout of one snapshot (version 1). */
interface StoredSnapshot {
	v: 1;
	step: number;
	timeS: number;
	names: string[];
	/** `[fields, cells]` */
	shape: [number, number];
	x: Float64Array | Float32Array;
	values: Float64Array | Float32Array;
}

/** Accepts any array-likes (tests and fixtures pass plain arrays); the solver passes its typed arrays. */
export function encodeSnapshot(
	snapshot: { step: number; timeS: number; x: ArrayLike<number>; fields: Record<string, ArrayLike<number>> },
	options: { precision?: SnapshotPrecision } = {}
): Uint8Array {
	const names = Object.keys(snapshot.fields);
	const cells = snapshot.x.length;
	const Typed = options.precision === 'float32' ? Float32Array : Float64Array;
	const values = new Typed(names.length * cells);
	names.forEach((name, i) => {
		const field = snapshot.fields[name];
		if (field.length !== cells) throw new Error(`Snapshot field ${name} has ${field.length} values for ${cells} cells`);
		values.set(field, i * cells);
	});
	const stored: StoredSnapshot = {
		v: 1,
		step: snapshot.step,
		timeS: snapshot.timeS,
		names,
		shape: [names.length, cells],
		x: Typed.from(snapshot.x),
		values
	};
	return packr.pack(stored);
}

export function decodeSnapshot(bytes: Uint8Array): Snapshot {
	const stored = packr.unpack(bytes) as StoredSnapshot;
	if (stored?.v !== 1) throw new Error('Unknown snapshot encoding');
	const [fieldCount, cells] = stored.shape;
	// copy out of the decode buffer so callers may keep fields independently of it
	const values = Float64Array.from(stored.values);
	const fields: Record<string, Float64Array> = {};
	for (let i = 0; i < fieldCount; i++) fields[stored.names[i]] = values.subarray(i * cells, (i + 1) * cells);
	return { step: stored.step, timeS: stored.timeS, x: Float64Array.from(stored.x), fields };
}

/**
 * A stored checkpoint: the solver's own checkpoint plus the worker's high-water marks, so a resumed
 * attempt knows which snapshot comes next and how much wall time the run has used.
 */
export interface StoredCheckpoint {
	v: 1;
	solver: Checkpoint;
	/** index k of the next periodic snapshot, due at simulated time k·interval */
	nextSnapshotIndex: number;
	/** wall time the run had used when the checkpoint was taken, s */
	wallTimeS: number;
}

export function encodeCheckpoint(cp: Omit<StoredCheckpoint, 'v'>): Uint8Array {
	return packr.pack({ v: 1, ...cp } satisfies StoredCheckpoint);
}

export function decodeCheckpoint(bytes: Uint8Array): StoredCheckpoint {
	const stored = packr.unpack(bytes) as StoredCheckpoint;
	if (stored?.v !== 1) throw new Error('Unknown checkpoint encoding');
	return stored;
}
