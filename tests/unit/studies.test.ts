/**
 * The pure study modules: what a study spec expands to (`spec.ts`), what its members add up to
 * (`results.ts`) and how the new-study form is read (`form.ts`). No database, no solver runs.
 */
import { describe, expect, it } from 'vitest';
import { defaultCase, type CaseDocument } from '../../solver/case.js';
import {
	axisValues,
	expandStudy,
	familiesFor,
	memberCount,
	studySpecSchema,
	sweepInputs,
	type StudyMember,
	type StudySpec,
	type SweepAxis
} from '../../src/lib/studies/spec.js';
import { designBand, gridConvergence, profileBand, studyProgress, type DesignValue, type MemberResult } from '../../src/lib/studies/results.js';
import { formFields, issuesToFieldErrors, studyInputFromForm } from '../../src/lib/studies/form.js';

// ------------------------------------------------------------------ helpers

/** Expand and insist on success. */
function members(base: CaseDocument, spec: StudySpec): StudyMember[] {
	const e = expandStudy(base, spec);
	if (!e.ok) throw new Error(`expected an expansion, got ${JSON.stringify(e.issues)}`);
	return e.members;
}

/** Expand and insist on a refusal; the issues. */
function refusal(base: CaseDocument, spec: StudySpec) {
	const e = expandStudy(base, spec);
	if (e.ok) throw new Error(`expected a refusal, got ${e.members.length} members`);
	return e.issues;
}

/** The dotted issue paths of a schema refusal (or [] if the spec parses). */
function schemaIssuePaths(spec: unknown): string[] {
	const r = studySpecSchema.safeParse(spec);
	return r.success ? [] : r.error.issues.map((i) => i.path.join('.'));
}

function setAt(doc: Record<string, unknown>, path: readonly string[], value: unknown): void {
	let o = doc;
	for (const k of path.slice(0, -1)) o = o[k] as Record<string, unknown>;
	o[path[path.length - 1]] = value;
}

function getAt(doc: unknown, path: readonly string[]): unknown {
	return path.reduce<unknown>((o, k) => (o as Record<string, unknown>)[k], doc);
}

function design(values: Record<string, number>): Record<string, DesignValue> {
	return Object.fromEntries(Object.entries(values).map(([id, value]) => [id, { value, unit: '1', label: id }]));
}

let nextId = 0;
function member(o: { cells?: number; status?: string; wallTimeS?: number; design?: Record<string, number> | null }): MemberResult {
	const id = nextId++;
	return {
		id: `m${id}`,
		index: id,
		point: { label: `${o.cells ?? id}`, values: o.cells === undefined ? {} : { cells: o.cells } },
		status: o.status ?? 'converged',
		wallTimeS: o.wallTimeS ?? 10,
		design: o.design === undefined ? null : o.design === null ? null : design(o.design)
	};
}

/** Ratio of successive values. */
const ratios = (v: number[]) => v.slice(1).map((x, i) => x / v[i]);
const steps = (v: number[]) => v.slice(1).map((x, i) => x - v[i]);

// ------------------------------------------------------------------ axisValues

describe('axisValues', () => {
	it('steps linearly from 0.02 to 0.2 in 10 equal steps with exact ends', () => {
		const v = axisValues({ input: 'superficialGasVelocityMS', spacing: 'linear', from: 0.02, to: 0.2, count: 10 });
		expect(v).toHaveLength(10);
		expect(v[0]).toBe(0.02);
		expect(v[9]).toBe(0.2);
		// (0.2 − 0.02) / 9 = 0.02
		for (const d of steps(v)) expect(d).toBeCloseTo(0.02, 12);
		expect(v).toEqual([0.02, 0.04, 0.06, 0.08, 0.1, 0.12, 0.14, 0.16, 0.18, 0.2]);
	});

	it('steps logarithmically from 0.01 to 0.3 in 6 steps at a constant ratio with exact ends', () => {
		const v = axisValues({ input: 'superficialGasVelocityMS', spacing: 'log', from: 0.01, to: 0.3, count: 6 });
		expect(v).toHaveLength(6);
		expect(v[0]).toBe(0.01);
		expect(v[5]).toBe(0.3);
		// ratio 30^(1/5) = 1.974350…; the values are rounded to 6 significant digits, so the ratio holds to ~1e-6
		const r = Math.pow(30, 1 / 5);
		expect(r).toBeCloseTo(1.97435, 5);
		for (const q of ratios(v)) expect(Math.abs(q / r - 1)).toBeLessThan(2e-6);
		expect(v[1]).toBeCloseTo(0.0197435, 7);
	});

	it('keeps a list as given (order, repeats and all)', () => {
		const a: SweepAxis = { input: 'columnDiameterM', spacing: 'list', values: [0.3, 0.1, 0.2, 0.1] };
		const v = axisValues(a);
		expect(v).toEqual([0.3, 0.1, 0.2, 0.1]);
		// a copy, not the spec's own array
		v.push(9);
		expect(a.values).toEqual([0.3, 0.1, 0.2, 0.1]);
	});
});

