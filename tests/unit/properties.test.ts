/**
 * Property tests of the three readers of untrusted input: the case schema (`validateCase`), the
 * measurement file reader (`parseMeasurementCsv`) and the form reader (`parseForm` with the column
 * form). Each must answer every input with a result, never an exception, and the result must
 * hold what its callers rely on. Bounded (at most 200 inputs each) with a fixed seed, so a
 * failure repeats.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { caseSchema, defaultCase, oneClassCase, SCHEMA_VERSION, validateCase, type CaseDocument } from '../../solver/case.js';
import { findUnit, kindSpecs, measurementKinds, parseMeasurementCsv, toSi, unitsByQuantity, type MeasurementKind } from '../../src/lib/measurements/index.js';
import { formValues, parseForm } from '../../src/lib/server/forms.js';
import { columnForm } from '../../src/lib/server/columns.js';

const SEED = 20_260_611;
const settings = (numRuns: number) => ({ numRuns, seed: SEED });

// ------------------------------------------------------------------ case documents

type Json = Record<string, unknown>;

/** Dotted paths of every leaf (non-object value) of a document. */
function leafPaths(value: unknown, prefix: string[] = []): string[][] {
	if (value && typeof value === 'object' && !Array.isArray(value)) {
		return Object.entries(value).flatMap(([k, v]) => leafPaths(v, [...prefix, k]));
	}
	return [prefix];
}

function getAt(doc: unknown, path: string[]): unknown {
	return path.reduce<unknown>((v, k) => (v && typeof v === 'object' ? (v as Json)[k] : undefined), doc);
}

/** A deep copy with the value at `path` replaced (or removed when `value` is the `REMOVE` marker). */
const REMOVE = Symbol('remove');
function setAt(doc: CaseDocument, path: string[], value: unknown): unknown {
	const copy = structuredClone(doc) as unknown as Json;
	let node = copy;
	for (const k of path.slice(0, -1)) node = node[k] as Json;
	const last = path[path.length - 1];
	if (value === REMOVE) delete node[last];
	else node[last] = value;
	return copy;
}

const validDocuments: CaseDocument[] = [defaultCase('height-profile'), defaultCase('cross-section'), oneClassCase('height-profile')];
const topLevelKeys = Object.keys(caseSchema.shape);
/** the two rules across fields (`superRefine` in the schema) report on these paths */
const crossFieldPaths = ['geometry.clearLiquidLevelM', 'numerics.snapshotIntervalS'];

/** Values a member or a hand-edited file might put anywhere. */
const anyValue: fc.Arbitrary<unknown> = fc.oneof(
	fc.jsonValue({ maxDepth: 2 }),
	fc.double(),
	fc.integer(),
	fc.string({ unit: 'grapheme', maxLength: 200 }),
	fc.constantFrom<unknown>(NaN, Infinity, -Infinity, -0, 1e308, -1e308, Number.MIN_VALUE, '', ' ', '0', 'none', null, undefined, true, [], {}, REMOVE)
);

/** The invariants of every `validateCase` answer. */
function expectValidationResult(input: unknown, r: ReturnType<typeof validateCase>) {
	if (r.ok) {
		expect(r.value.schemaVersion).toBe(SCHEMA_VERSION);
		// a validated document is a fixed point: validating it again changes nothing
		const again = validateCase(r.value);
		expect(again).toEqual({ ok: true, value: r.value });
		return;
	}
	expect(r.issues.length).toBeGreaterThan(0);
	const isObject = !!input && typeof input === 'object' && !Array.isArray(input);
	for (const issue of r.issues) {
		expect(typeof issue.message).toBe('string');
		expect(issue.message.trim()).not.toBe('');
		expect(typeof issue.path).toBe('string');
		if (isObject) {
			// an object is judged field by field: every issue names a field of the schema
			expect(issue.path).not.toBe('');
			expect(topLevelKeys).toContain(issue.path.split('.')[0]);
		} else {
			// anything else is refused as a whole (the schema reports that at the root)
			expect(issue.path).toBe('');
		}
	}
}

