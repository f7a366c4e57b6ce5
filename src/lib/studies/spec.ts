/**
 * What a study asks, and the member cases it expands to. Pure (browser and server): the new-study
 * form shows the member count and any invalid member before anything is queued, and the server
 * expands the same spec inside the transaction that queues the members.
 *
 * Three kinds:
 * - sweep: one input, or two as a grid, over a list or a range (linear or logarithmic steps);
 * - closure matrix: every combination of the ticked options of the closure families the case kind uses;
 * - grid study: the same case on three or more grids, successive refinement ratio ≥ 1.3
 *   (Celik et al. 2008 recommend r > 1.3).
 */
import { z } from 'zod';
import {
	dragLaws,
	largeBubbleDrags,
	liftModels,
	swarmCorrections,
	turbulentDispersionModels,
	validateCase,
	virtualMassModels,
	wallLubricationModels,
	type CaseDocument,
	type CaseKind
} from '../../../solver/case.js';
import { dragCatalog, swarmCatalog, virtualMassCatalog, liftCatalog, wallLubricationCatalog, turbulentDispersionCatalog, largeBubbleDragCatalog } from '../../../solver/closures/catalog.js';

export const studyKinds = ['sweep', 'closure-matrix', 'grid'] as const;
export type StudyKind = (typeof studyKinds)[number];

export const studyKindLabels: Record<StudyKind, string> = {
	sweep: 'Sweep',
	'closure-matrix': 'Closure matrix',
	grid: 'Grid study'
};

/** Inputs a sweep can vary: where they sit in the case document, in SI. */
export const sweepInputs = {
	superficialGasVelocityMS: { label: 'Superficial gas velocity', symbol: 'U_g', unit: 'm/s', path: ['sparging', 'superficialGasVelocityMS'] },
	bubbleDiameterM: { label: 'Bubble diameter', symbol: 'd_b', unit: 'm', path: ['bubbles', 'diameterM'] },
	columnDiameterM: { label: 'Column diameter', symbol: 'D', unit: 'm', path: ['geometry', 'diameterM'] },
	clearLiquidLevelM: { label: 'Clear-liquid level', symbol: 'H_0', unit: 'm', path: ['geometry', 'clearLiquidLevelM'] },
	topPressurePa: { label: 'Top pressure', symbol: 'p_top', unit: 'Pa', path: ['fluids', 'topPressurePa'] },
	temperatureK: { label: 'Temperature', symbol: 'T', unit: 'K', path: ['fluids', 'temperatureK'] },
	liquidViscosityPaS: { label: 'Liquid viscosity', symbol: 'μ_L', unit: 'Pa·s', path: ['fluids', 'liquid', 'viscosityPaS'] }
} as const satisfies Record<string, { label: string; symbol: string; unit: string; path: readonly string[] }>;
export type SweepInput = keyof typeof sweepInputs;
export const sweepInputIds = Object.keys(sweepInputs) as [SweepInput, ...SweepInput[]];

/** The most members one axis may have (the team's study cap limits the whole study). */
export const MAX_AXIS_POINTS = 50;
export const MIN_GRIDS = 3;
export const MAX_GRIDS = 6;
/** smallest refinement ratio between successive grids (Celik et al. 2008: r > 1.3) */
export const MIN_REFINEMENT_RATIO = 1.3;

const finite = (what: string) => z.number({ error: `${what} must be a number` }).refine(Number.isFinite, { error: `${what} must be finite` });