// ------------------------------------------------------------------ sweeps

describe('expandStudy: sweeps', () => {
	const base = defaultCase('height-profile');

	it('gives one member per value, that value set and everything else as in the base', () => {
		const spec: StudySpec = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'list', values: [0.02, 0.05, 0.1] }] };
		const m = members(base, spec);
		expect(m).toHaveLength(3);
		expect(memberCount(base, spec)).toBe(3);
		const path = sweepInputs.superficialGasVelocityMS.path;
		[0.02, 0.05, 0.1].forEach((u, i) => {
			expect(m[i].index).toBe(i);
			expect(m[i].values).toEqual({ superficialGasVelocityMS: u });
			expect(m[i].caseDoc.sparging.superficialGasVelocityMS).toBe(u);
			// everything else equal to the base: the base with the name and the swept field replaced
			const expected = structuredClone(base) as unknown as Record<string, unknown>;
			setAt(expected, path, u);
			expected.name = m[i].caseDoc.name;
			expect(m[i].caseDoc).toEqual(expected);
			expect(m[i].caseDoc.name).toBe(`${base.name} — ${m[i].label}`);
		});
		expect(m.map((x) => x.label)).toEqual(['U_g = 0.02 m/s', 'U_g = 0.05 m/s', 'U_g = 0.1 m/s']);
		// the base is not changed
		expect(base).toEqual(defaultCase('height-profile'));
	});

	it('spans two inputs as a grid, first input slowest, labels naming both with units', () => {
		const spec: StudySpec = {
			kind: 'sweep',
			axes: [
				{ input: 'superficialGasVelocityMS', spacing: 'list', values: [0.02, 0.05, 0.1] },
				{ input: 'columnDiameterM', spacing: 'list', values: [0.15, 0.3] }
			]
		};
		const m = members(base, spec);
		expect(m).toHaveLength(6);
		expect(memberCount(base, spec)).toBe(6);
		const expected = [
			[0.02, 0.15],
			[0.02, 0.3],
			[0.05, 0.15],
			[0.05, 0.3],
			[0.1, 0.15],
			[0.1, 0.3]
		];
		expect(m.map((x) => [x.caseDoc.sparging.superficialGasVelocityMS, x.caseDoc.geometry.diameterM])).toEqual(expected);
		expect(m.map((x) => x.values)).toEqual(expected.map(([u, d]) => ({ superficialGasVelocityMS: u, columnDiameterM: d })));
		expect(m[0].label).toBe('U_g = 0.02 m/s, D = 0.15 m');
		expect(m[5].label).toBe('U_g = 0.1 m/s, D = 0.3 m');
		for (const x of m) expect(x.label).toMatch(/^U_g = [\d.]+ m\/s, D = [\d.]+ m$/);
	});

	it('switches a correlation bubble sizing to fixed when the bubble diameter is swept', () => {
		const b = structuredClone(base);
		b.bubbles.sizing = 'akita-yoshida';
		const m = members(b, { kind: 'sweep', axes: [{ input: 'bubbleDiameterM', spacing: 'list', values: [0.002, 0.004, 0.006] }] });
		expect(m.map((x) => x.caseDoc.bubbles.diameterM)).toEqual([0.002, 0.004, 0.006]);
		for (const x of m) expect(x.caseDoc.bubbles.sizing).toBe('fixed');
		// a diameter below 0.1 m reads in mm
		expect(m.map((x) => x.label)).toEqual(['d_b = 2 mm', 'd_b = 4 mm', 'd_b = 6 mm']);
		// another sweep leaves the sizing alone
		const other = members(b, { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'list', values: [0.02, 0.04] }] });
		for (const x of other) expect(x.caseDoc.bubbles.sizing).toBe('akita-yoshida');
	});

	it('labels pressures in kPa and viscosities in mPa·s', () => {
		const p = members(base, { kind: 'sweep', axes: [{ input: 'topPressurePa', spacing: 'list', values: [101325, 200000] }] });
		expect(p.map((x) => x.label)).toEqual(['p_top = 101.3 kPa', 'p_top = 200 kPa']);
		expect(p.map((x) => x.caseDoc.fluids.topPressurePa)).toEqual([101325, 200000]);
		const mu = members(base, { kind: 'sweep', axes: [{ input: 'liquidViscosityPaS', spacing: 'list', values: [0.001, 0.01] }] });
		expect(mu.map((x) => x.label)).toEqual(['μ_L = 1 mPa·s', 'μ_L = 10 mPa·s']);
		expect(mu.map((x) => x.caseDoc.fluids.liquid.viscosityPaS)).toEqual([0.001, 0.01]);
	});

	it('refuses a sweep whose clear level exceeds the column height, naming the member and the field', () => {
		// the default column is 2 m high
		expect(base.geometry.heightM).toBe(2);
		const issues = refusal(base, { kind: 'sweep', axes: [{ input: 'clearLiquidLevelM', spacing: 'list', values: [1, 1.5, 2.5] }] });
		expect(issues).toHaveLength(1);
		expect(issues[0].path).toBe('members.2.geometry.clearLiquidLevelM');
		expect(issues[0].message).toMatch(/^H_0 = 2\.5 m: Clear-liquid level must be below the column height \(2 m\)/);
	});

	it('refuses malformed sweeps in the schema, naming the field', () => {
		const log = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'log', from: 0, to: 0.3, count: 6 }] };
		expect(schemaIssuePaths(log)).toContain('axes.0.from');
		const negTo = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'log', from: 0.01, to: -0.3, count: 6 }] };
		expect(schemaIssuePaths(negTo)).toContain('axes.0.to');
		const one = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'linear', from: 0.02, to: 0.2, count: 1 }] };
		expect(schemaIssuePaths(one)).toEqual(['axes.0.count']);
		const same = {
			kind: 'sweep',
			axes: [
				{ input: 'columnDiameterM', spacing: 'list', values: [0.1, 0.2] },
				{ input: 'columnDiameterM', spacing: 'list', values: [0.3] }
			]
		};
		expect(schemaIssuePaths(same)).toEqual(['axes.1.input']);
		const tooManySteps = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'linear', from: 0.01, to: 0.2, count: 51 }] };
		expect(schemaIssuePaths(tooManySteps)).toEqual(['axes.0.count']);
		const tooManyValues = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'list', values: Array.from({ length: 51 }, (_, i) => 0.001 * (i + 1)) }] };
		expect(schemaIssuePaths(tooManyValues)).toEqual(['axes.0.values']);
		// 50 is still allowed
		expect(schemaIssuePaths({ ...tooManySteps, axes: [{ ...tooManySteps.axes[0], count: 50 }] })).toEqual([]);
		const sameEnds = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'linear', from: 0.1, to: 0.1, count: 3 }] };
		expect(schemaIssuePaths(sameEnds)).toEqual(['axes.0.to']);
		const noFrom = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'linear', to: 0.1, count: 3 }] };
		expect(schemaIssuePaths(noFrom)).toEqual(['axes.0.from']);
		const emptyList = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'list', values: [] }] };
		expect(schemaIssuePaths(emptyList)).toEqual(['axes.0.values']);
		const unknown = { kind: 'sweep', axes: [{ input: 'sparkles', spacing: 'list', values: [1] }] };
		expect(schemaIssuePaths(unknown)).toEqual(['axes.0.input']);
	});
});