describe('validateCase on arbitrary input', () => {
	it('answers any JSON value with a fixed point or issues naming schema fields', () => {
		fc.assert(
			fc.property(fc.jsonValue(), (input) => {
				expectValidationResult(input, validateCase(input));
			}),
			settings(200)
		);
	});

	it('answers any JavaScript value the same way (never throws)', () => {
		fc.assert(
			fc.property(fc.anything({ maxDepth: 3 }), (input) => {
				expectValidationResult(input, validateCase(input));
			}),
			settings(200)
		);
	});

	it('judges a valid document with one field replaced by that field alone', () => {
		const cases = validDocuments.flatMap((doc) => leafPaths(doc).map((path) => ({ doc, path })));
		fc.assert(
			fc.property(fc.constantFrom(...cases), anyValue, ({ doc, path }, value) => {
				const input = setAt(doc, path, value);
				const r = validateCase(input);
				expectValidationResult(input, r);
				const dotted = path.join('.');
				if (r.ok) {
					if (dotted !== 'schemaVersion') {
						// every other field keeps its value
						for (const other of leafPaths(doc)) {
							if (other.join('.') !== dotted) expect(getAt(r.value, other)).toEqual(getAt(doc, other));
						}
					}
					// numbers are taken as they are, never coerced or clamped
					if (typeof value === 'number') expect(getAt(r.value, path)).toBe(value);
				} else {
					// the replaced field, or a rule relating it to another field, is what is wrong
					for (const issue of r.issues) expect([dotted, ...crossFieldPaths]).toContain(issue.path);
				}
			}),
			settings(200)
		);
	});

	it('refuses a number out of range naming the field and the limit', () => {
		const r = validateCase({ ...defaultCase(), numerics: { ...defaultCase().numerics, cells: 1e9 } });
		expect(r).toEqual({ ok: false, issues: [{ path: 'numerics.cells', message: 'Cells must be at most 5000' }] });
	});
});

// ------------------------------------------------------------------ measurement files

/** Number-like cells: plain numbers, huge exponents (which overflow in a large unit), typos. */
const cell: fc.Arbitrary<string> = fc.oneof(
	{ weight: 4, arbitrary: fc.double({ min: -10, max: 200, noNaN: true }).map((v) => String(v)) },
	{ weight: 2, arbitrary: fc.double().map((v) => String(v)) },
	{ weight: 1, arbitrary: fc.constantFrom('1e306', '-1e306', '1.7976931348623157e308', '1e-320', '0', '-0', '.5', '5.', '4,5', '', ' ', 'abc', 'NaN', 'Infinity', '"3"', '1e999') },
	{ weight: 1, arbitrary: fc.string({ maxLength: 8 }) }
);

/** A file that looks like a measurement file: an optional header, rows of cells, one delimiter. */
const csvLike: fc.Arbitrary<string> = fc
	.record({
		header: fc.option(fc.constantFrom('z,holdup', 'height_m;p_kPa', 'time\tDO', 'a,b,c')),
		rows: fc.array(fc.array(cell, { minLength: 0, maxLength: 3 }), { maxLength: 30 }),
		delimiter: fc.constantFrom(',', ';', '\t'),
		newline: fc.constantFrom('\n', '\r\n'),
		bom: fc.boolean()
	})
	.map(({ header, rows, delimiter, newline, bom }) => {
		const lines = rows.map((r) => r.join(delimiter));
		if (header) lines.unshift(header);
		return (bom ? '\uFEFF' : '') + lines.join(newline);
	});

const csvOptions = fc.constantFrom(...measurementKinds).chain((kind: MeasurementKind) => {
	const spec = kindSpecs[kind];
	const unit = (q: keyof typeof unitsByQuantity) => fc.oneof({ weight: 9, arbitrary: fc.constantFrom(...unitsByQuantity[q].map((u) => u.id)) }, { weight: 1, arbitrary: fc.string({ maxLength: 4 }) });
	return fc.record({
		kind: fc.constant(kind),
		xUnit: unit(spec.x.quantity),
		yUnit: unit(spec.y.quantity),
		columnHeightM: fc.option(fc.oneof(fc.double({ min: 0.1, max: 300, noNaN: true }), fc.constantFrom(0, -1, NaN, Infinity)), { nil: undefined })
	});
});
type CsvOptions = typeof csvOptions extends fc.Arbitrary<infer T> ? T : never;

/** Finite bounds (in SI) to draw valid values of a column from. */
function drawRange(range: readonly [number, number], cap: number): [number, number] {
	return [Math.max(range[0], -cap), Math.min(range[1], cap)];
}