export const sweepAxisSchema = z
	.object({
		input: z.enum(sweepInputIds, { error: `input must be one of ${sweepInputIds.join(', ')}` }),
		spacing: z.enum(['list', 'linear', 'log'], { error: 'spacing must be list, linear or log' }),
		/** for spacing = list: the values in SI */
		values: z.array(finite('Each value')).max(MAX_AXIS_POINTS, { error: `At most ${MAX_AXIS_POINTS} values per input` }).optional(),
		from: finite('From').optional(),
		to: finite('To').optional(),
		count: z.number().int({ error: 'Steps must be a whole number' }).min(2, { error: 'At least 2 steps' }).max(MAX_AXIS_POINTS, { error: `At most ${MAX_AXIS_POINTS} steps` }).optional()
	})
	.superRefine((a, ctx) => {
		if (a.spacing === 'list') {
			if (!a.values?.length) ctx.addIssue({ code: 'custom', path: ['values'], message: 'Give at least one value' });
			return;
		}
		if (a.from === undefined) ctx.addIssue({ code: 'custom', path: ['from'], message: 'From is required for a range' });
		if (a.to === undefined) ctx.addIssue({ code: 'custom', path: ['to'], message: 'To is required for a range' });
		if (a.count === undefined) ctx.addIssue({ code: 'custom', path: ['count'], message: 'Steps is required for a range' });
		if (a.from !== undefined && a.to !== undefined && a.from === a.to) ctx.addIssue({ code: 'custom', path: ['to'], message: 'To must differ from From' });
		if (a.spacing === 'log' && ((a.from ?? 1) <= 0 || (a.to ?? 1) <= 0)) {
			ctx.addIssue({ code: 'custom', path: [(a.from ?? 1) <= 0 ? 'from' : 'to'], message: 'Logarithmic steps need positive From and To' });
		}
	});
export type SweepAxis = z.infer<typeof sweepAxisSchema>;

export const sweepSpecSchema = z
	.object({
		kind: z.literal('sweep'),
		axes: z.array(sweepAxisSchema).min(1, { error: 'Pick an input to sweep' }).max(2, { error: 'A sweep varies at most two inputs' })
	})
	.refine((s) => s.axes.length < 2 || s.axes[0].input !== s.axes[1].input, { error: 'The two inputs must differ', path: ['axes', 1, 'input'] });

/** Closure families a matrix can span, the case kinds that use them, and their options. */
export const matrixFamilies = {
	drag: { label: 'Drag law', path: ['closures', 'drag'], options: dragLaws, catalog: dragCatalog, kinds: ['height-profile', 'cross-section'] },
	swarm: { label: 'Swarm correction', path: ['closures', 'swarm'], options: swarmCorrections, catalog: swarmCatalog, kinds: ['height-profile', 'cross-section'] },
	virtualMass: { label: 'Virtual mass', path: ['closures', 'virtualMass'], options: virtualMassModels, catalog: virtualMassCatalog, kinds: ['height-profile'] },
	largeDrag: { label: 'Large-bubble drag', path: ['bubbles', 'largeDrag'], options: largeBubbleDrags, catalog: largeBubbleDragCatalog, kinds: ['height-profile', 'cross-section'] },
	lift: { label: 'Lift', path: ['closures', 'lift'], options: liftModels, catalog: liftCatalog, kinds: ['cross-section'] },
	wallLubrication: { label: 'Wall lubrication', path: ['closures', 'wallLubrication'], options: wallLubricationModels, catalog: wallLubricationCatalog, kinds: ['cross-section'] },
	turbulentDispersion: { label: 'Turbulent dispersion', path: ['closures', 'turbulentDispersion'], options: turbulentDispersionModels, catalog: turbulentDispersionCatalog, kinds: ['cross-section'] }
} as const;
export type MatrixFamily = keyof typeof matrixFamilies;
export const matrixFamilyIds = Object.keys(matrixFamilies) as [MatrixFamily, ...MatrixFamily[]];

/** The families a case of this kind uses (large-bubble drag only with two bubble classes). */
export function familiesFor(caseDoc: Pick<CaseDocument, 'kind' | 'bubbles'>): MatrixFamily[] {
	return matrixFamilyIds.filter((f) => {
		if (!(matrixFamilies[f].kinds as readonly CaseKind[]).includes(caseDoc.kind)) return false;
		return f !== 'largeDrag' || caseDoc.bubbles.classes === 'small-large';
	});
}

export const matrixSpecSchema = z.object({
	kind: z.literal('closure-matrix'),
	/** per family, the ticked options; a family left out keeps the base case's choice */
	options: z.partialRecord(z.enum(matrixFamilyIds), z.array(z.string().max(60)).max(12))
});