// ------------------------------------------------------------------ closure matrix

describe('expandStudy: closure matrix', () => {
	const base = defaultCase('height-profile');
	const drags = ['schiller-naumann', 'ishii-zuber', 'tomiyama-contaminated'] as const;
	const vms = ['none', 'zuber'] as const;

	it('spans 3 drag laws × 2 virtual-mass options as 6 distinct members', () => {
		const spec: StudySpec = { kind: 'closure-matrix', options: { drag: [...drags], virtualMass: [...vms] } };
		const m = members(base, spec);
		expect(m).toHaveLength(6);
		expect(memberCount(base, spec)).toBe(6);
		const combos = m.map((x) => `${x.caseDoc.closures.drag}/${x.caseDoc.closures.virtualMass}`);
		expect(new Set(combos).size).toBe(6);
		expect(combos).toEqual(drags.flatMap((d) => vms.map((v) => `${d}/${v}`)));
		for (const x of m) {
			expect(x.caseDoc.closures.drag).toBe(x.values.drag);
			expect(x.caseDoc.closures.virtualMass).toBe(x.values.virtualMass);
			// the rest of the closures as in the base
			expect({ ...x.caseDoc.closures, drag: base.closures.drag, virtualMass: base.closures.virtualMass }).toEqual(base.closures);
		}
		expect(m[0].label).toBe('Schiller–Naumann · None');
		expect(m[5].label).toBe('Tomiyama (contaminated) · Zuber');
	});

	it('refuses a cross-section-only family on a height-profile case, naming it', () => {
		const issues = refusal(base, { kind: 'closure-matrix', options: { drag: ['stokes', 'ishii-zuber'], lift: ['none', 'tomiyama'] } });
		expect(issues.map((i) => i.path)).toEqual(['options.lift']);
		expect(issues[0].message).toMatch(/Lift is not used by a height-profile case/);
	});

	it('refuses an unknown option', () => {
		const issues = refusal(base, { kind: 'closure-matrix', options: { drag: ['stokes', 'no-such-drag'] } });
		expect(issues.map((i) => i.path)).toEqual(['options.drag']);
		expect(issues[0].message).toMatch(/unknown option no-such-drag/);
	});

	it('refuses a single combination and an empty matrix', () => {
		const one = refusal(base, { kind: 'closure-matrix', options: { drag: ['stokes'] } });
		expect(one.map((i) => i.path)).toEqual(['options']);
		expect(one[0].message).toMatch(/at least two combinations/);
		// a repeated tick is still one option
		expect(refusal(base, { kind: 'closure-matrix', options: { drag: ['stokes', 'stokes'] } }).map((i) => i.path)).toEqual(['options']);
		expect(memberCount(base, { kind: 'closure-matrix', options: { drag: ['stokes', 'stokes'] } })).toBe(1);
		expect(refusal(base, { kind: 'closure-matrix', options: {} }).map((i) => i.path)).toEqual(['options']);
	});

	it('offers the families each case kind uses', () => {
		const cross = familiesFor(defaultCase('cross-section'));
		expect(cross).toEqual(expect.arrayContaining(['drag', 'swarm', 'lift', 'wallLubrication', 'turbulentDispersion']));
		expect(cross).not.toContain('virtualMass');
		// the section's default small + large bubbles (schema version 3) have a large-bubble drag; one size has none
		expect(cross).toContain('largeDrag');
		expect(familiesFor({ kind: 'cross-section', bubbles: { ...defaultCase('cross-section').bubbles, classes: 'single' } })).not.toContain('largeDrag');
		const height = familiesFor(base);
		expect(height).toEqual(expect.arrayContaining(['drag', 'swarm', 'virtualMass', 'largeDrag']));
		expect(height).not.toContain('lift');
		// large-bubble drag only with two bubble classes
		expect(familiesFor({ kind: 'height-profile', bubbles: { ...base.bubbles, classes: 'single' } })).not.toContain('largeDrag');
	});

	it('expands a cross-section matrix of lift × wall lubrication, member count matching', () => {
		const cs = defaultCase('cross-section');
		const spec: StudySpec = { kind: 'closure-matrix', options: { lift: ['none', 'tomiyama', 'constant'], wallLubrication: ['antal', 'frank'] } };
		const m = members(cs, spec);
		expect(m).toHaveLength(6);
		expect(memberCount(cs, spec)).toBe(m.length);
		expect(new Set(m.map((x) => `${x.caseDoc.closures.lift}/${x.caseDoc.closures.wallLubrication}`)).size).toBe(6);
	});
});