/**
 * A file valid for `opts` (increasing positions inside the bounds, values in range, written in the
 * chosen units), then with a few cells replaced: by near-misses, typos or huge numbers that
 * overflow once converted to SI.
 */
function nearlyValidFile(opts: CsvOptions): fc.Arbitrary<string> {
	const spec = kindSpecs[opts.kind];
	const xUnit = findUnit(spec.x.quantity, opts.xUnit) ?? unitsByQuantity[spec.x.quantity][0];
	const yUnit = findUnit(spec.y.quantity, opts.yUnit) ?? unitsByQuantity[spec.y.quantity][0];
	const height = opts.columnHeightM !== undefined && opts.columnHeightM > 0 && Number.isFinite(opts.columnHeightM) ? opts.columnHeightM : 1;
	const [x0, x1] = spec.xIsHeight ? [0, height] : drawRange(spec.xRange, 1e6);
	const [y0, y1] = drawRange(spec.yRange, 1e7);
	const inUnit = (si: number, u: { factor: number; offset?: number }) => String((si - (u.offset ?? 0)) / u.factor);
	// evenly spread over the bounds (a double drawn by bit pattern would crowd near zero)
	const between = (lo: number, hi: number) => fc.integer({ min: 1, max: 1_000_000 }).map((i) => lo + ((hi - lo) * i) / 1_000_000);
	const huge = fc.double({ min: 1e300, max: Number.MAX_VALUE, noNaN: true }).map((v) => String(v));
	return fc
		.record({
			xs: fc.uniqueArray(between(x0, x1), { minLength: 1, maxLength: 15 }),
			ys: fc.array(between(y0, y1), { minLength: 15, maxLength: 15 }),
			edits: fc.array(fc.tuple(fc.nat(), fc.nat(1), fc.oneof(cell, huge)), { maxLength: 2 })
		})
		.map(({ xs, ys, edits }) => {
			const rows = [...xs].sort((a, b) => a - b).map((x, i) => [inUnit(x, xUnit), inUnit(ys[i], yUnit)]);
			for (const [row, col, value] of edits) rows[row % rows.length][col] = value;
			return rows.map((r) => r.join(',')).join('\n');
		});
}

const anyText: fc.Arbitrary<string> = fc.oneof(csvLike, fc.string({ unit: 'binary', maxLength: 400 }), fc.string({ unit: 'grapheme', maxLength: 400 }));

/** Options with a file: arbitrary text, or a nearly valid file for those options. */
const csvCase = csvOptions.chain((opts) =>
	fc.record({ opts: fc.constant(opts), text: fc.oneof({ weight: 1, arbitrary: anyText }, { weight: 2, arbitrary: nearlyValidFile(opts) }) })
);