export const gridSpecSchema = z.object({
	kind: z.literal('grid'),
	/** cell counts, any order; sorted finest first when expanded */
	cells: z
		.array(z.number().int({ error: 'Cell counts must be whole numbers' }).min(10, { error: 'At least 10 cells per grid' }).max(5000, { error: 'At most 5000 cells per grid' }))
		.min(MIN_GRIDS, { error: `A grid study needs at least ${MIN_GRIDS} grids` })
		.max(MAX_GRIDS, { error: `At most ${MAX_GRIDS} grids` })
});

export const studySpecSchema = z.discriminatedUnion('kind', [sweepSpecSchema, matrixSpecSchema, gridSpecSchema], {
	error: 'kind must be sweep, closure-matrix or grid'
});
export type StudySpec = z.infer<typeof studySpecSchema>;
export type SweepSpec = z.infer<typeof sweepSpecSchema>;
export type MatrixSpec = z.infer<typeof matrixSpecSchema>;
export type GridSpec = z.infer<typeof gridSpecSchema>;

export interface StudyMember {
	index: number;
	label: string;
	values: Record<string, number | string>;
	caseDoc: CaseDocument;
}

export interface ExpansionIssue {
	path: string;
	message: string;
}

export type Expansion = { ok: true; members: StudyMember[] } | { ok: false; issues: ExpansionIssue[] };

/** The values of one sweep axis, in SI; ranges are rounded to 6 significant digits. */
export function axisValues(a: SweepAxis): number[] {
	if (a.spacing === 'list') return [...(a.values ?? [])];
	const n = a.count ?? 2;
	const from = a.from ?? 0;
	const to = a.to ?? 0;
	const out: number[] = [];
	for (let i = 0; i < n; i++) {
		const t = i / (n - 1);
		const v = a.spacing === 'log' ? from * Math.pow(to / from, t) : from + (to - from) * t;
		out.push(Number(v.toPrecision(6)));
	}
	return out;
}

/** Cartesian product of named option lists, in order (first list slowest). */
function product<T>(lists: Array<{ key: string; items: T[] }>): Array<Record<string, T>> {
	let rows: Array<Record<string, T>> = [{}];
	for (const { key, items } of lists) rows = rows.flatMap((r) => items.map((it) => ({ ...r, [key]: it })));
	return rows;
}

function setPath(doc: Record<string, unknown>, path: readonly string[], value: unknown): void {
	let o = doc;
	for (const k of path.slice(0, -1)) o = o[k] as Record<string, unknown>;
	o[path[path.length - 1]] = value;
}

function formatValue(v: number, unit: string): string {
	if (unit === 'Pa' && Math.abs(v) >= 1000) return `${Number((v / 1000).toPrecision(4))} kPa`;
	if (unit === 'm' && Math.abs(v) < 0.1) return `${Number((v * 1000).toPrecision(4))} mm`;
	if (unit === 'Pa·s' && Math.abs(v) < 0.1) return `${Number((v * 1000).toPrecision(4))} mPa·s`;
	return `${Number(v.toPrecision(4))} ${unit}`;
}

/** Representative cell size of a grid (1D: length / cells). */
export function cellSize(caseDoc: CaseDocument, cells: number = caseDoc.numerics.cells): number {
	return (caseDoc.kind === 'cross-section' ? caseDoc.geometry.diameterM / 2 : caseDoc.geometry.heightM) / cells;
}

/**
 * Expand a study into member cases, each validated as a case. A member that would not validate
 * (say a clear level above the column height) refuses the whole study, naming the member and the field.
 */