// ------------------------------------------------------------------ grid study

describe('expandStudy: grid study', () => {
	const base = defaultCase('height-profile');

	it('sorts the grids finest first and sets the cells', () => {
		const spec: StudySpec = { kind: 'grid', cells: [100, 50, 200] };
		const m = members(base, spec);
		expect(m.map((x) => x.caseDoc.numerics.cells)).toEqual([200, 100, 50]);
		expect(m.map((x) => x.values)).toEqual([{ cells: 200 }, { cells: 100 }, { cells: 50 }]);
		expect(memberCount(base, spec)).toBe(3);
		// h = 2 m / 200 = 10 mm
		expect(m[0].label).toBe('200 cells (h = 10 mm)');
		for (const x of m) expect({ ...x.caseDoc, name: base.name, numerics: { ...x.caseDoc.numerics, cells: base.numerics.cells } }).toEqual(base);
	});

	it('refuses a refinement ratio below 1.3, naming cells', () => {
		// Celik et al. (2008), J. Fluids Eng. 130, 078001: refinement ratio r > 1.3
		const issues = refusal(base, { kind: 'grid', cells: [100, 90, 50] });
		expect(issues.map((i) => i.path)).toEqual(['cells']);
		expect(issues[0].message).toMatch(/100\/90 = 1\.11 is below 1\.3/);
		// 1.3 itself is allowed: 169 / 130 = 1.3
		expect(members(base, { kind: 'grid', cells: [169, 130, 100] })).toHaveLength(3);
	});

	it('refuses fewer than three grids', () => {
		expect(schemaIssuePaths({ kind: 'grid', cells: [100, 50] })).toEqual(['cells']);
		// three counts, two of them the same: two grids
		const issues = refusal(base, { kind: 'grid', cells: [100, 100, 50] });
		expect(issues.map((i) => i.path)).toEqual(['cells']);
		expect(issues[0].message).toMatch(/at least 3 different cell counts/);
		expect(schemaIssuePaths({ kind: 'grid', cells: [100, 50.5, 20] })).toEqual(['cells.1']);
		expect(schemaIssuePaths({ kind: 'grid', cells: [100, 50, 5] })).toEqual(['cells.2']);
	});
});

