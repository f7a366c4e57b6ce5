/**
 * What a study's members add up to. Pure (browser and server), SI throughout.
 * - progress: counts by status and an estimate of the time left;
 * - table: every member's inputs and design numbers;
 * - band: min–max of every design number and profile across the finished members;
 * - grid convergence: apparent order, extrapolated value and GCI per design number (Celik et al. 2008),
 *   with the convergence type of Stern et al. (2001), R = ε21/ε32: 0 < R < 1 monotone,
 *   −1 < R < 0 oscillatory, |R| ≥ 1 divergent; only monotone convergence gets a number.
 */
import Papa from 'papaparse';
import { gridConvergenceIndex, type GridConvergence } from '../../../solver/gci.js';
import type { StudyPoint } from './types.js';

export interface DesignValue {
	value: number;
	unit: string;
	label: string;
}

export interface MemberResult {
	id: string;
	index: number;
	point: StudyPoint;
	status: string;
	wallTimeS: number;
	queuedAt?: string | Date | null;
	startedAt?: string | Date | null;
	finishedAt?: string | Date | null;
	errorMessage?: string | null;
	design: Record<string, DesignValue> | null;
}

export const DONE_STATUSES = ['converged', 'finished'] as const;
const ENDED = ['converged', 'finished', 'failed', 'cancelled'];

export interface StudyProgress {
	total: number;
	done: number;
	running: number;
	queued: number;
	failed: number;
	cancelled: number;
	/** fraction of members ended (any way) */
	fraction: number;
	/** estimated wall time left, s: mean member wall time × members left / members running at once; null before the first ends */
	timeLeftS: number | null;
	ended: boolean;
}

export function studyProgress(members: ReadonlyArray<Pick<MemberResult, 'status' | 'wallTimeS'>>, slots?: number): StudyProgress {
	const count = (s: string) => members.filter((m) => m.status === s).length;
	const done = count('converged') + count('finished');
	const running = count('running');
	const queued = count('queued');
	const failed = count('failed');
	const cancelled = count('cancelled');
	const ended = done + failed + cancelled;
	const finishedTimes = members.filter((m) => (DONE_STATUSES as readonly string[]).includes(m.status)).map((m) => m.wallTimeS);
	const mean = finishedTimes.length ? finishedTimes.reduce((a, b) => a + b, 0) / finishedTimes.length : null;
	const parallel = Math.max(1, slots ?? running ?? 1, running);
	const left = members.length - ended;
	return {
		total: members.length,
		done,
		running,
		queued,
		failed,
		cancelled,
		fraction: members.length ? ended / members.length : 1,
		timeLeftS: left === 0 ? 0 : mean === null ? null : (mean * left) / parallel,
		ended: members.length > 0 && members.every((m) => ENDED.includes(m.status))
	};
}

/** Design-number ids present in the finished members, in first-seen order. */
export function designIds(members: ReadonlyArray<Pick<MemberResult, 'design'>>): string[] {
	const seen = new Set<string>();
	for (const m of members) for (const k of Object.keys(m.design ?? {})) seen.add(k);
	return [...seen];
}

export interface Band {
	min: number;
	max: number;
	/** (max − min) / |mean| — the model-form spread as a fraction */
	relativeSpread: number;
	count: number;
}

/** Min–max of each design number across the members that have it. */
export function designBand(members: ReadonlyArray<Pick<MemberResult, 'design'>>): Record<string, Band> {
	const out: Record<string, Band> = {};
	for (const id of designIds(members)) {
		const v = members.map((m) => m.design?.[id]?.value).filter((x): x is number => typeof x === 'number' && Number.isFinite(x));
		if (!v.length) continue;
		const min = Math.min(...v);
		const max = Math.max(...v);
		const mean = v.reduce((a, b) => a + b, 0) / v.length;
		out[id] = { min, max, relativeSpread: mean === 0 ? 0 : (max - min) / Math.abs(mean), count: v.length };
	}
	return out;
}

export interface ProfileBand {
	x: number[];
	min: number[];
	max: number[];
}

/**
 * Min–max envelope of one profile across members. Members on the same grid are compared cell by
 * cell; a member on another grid is interpolated linearly onto the first member's x.
 */