export function expandStudy(base: CaseDocument, spec: StudySpec): Expansion {
	const rows: Array<{ label: string; values: Record<string, number | string> }> = [];
	const issues: ExpansionIssue[] = [];
	if (spec.kind === 'sweep') {
		for (const v of product(spec.axes.map((a) => ({ key: a.input, items: axisValues(a) })))) {
			const label = spec.axes.map((a) => `${sweepInputs[a.input].symbol} = ${formatValue(v[a.input], sweepInputs[a.input].unit)}`).join(', ');
			rows.push({ label, values: v });
		}
	} else if (spec.kind === 'closure-matrix') {
		const used = familiesFor(base);
		const lists: Array<{ key: string; items: string[] }> = [];
		for (const [family, picked] of Object.entries(spec.options) as Array<[MatrixFamily, string[] | undefined]>) {
			if (!picked?.length) continue;
			if (!used.includes(family)) {
				issues.push({ path: `options.${family}`, message: `${matrixFamilies[family].label} is not used by a ${base.kind} case` });
				continue;
			}
			const known = matrixFamilies[family].options as readonly string[];
			const bad = picked.filter((p) => !known.includes(p));
			if (bad.length) issues.push({ path: `options.${family}`, message: `${matrixFamilies[family].label}: unknown option ${bad.join(', ')}; known: ${known.join(', ')}` });
			lists.push({ key: family, items: [...new Set(picked)] });
		}
		if (!issues.length && lists.length === 0) issues.push({ path: 'options', message: 'Tick at least one option' });
		if (!issues.length) {
			for (const v of product(lists)) {
				// the label names the families that vary; a family with one tick is simply set
				const varying = lists.filter((l) => l.items.length > 1);
				const label = (varying.length ? varying : lists).map(({ key }) => (matrixFamilies[key as MatrixFamily].catalog as Record<string, { label: string }>)[v[key]].label).join(' · ');
				rows.push({ label, values: v });
			}
			if (rows.length < 2) issues.push({ path: 'options', message: 'A matrix needs at least two combinations: tick a second option' });
		}
	} else {
		const cells = [...new Set(spec.cells)].sort((a, b) => b - a);
		if (cells.length < MIN_GRIDS) issues.push({ path: 'cells', message: `Give at least ${MIN_GRIDS} different cell counts` });
		for (let i = 1; i < cells.length; i++) {
			const r = cells[i - 1] / cells[i];
			if (r < MIN_REFINEMENT_RATIO - 1e-9) {
				issues.push({ path: 'cells', message: `Refinement ratio ${cells[i - 1]}/${cells[i]} = ${r.toFixed(2)} is below ${MIN_REFINEMENT_RATIO} (Celik et al. 2008)` });
			}
		}
		for (const n of cells) rows.push({ label: `${n} cells (h = ${formatValue(cellSize(base, n), 'm')})`, values: { cells: n } });
	}
	if (issues.length) return { ok: false, issues };

	const members: StudyMember[] = [];
	rows.forEach((row, index) => {
		const doc = structuredClone(base) as unknown as Record<string, unknown>;
		for (const [key, value] of Object.entries(row.values)) {
			const path = spec.kind === 'sweep' ? sweepInputs[key as SweepInput].path : spec.kind === 'closure-matrix' ? matrixFamilies[key as MatrixFamily].path : ['numerics', 'cells'];
			setPath(doc, path, value);
		}
		// the sweep's bubble diameter is the fixed one: switch a correlation sizing off
		if (spec.kind === 'sweep' && 'bubbleDiameterM' in row.values) setPath(doc, ['bubbles', 'sizing'], 'fixed');
		(doc as { name: string }).name = `${base.name} — ${row.label}`.slice(0, 120);
		const checked = validateCase(doc);
		if (!checked.ok) {
			for (const i of checked.issues) issues.push({ path: `members.${index}.${i.path}`, message: `${row.label}: ${i.message}` });
			return;
		}
		members.push({ index, label: row.label, values: row.values, caseDoc: checked.value });
	});
	if (issues.length) return { ok: false, issues: issues.slice(0, 20) };
	return { ok: true, members };
}

/** Member count of a spec without building the cases (for the form's live count). */
export function memberCount(base: CaseDocument, spec: StudySpec): number {
	if (spec.kind === 'sweep') return spec.axes.reduce((n, a) => n * axisValues(a).length, 1);
	if (spec.kind === 'grid') return new Set(spec.cells).size;
	const used = familiesFor(base);
	return Object.entries(spec.options).reduce((n, [f, o]) => (o?.length && used.includes(f as MatrixFamily) ? n * new Set(o).size : n), 1);
}