// ------------------------------------------------------------------ grid convergence

describe('gridConvergence', () => {
	const h2d = (n: number) => 1 / Math.sqrt(n);

	it("reproduces Celik et al.'s (2008) worked example", () => {
		// Celik et al. (2008), J. Fluids Eng. 130, 078001, worked example: N = 18000, 8000, 4500 cells in 2-D,
		// φ = 6.063, 5.972, 5.863 → p = 1.53, φ_ext = 6.1685, GCI_fine = 2.2 % (2.175 % unrounded)
		const ms = [member({ cells: 8000, design: { phi: 5.972 } }), member({ cells: 4500, design: { phi: 5.863 } }), member({ cells: 18000, design: { phi: 6.063 } })];
		const [c] = gridConvergence(ms, h2d);
		expect(c.id).toBe('phi');
		expect(c.type).toBe('monotone');
		expect(c.cells).toEqual([18000, 8000, 4500]);
		expect(c.values).toEqual([6.063, 5.972, 5.863]);
		// R = ε21/ε32 = (−0.091)/(−0.109) (Stern et al. (2001), J. Fluids Eng. 123, 793)
		expect(c.ratio).toBeCloseTo(0.091 / 0.109, 12);
		expect(c.gci).not.toBeNull();
		expect(Math.abs(c.gci!.order - 1.534)).toBeLessThan(1e-3);
		expect(Math.abs(c.gci!.extrapolated - 6.1685)).toBeLessThan(1e-3);
		expect(Math.abs(c.gci!.gciFine - 0.02175)).toBeLessThan(1e-4);
	});

	it('flags oscillatory, divergent and grid-independent sequences without a GCI', () => {
		// finest first: ε21 = +0.02, ε32 = −0.03 → R = −0.667
		const osc = gridConvergence([member({ cells: 400, design: { q: 1.0 } }), member({ cells: 200, design: { q: 1.02 } }), member({ cells: 100, design: { q: 0.99 } })], (n) => 1 / n)[0];
		expect(osc.type).toBe('oscillatory');
		expect(osc.ratio).toBeCloseTo(-2 / 3, 10);
		expect(osc.gci).toBeNull();
		// ε21 = 0.1, ε32 = 0.05: the change grows with refinement → R = 2
		const div = gridConvergence([member({ cells: 400, design: { q: 1.0 } }), member({ cells: 200, design: { q: 1.1 } }), member({ cells: 100, design: { q: 1.15 } })], (n) => 1 / n)[0];
		expect(div.type).toBe('divergent');
		expect(div.ratio).toBeCloseTo(2, 10);
		expect(div.gci).toBeNull();
		const flat = gridConvergence([member({ cells: 400, design: { q: 0.7 } }), member({ cells: 200, design: { q: 0.7 } }), member({ cells: 100, design: { q: 0.7 } })], (n) => 1 / n)[0];
		expect(flat.type).toBe('grid-independent');
		expect(flat.gci).toBeNull();
	});

	it('needs three finished grids; ignores failed ones; uses the three finest of four', () => {
		const two = gridConvergence([member({ cells: 400, design: { q: 1 } }), member({ cells: 200, design: { q: 1.1 } }), member({ cells: 100, status: 'running' })], (n) => 1 / n)[0];
		expect(two.type).toBe('incomplete');
		expect(two.cells).toBeNull();
		expect(two.gci).toBeNull();
		expect(two.note).toMatch(/^2 of the 3/);

		// a failed member with a (stale) value is ignored: the three others make Celik's example
		const withFailed = [
			member({ cells: 18000, design: { phi: 6.063 } }),
			member({ cells: 12000, status: 'failed', design: { phi: 100 } }),
			member({ cells: 8000, design: { phi: 5.972 } }),
			member({ cells: 4500, design: { phi: 5.863 } })
		];
		const f = gridConvergence(withFailed, h2d)[0];
		expect(f.cells).toEqual([18000, 8000, 4500]);
		expect(f.type).toBe('monotone');
		expect(Math.abs(f.gci!.order - 1.534)).toBeLessThan(1e-3);

		// four finished grids: the coarsest (2000 cells, a wild value) is not used
		const four = [...withFailed.filter((m) => m.status !== 'failed'), member({ cells: 2000, design: { phi: -50 } })];
		const g = gridConvergence(four, h2d)[0];
		expect(g.cells).toEqual([18000, 8000, 4500]);
		expect(g.values).toEqual([6.063, 5.972, 5.863]);
		expect(Math.abs(g.gci!.extrapolated - 6.1685)).toBeLessThan(1e-3);
	});

	it('judges every design number on its own', () => {
		const ms = [member({ cells: 400, design: { a: 1.0, b: 2 } }), member({ cells: 200, design: { a: 1.04, b: 2 } }), member({ cells: 100, design: { a: 1.2, b: 2 } })];
		const out = gridConvergence(ms, (n) => 1 / n);
		expect(out.map((c) => [c.id, c.type])).toEqual([
			['a', 'monotone'],
			['b', 'grid-independent']
		]);
		// ε32/ε21 = 0.16/0.04 = 4 = r² with r = 2: order p = 2, φ_ext = (4·1 − 1.04)/3 (Richardson extrapolation, common practice)
		expect(out[0].gci!.order).toBeCloseTo(2, 10);
		expect(out[0].gci!.extrapolated).toBeCloseTo(0.9866666666666667, 12);
	});
});

