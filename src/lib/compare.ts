/**
 * Pure helpers of the comparison screen: which closure choices differ between runs, design
 * numbers against the baseline, and the spread of a profile across runs as a band.
 */
import { interpolateLinear } from './measurements/compare.js';
import { getPath } from './components/case-editor/fields.js';
import { categoricalDesign, categoryParts } from './fields.js';

export interface CompareRun {
	id: string;
	label: string;
	/** the run's frozen case document (closures, numerics …) */
	caseDocument: { closures: Record<string, unknown>; bubbles?: Record<string, unknown>; transfer?: Record<string, unknown>; numerics?: Record<string, unknown>; kind?: string };
	design: Record<string, { value: number; unit: string; label: string }>;
}

export interface ClosureRow {
	/** dotted path in the case document, e.g. `closures.drag` */
	key: string;
	values: unknown[];
	/** true when not every run has the same value */
	differs: boolean;
}

/**
 * One row per model choice, flagged where the compared runs disagree: the given dotted paths of the
 * case document (the screen passes the editor's closure, bubble-class and transfer fields), or
 * every closure setting when none are given.
 */
export function closureTable(runs: CompareRun[], paths?: string[]): ClosureRow[] {
	const keys = new Set<string>(paths ?? []);
	if (!paths) for (const r of runs) for (const k of Object.keys(r.caseDocument.closures ?? {})) keys.add(`closures.${k}`);
	return [...keys].map((key) => {
		const values = runs.map((r) => getPath(r.caseDocument, key));
		const first = JSON.stringify(values[0]);
		return { key, values, differs: values.some((v) => JSON.stringify(v) !== first) };
	});
}

export interface DesignRow {
	id: string;
	label: string;
	unit: string;
	values: (number | null)[];
	/** value − baseline value, per run (null for the baseline itself or when missing) */
	deltas: (number | null)[];
	/** (value − baseline) / |baseline|, per run */
	relativeDeltas: (number | null)[];
	/** for a categorical number (`categoricalDesign`) the category each run names, e.g. `core-peaked`; else null */
	categories: (string | null)[];
}

/** Design numbers side by side with their deltas against the baseline run. */
export function designTable(options: { runs: CompareRun[]; baselineId: string }): DesignRow[] {
	const { runs, baselineId } = options;
	const base = runs.find((r) => r.id === baselineId) ?? runs[0];
	const ids: string[] = [];
	for (const r of runs) for (const k of Object.keys(r.design ?? {})) if (!ids.includes(k)) ids.push(k);
	return ids.map((id) => {
		const meta = runs.map((r) => r.design?.[id]).find((d) => d);
		const values = runs.map((r) => (r.design?.[id] && Number.isFinite(r.design[id].value) ? r.design[id].value : null));
		if (categoricalDesign.has(id)) {
			// `Holdup peak: core-peaked`: the name once, the category per run, no arithmetic on the codes
			const categories = runs.map((r) => (r.design?.[id] ? categoryParts(r.design[id].label).category || null : null));
			const none = runs.map(() => null);
			return { id, label: meta ? categoryParts(meta.label).name : id, unit: meta?.unit ?? '', values, deltas: none, relativeDeltas: none, categories };
		}
		const b = base.design?.[id]?.value;
		const deltas = runs.map((r, i) => (r.id === base.id || values[i] === null || b === undefined ? null : (values[i] as number) - b));
		const relativeDeltas = deltas.map((d) => (d === null || !b ? null : d / Math.abs(b)));
		return { id, label: meta?.label ?? id, unit: meta?.unit ?? '', values, deltas, relativeDeltas, categories: runs.map(() => null) };
	});
}

/**
 * Linear interpolation of (x, y) at `at`, x ascending; clamped to the end values outside; NaN for
 * an empty profile (a run without that field adds nothing to the band).
 */
export function interpolate(x: ArrayLike<number>, y: ArrayLike<number>, at: number): number {
	return x.length === 0 ? Number.NaN : interpolateLinear({ x, y, at });
}

/**
 * The spread of several profiles: each is interpolated onto the grid `x` (the baseline's), and the
 * band is the pointwise minimum and maximum. Outside a profile's range its end value is used,
 * so runs on different column heights still give a closed band.
 */
export function spreadBand(options: { x: ArrayLike<number>; profiles: { x: ArrayLike<number>; y: ArrayLike<number> }[] }) {
	const { x, profiles } = options;
	const lower = new Float64Array(x.length);
	const upper = new Float64Array(x.length);
	for (let i = 0; i < x.length; i++) {
		let lo = Infinity;
		let hi = -Infinity;
		for (const p of profiles) {
			const v = interpolate(p.x, p.y, x[i]);
			if (!Number.isFinite(v)) continue;
			lo = Math.min(lo, v);
			hi = Math.max(hi, v);
		}
		lower[i] = Number.isFinite(lo) ? lo : Number.NaN;
		upper[i] = Number.isFinite(hi) ? hi : Number.NaN;
	}
	return { x: Float64Array.from(x), lower, upper };
}
