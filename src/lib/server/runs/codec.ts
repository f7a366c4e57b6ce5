/**
 * Binary encodings of what the worker stores as `bytea`: snapshots and checkpoints.
 *
 * A snapshot is stored ndarray-shaped: one row-major `Float64Array` of shape `[field, cell]` plus the
 * field names and the cell-centre positions, so a profile costs 8 bytes per value per cell plus a
 * few dozen bytes of header. Float64 keeps the stored profiles bit-identical to the solver's.
 *
 * msgpackr decodes a packed `Float64Array` as a Buffer unless `moreTypes` is on for both sides.
 */
import { Packr } from 'msgpackr';
import type { Checkpoint, Snapshot } from '../../../../solver/types.js';

const packr = new Packr({ moreTypes: true });

/** The stored layout of one snapshot (version 1). */
interface StoredSnapshot {
	v: 1;
	step: number;
	timeS: number;
	names: string[];
	/** `[fields, cells]` */
	shape: [number, number];
	x: Float64Array;
	values: Float64Array;
}

export function encodeSnapshot(snapshot: Snapshot): Uint8Array {
	const names = Object.keys(snapshot.fields);
	const cells = snapshot.x.length;
	const values = new Float64Array(names.length * cells);
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
		x: Float64Array.from(snapshot.x),
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