describe('parseMeasurementCsv on arbitrary text', () => {
	it('returns a table of finite SI values or errors naming the row and column', () => {
		fc.assert(
			fc.property(csvCase, ({ text, opts }) => {
				const r = parseMeasurementCsv({ text, ...opts });
				const spec = kindSpecs[opts.kind];
				if (r.ok) {
					const t = r.table;
					const n = t.x.length;
					expect(n).toBeGreaterThan(0);
					for (const list of [t.y, t.rows, t.source.x, t.source.y]) expect(list).toHaveLength(n);
					const xUnit = findUnit(spec.x.quantity, opts.xUnit)!;
					const yUnit = findUnit(spec.y.quantity, opts.yUnit)!;
					for (let i = 0; i < n; i++) {
						expect(Number.isFinite(t.x[i]), `x[${i}] = ${t.x[i]}`).toBe(true);
						expect(Number.isFinite(t.y[i]), `y[${i}] = ${t.y[i]}`).toBe(true);
						// SI is exactly the conversion of what the file said
						expect(t.x[i]).toBe(toSi(t.source.x[i], xUnit));
						expect(t.y[i]).toBe(toSi(t.source.y[i], yUnit));
						expect(t.y[i]).toBeGreaterThanOrEqual(spec.yRange[0]);
						expect(t.y[i]).toBeLessThanOrEqual(spec.yRange[1]);
						if (spec.xIsHeight) {
							expect(t.x[i]).toBeGreaterThanOrEqual(0);
							expect(t.x[i]).toBeLessThanOrEqual(opts.columnHeightM!);
						}
						if (i > 0) {
							expect(t.x[i]).toBeGreaterThan(t.x[i - 1]);
							expect(t.rows[i]).toBeGreaterThan(t.rows[i - 1]);
						}
						expect(Number.isInteger(t.rows[i]) && t.rows[i] >= 1).toBe(true);
					}
					return;
				}
				expect(r.errors.length).toBeGreaterThan(0);
				expect(r.errors.length).toBeLessThanOrEqual(51);
				const records = text.split(/\r\n|\r|\n/).length;
				for (const e of r.errors) {
					expect(e.message.trim()).not.toBe('');
					expect([null, 1, 2]).toContain(e.column);
					if (e.row !== null) {
						expect(Number.isInteger(e.row) && e.row >= 1 && e.row <= records).toBe(true);
						expect(e.message).toContain(`Row ${e.row}`);
					}
				}
			}),
			settings(200)
		);
	});

	it('refuses a value that overflows in SI instead of storing Infinity', () => {
		const time = parseMeasurementCsv({ text: '0,5\n1e306,6\n', kind: 'dissolved-oxygen', xUnit: 'h', yUnit: 'mg/L' });
		expect(time).toEqual({ ok: false, errors: [{ row: 2, column: 1, message: 'Row 2, column 1 (time): 1e+306 h is out of the number range in SI' }] });
		const pressure = parseMeasurementCsv({ text: '0.5,1e305\n', kind: 'pressure-height', xUnit: 'm', yUnit: 'MPa', columnHeightM: 2 });
		expect(pressure.ok).toBe(false);
		expect(!pressure.ok && pressure.errors[0]).toMatchObject({ row: 1, column: 2 });
	});
});

// ------------------------------------------------------------------ form data

const columnFields = Object.keys(columnForm.shape);

const formEntries = fc.array(
	fc.tuple(
		fc.oneof({ weight: 3, arbitrary: fc.constantFrom(...columnFields) }, { weight: 1, arbitrary: fc.string({ maxLength: 12 }) }),
		fc.oneof(
			{ weight: 3, arbitrary: fc.string({ unit: 'grapheme', maxLength: 60 }) },
			{ weight: 2, arbitrary: fc.double().map((v) => String(v)) },
			{ weight: 1, arbitrary: fc.constantFrom('0.2', '2', ' 1,5 ', '0x10', '1e400', '-3', 'C-201', ' ', 'x'.repeat(41), 'y'.repeat(4001)) },
			{ weight: 1, arbitrary: fc.string({ maxLength: 10 }).map((s) => new File([s], 'upload.txt')) }
		)
	),
	{ maxLength: 12 }
);

describe('parseForm with the column form', () => {
	it('answers any form data with checked data or a 400 naming form fields', () => {
		fc.assert(
			fc.property(formEntries, (entries) => {
				const fd = new FormData();
				for (const [k, v] of entries) fd.append(k, v);
				const r = parseForm(columnForm, fd);
				expect(r.values).toEqual(formValues(fd));
				if (r.data) {
					expect(r.failure).toBeNull();
					expect(r.data.tag).toBe(r.values.tag.trim());
					expect(r.data.tag.length).toBeGreaterThanOrEqual(1);
					expect(r.data.tag.length).toBeLessThanOrEqual(40);
					expect(r.data.service.length).toBeLessThanOrEqual(200);
					expect(r.data.notes.length).toBeLessThanOrEqual(4000);
					expect(Number.isFinite(r.data.diameterM) && r.data.diameterM > 0 && r.data.diameterM <= 20).toBe(true);
					expect(Number.isFinite(r.data.heightM) && r.data.heightM > 0 && r.data.heightM <= 100).toBe(true);
					return;
				}
				expect(r.failure?.status).toBe(400);
				const errors = r.failure!.data.errors;
				expect(Object.keys(errors).length).toBeGreaterThan(0);
				for (const [field, message] of Object.entries(errors)) {
					expect(columnFields).toContain(field);
					expect(message.trim()).not.toBe('');
				}
				// a required field that is missing is always among the errors
				for (const required of ['tag', 'diameterM', 'heightM']) {
					if (!(required in r.values)) expect(errors).toHaveProperty(required);
				}
			}),
			settings(200)
		);
	});
});