// ------------------------------------------------------------------ bands and progress

describe('designBand and profileBand', () => {
	it('bands every design number around all members', () => {
		const ms = [{ design: design({ holdup: 0.12, kla: 0.02 }) }, { design: design({ holdup: 0.18, kla: 0.05 }) }, { design: design({ holdup: 0.15 }) }, { design: null }];
		const b = designBand(ms);
		expect(Object.keys(b)).toEqual(['holdup', 'kla']);
		for (const [id, band] of Object.entries(b)) {
			for (const m of ms) {
				const v = m.design?.[id]?.value;
				if (v === undefined) continue;
				expect(band.min).toBeLessThanOrEqual(v);
				expect(band.max).toBeGreaterThanOrEqual(v);
			}
		}
		expect(b.holdup).toEqual({ min: 0.12, max: 0.18, relativeSpread: (0.18 - 0.12) / 0.15, count: 3 });
		expect(b.holdup.relativeSpread).toBeCloseTo(0.4, 12);
		expect(b.kla.count).toBe(2);
		expect(b.kla.relativeSpread).toBeCloseTo(0.03 / 0.035, 12);
		// a negative mean: the spread is taken over |mean|
		expect(designBand([{ design: design({ p: -1 }) }, { design: design({ p: -3 }) }]).p.relativeSpread).toBeCloseTo(1, 12);
	});

	it('envelopes profiles on the same grid cell by cell', () => {
		const x = [0, 0.5, 1];
		const b = profileBand([
			{ x, y: [0.1, 0.3, 0.2] },
			{ x, y: Float64Array.from([0.2, 0.1, 0.25]) },
			{ x, y: [0.15, 0.2, 0.1] }
		]);
		expect(b).toEqual({ x, min: [0.1, 0.1, 0.1], max: [0.2, 0.3, 0.25] });
		expect(profileBand([])).toBeNull();
	});

	it('interpolates a profile on another grid onto the first one', () => {
		// the second profile y = 2x on x = 0, 1: at 0.25 and 0.75 it is 0.5 and 1.5; ends held beyond its range
		const b = profileBand([
			{ x: [0, 0.25, 0.75, 1.2], y: [1, 1, 1, 1] },
			{ x: [0, 1], y: [0, 2] }
		])!;
		expect(b.x).toEqual([0, 0.25, 0.75, 1.2]);
		expect(b.min).toEqual([0, 0.5, 1, 1]);
		expect(b.max).toEqual([1, 1, 1.5, 2]);
	});
});