export function profileBand(profiles: ReadonlyArray<{ x: ArrayLike<number>; y: ArrayLike<number> }>): ProfileBand | null {
	if (!profiles.length) return null;
	const x = Array.from(profiles[0].x);
	const min = x.map(() => Infinity);
	const max = x.map(() => -Infinity);
	for (const p of profiles) {
		const same = p.x.length === x.length && x.every((xi, i) => xi === p.x[i]);
		for (let i = 0; i < x.length; i++) {
			const y = same ? p.y[i] : interpolate(p, x[i]);
			if (y < min[i]) min[i] = y;
			if (y > max[i]) max[i] = y;
		}
	}
	return { x, min, max };
}

function interpolate(p: { x: ArrayLike<number>; y: ArrayLike<number> }, at: number): number {
	const n = p.x.length;
	if (at <= p.x[0]) return p.y[0];
	if (at >= p.x[n - 1]) return p.y[n - 1];
	let lo = 0;
	let hi = n - 1;
	while (hi - lo > 1) {
		const mid = (lo + hi) >> 1;
		if (p.x[mid] <= at) lo = mid;
		else hi = mid;
	}
	const w = (at - p.x[lo]) / (p.x[hi] - p.x[lo]);
	return p.y[lo] + w * (p.y[hi] - p.y[lo]);
}

export type ConvergenceType = 'monotone' | 'oscillatory' | 'divergent' | 'grid-independent' | 'incomplete';

export interface DesignConvergence {
	id: string;
	label: string;
	unit: string;
	/** finest first: the three grids used */
	cells: [number, number, number] | null;
	values: [number, number, number] | null;
	type: ConvergenceType;
	/** R = ε21/ε32 (Stern et al. 2001) */
	ratio: number | null;
	/** the Celik et al. (2008) numbers, only for monotone convergence */
	gci: GridConvergence | null;
	note: string;
}

/**
 * Grid convergence of every design number from the three finest finished grids. Grid members
 * carry `point.values.cells`; `cellSizeOf(cells)` is the representative cell size (in 1D the
 * length divided by the cells: `spec.cellSize`).
 */
export function gridConvergence(members: ReadonlyArray<MemberResult>, cellSizeOf: (cells: number) => number): DesignConvergence[] {
	const finished = members
		.filter((m) => (DONE_STATUSES as readonly string[]).includes(m.status) && m.design)
		.sort((a, b) => Number(b.point.values.cells) - Number(a.point.values.cells));
	const ids = designIds(finished);
	return ids.map((id) => {
		const first = finished.find((m) => m.design?.[id])!.design![id];
		const base = { id, label: first.label, unit: first.unit };
		const usable = finished.filter((m) => Number.isFinite(m.design?.[id]?.value));
		if (usable.length < 3) {
			return { ...base, cells: null, values: null, type: 'incomplete' as const, ratio: null, gci: null, note: `${usable.length} of the 3 grids needed have finished` };
		}
		const three = usable.slice(0, 3);
		const cells = three.map((m) => Number(m.point.values.cells)) as [number, number, number];
		const values = three.map((m) => m.design![id].value) as [number, number, number];
		const e21 = values[1] - values[0];
		const e32 = values[2] - values[1];
		const scale = Math.max(Math.abs(values[0]), Math.abs(values[1]), Math.abs(values[2]), 1e-300);
		if (Math.abs(e21) <= 1e-12 * scale && Math.abs(e32) <= 1e-12 * scale) {
			return { ...base, cells, values, type: 'grid-independent' as const, ratio: null, gci: null, note: 'the same on all three grids (to round-off)' };
		}
		const ratio = e32 === 0 ? Infinity : e21 / e32;
		if (!(Math.abs(ratio) < 1)) {
			return { ...base, cells, values, type: 'divergent' as const, ratio, gci: null, note: 'the change between grids grows with refinement: no extrapolation' };
		}
		if (ratio === 0) {
			return { ...base, cells, values, type: 'grid-independent' as const, ratio, gci: null, note: 'the two finest grids agree (to round-off); the coarsest differs' };
		}
		if (ratio < 0) {
			return { ...base, cells, values, type: 'oscillatory' as const, ratio, gci: null, note: 'the change between grids alternates in sign: refine further' };
		}
		const gci = gridConvergenceIndex({ cellSizes: cells.map((n) => cellSizeOf(n)) as [number, number, number], values });
		return { ...base, cells, values, type: 'monotone' as const, ratio, gci, note: '' };
	});
}