describe('studyProgress', () => {
	const st = (...statuses: string[]) => statuses.map((status, i) => ({ status, wallTimeS: 10 * (i + 1) }));

	it('counts members by status with no estimate before any has finished', () => {
		const p = studyProgress(st('queued', 'queued', 'running', 'failed'));
		expect(p).toMatchObject({ total: 4, done: 0, running: 1, queued: 2, failed: 1, cancelled: 0, ended: false });
		expect(p.fraction).toBeCloseTo(0.25, 12);
		expect(p.timeLeftS).toBeNull();
	});

	it('counts converged and finished as done and estimates the time left', () => {
		// wall times 10 and 20 s → mean 15 s; 3 members left; 2 running → 15 · 3 / 2
		const p = studyProgress(st('converged', 'finished', 'running', 'running', 'queued'));
		expect(p).toMatchObject({ total: 5, done: 2, running: 2, queued: 1, ended: false });
		expect(p.fraction).toBeCloseTo(0.4, 12);
		expect(p.timeLeftS).toBeCloseTo(22.5, 12);
		// 3 slots at once
		expect(studyProgress(st('converged', 'finished', 'running', 'running', 'queued'), 3).timeLeftS).toBeCloseTo(15, 12);
	});

	it('reports no time left and ended only when every member ended', () => {
		const p = studyProgress(st('converged', 'finished', 'failed', 'cancelled'));
		expect(p).toMatchObject({ total: 4, done: 2, failed: 1, cancelled: 1, fraction: 1, timeLeftS: 0, ended: true });
		expect(studyProgress(st('converged', 'running')).ended).toBe(false);
		expect(studyProgress([]).ended).toBe(false);
	});
});

// ------------------------------------------------------------------ the new-study form

describe('the new-study form', () => {
	const fd = (entries: Array<[string, string]>) => {
		const f = new FormData();
		for (const [k, v] of entries) f.append(k, v);
		return f;
	};

	it('reads repeated keys as arrays', () => {
		const f = formFields(fd([['kind', 'closure-matrix'], ['options.drag', 'stokes'], ['options.drag', 'ishii-zuber'], ['options.drag', 'schiller-naumann'], ['options.swarm', 'none']]));
		expect(f).toEqual({ kind: 'closure-matrix', 'options.drag': ['stokes', 'ishii-zuber', 'schiller-naumann'], 'options.swarm': 'none' });
	});

	it('converts display units to SI for a list and a range', () => {
		const input = studyInputFromForm(
			formFields(
				fd([
					['caseId', ' c1 '],
					['name', 'Bubble sizes'],
					['kind', 'sweep'],
					['axes.0.input', 'bubbleDiameterM'],
					['axes.0.spacing', 'list'],
					['axes.0.values', '2, 4;6  8'],
					['axes.1.input', 'topPressurePa'],
					['axes.1.spacing', 'linear'],
					['axes.1.from', '101.325'],
					['axes.1.to', '300'],
					['axes.1.count', '4'],
					['measurementId', '']
				])
			)
		);
		expect(input.caseId).toBe('c1');
		expect(input.name).toBe('Bubble sizes');
		expect(input.measurementId).toBeNull();
		const spec = input.spec as { kind: string; axes: SweepAxis[] };
		expect(spec.kind).toBe('sweep');
		// mm → m
		expect(spec.axes[0].spacing).toBe('list');
		expect(spec.axes[0].values).toHaveLength(4);
		[0.002, 0.004, 0.006, 0.008].forEach((v, i) => expect(spec.axes[0].values![i]).toBeCloseTo(v, 15));
		// kPa → Pa
		expect(spec.axes[1]).toMatchObject({ input: 'topPressurePa', spacing: 'linear', count: 4 });
		expect(spec.axes[1].from).toBeCloseTo(101325, 9);
		expect(spec.axes[1].to).toBeCloseTo(300000, 9);
		expect(spec.axes[1].values).toBeUndefined();
		expect(studySpecSchema.safeParse(spec).success).toBe(true);

		// mPa·s → Pa·s on a logarithmic range
		const mu = studyInputFromForm({ kind: 'sweep', 'axes.0.input': 'liquidViscosityPaS', 'axes.0.spacing': 'log', 'axes.0.from': '1', 'axes.0.to': '100', 'axes.0.count': '3' }).spec as { axes: SweepAxis[] };
		expect(mu.axes).toHaveLength(1);
		expect(mu.axes[0].from).toBeCloseTo(0.001, 15);
		expect(mu.axes[0].to).toBeCloseTo(0.1, 15);
		expect(axisValues(mu.axes[0])).toEqual([0.001, 0.01, 0.1]);
		// a viscosity list in mPa·s
		const muList = studyInputFromForm({ kind: 'sweep', 'axes.0.input': 'liquidViscosityPaS', 'axes.0.values': '1 10' }).spec as { axes: SweepAxis[] };
		expect(muList.axes[0].spacing).toBe('list');
		expect(muList.axes[0].values![0]).toBeCloseTo(0.001, 15);
		expect(muList.axes[0].values![1]).toBeCloseTo(0.01, 15);
	});

	it('reads the ticked closure options into arrays, one tick included', () => {
		const input = studyInputFromForm(formFields(fd([['kind', 'closure-matrix'], ['options.drag', 'stokes'], ['options.drag', 'ishii-zuber'], ['options.virtualMass', 'zuber']])));
		expect(input.spec).toEqual({ kind: 'closure-matrix', options: { drag: ['stokes', 'ishii-zuber'], virtualMass: ['zuber'] } });
		expect(studySpecSchema.safeParse(input.spec).success).toBe(true);
	});

	it("parses the grid study's cell list", () => {
		const input = studyInputFromForm({ kind: 'grid', cells: ' 200, 100;50 ' });
		expect(input.spec).toEqual({ kind: 'grid', cells: [200, 100, 50] });
		expect(studySpecSchema.safeParse(input.spec).success).toBe(true);
	});

	it('turns a non-number into NaN, which the schema refuses naming the field', () => {
		const list = studyInputFromForm({ kind: 'sweep', 'axes.0.input': 'superficialGasVelocityMS', 'axes.0.spacing': 'list', 'axes.0.values': '0.02 0.05 0.1 fast' });
		const values = (list.spec as { axes: SweepAxis[] }).axes[0].values!;
		expect(values.slice(0, 3)).toEqual([0.02, 0.05, 0.1]);
		expect(values[3]).toBeNaN();
		expect(schemaIssuePaths(list.spec)).toEqual(['axes.0.values.3']);

		const range = studyInputFromForm({ kind: 'sweep', 'axes.0.input': 'bubbleDiameterM', 'axes.0.spacing': 'linear', 'axes.0.from': 'two', 'axes.0.to': '6', 'axes.0.count': '3' });
		expect((range.spec as { axes: SweepAxis[] }).axes[0].from).toBeNaN();
		expect(schemaIssuePaths(range.spec)).toContain('axes.0.from');

		const cells = studyInputFromForm({ kind: 'grid', cells: '200 1e2 fifty' });
		expect(schemaIssuePaths(cells.spec)).toEqual(['cells.2']);
	});

	it('maps server issue paths to form fields', () => {
		const errors = issuesToFieldErrors([
			{ path: 'spec.axes.0.values.3', message: 'Each value must be a number' },
			{ path: 'spec.axes.0.values.7', message: 'a second one, not shown' },
			{ path: 'spec.cells.1', message: 'Cell counts must be whole numbers' },
			{ path: 'spec.axes.1.from', message: 'From is required for a range' },
			{ path: 'spec.members.2.geometry.clearLiquidLevelM', message: 'H_0 = 2.5 m: too high' },
			{ path: 'name', message: 'Name is required' }
		]);
		expect(errors).toEqual({
			'axes.0.values': 'Each value must be a number',
			cells: 'Cell counts must be whole numbers',
			'axes.1.from': 'From is required for a range',
			spec: 'H_0 = 2.5 m: too high',
			name: 'Name is required'
		});
	});
});