/** The operating-point fields of a measurement a sweep input can be matched on. */
const measuredInput: Record<string, 'superficialGasVelocityMS' | 'temperatureK' | 'pressurePa'> = {
	superficialGasVelocityMS: 'superficialGasVelocityMS',
	temperatureK: 'temperatureK',
	topPressurePa: 'pressurePa'
};

export interface SweepPoint {
	x: number;
	y: number;
	name: string;
}

/**
 * Measured points for a sweep chart of the overall holdup: each holdup-along-the-height measurement
 * of the column whose other operating conditions match the base case (within the comparison
 * tolerances: U_g ±10 %, T ±5 K, p ±10 %) gives one point at its own value of the swept input, with
 * the height-mean of its holdup (trapezoidal in z over the measured span — an estimate of the
 * aerated-region mean, good when the taps span the aerated height). Only inputs that are part of
 * a measurement's operating point (U_g, T, top pressure) can be matched.
 */
export function sweepMeasurementPoints(o: {
	input: string;
	base: { superficialGasVelocityMS: number; temperatureK: number; pressurePa: number };
	measurements: ReadonlyArray<{ name: string; kind: string; superficialGasVelocityMS: number; temperatureK: number; pressurePa: number; data: { x: number[]; y: number[] } }>;
}): SweepPoint[] {
	const key = measuredInput[o.input];
	if (!key) return [];
	const out: SweepPoint[] = [];
	for (const m of o.measurements) {
		if (m.kind !== 'holdup-height' || m.data.x.length < 2) continue;
		const others = (['superficialGasVelocityMS', 'temperatureK', 'pressurePa'] as const).filter((k) => k !== key);
		const ok = others.every((k) =>
			k === 'temperatureK' ? Math.abs(m.temperatureK - o.base.temperatureK) <= 5 : Math.abs(m[k] - o.base[k]) <= 0.1 * Math.abs(m[k]) + 1e-9
		);
		if (!ok) continue;
		const pairs = m.data.x.map((x, i) => [x, m.data.y[i]] as const).sort((a, b) => a[0] - b[0]);
		let area = 0;
		for (let i = 1; i < pairs.length; i++) area += 0.5 * (pairs[i][1] + pairs[i - 1][1]) * (pairs[i][0] - pairs[i - 1][0]);
		const span = pairs[pairs.length - 1][0] - pairs[0][0];
		if (span > 0) out.push({ x: m[key], y: area / span, name: m.name });
	}
	return out.sort((a, b) => a.x - b.x);
}

/**
 * CSV of every member: position, label, swept values, status, wall time and each design number in
 * SI (header `label [unit]`, `[-]` for dimensionless). papaparse writes it, escaping text a
 * spreadsheet would run as a formula.
 */
export function membersToCsv(members: ReadonlyArray<MemberResult>): string {
	const ids = designIds(members);
	const valueKeys = [...new Set(members.flatMap((m) => Object.keys(m.point.values)))];
	const first = (id: string) => members.find((m) => m.design?.[id])!.design![id];
	const unit = (u: string) => (u === '1' || u === '' ? '-' : u);
	const fields = ['member', 'label', ...valueKeys, 'status', 'wall time [s]', ...ids.map((id) => `${id} [${unit(first(id).unit)}]`)];
	const data = [...members]
		.sort((a, b) => a.index - b.index)
		.map((m) => [
			m.index + 1,
			m.point.label,
			...valueKeys.map((k) => m.point.values[k] ?? ''),
			m.status,
			m.wallTimeS,
			...ids.map((id) => {
				const v = m.design?.[id]?.value;
				return typeof v === 'number' && Number.isFinite(v) ? v : '';
			})
		]);
	return Papa.unparse({ fields, data }, { escapeFormulae: true });
}
