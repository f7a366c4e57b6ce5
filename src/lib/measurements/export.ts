/**
 * CSV downloads (papaparse `unparse`): profiles of a snapshot, residual histories and measurements.
 * Each file has one header row `label [unit]` (`[-]` for dimensionless, as in `src/lib/csv.ts`) and numbers in full double precision (JavaScript's
 * shortest round-trip form), so a measurement exported here reads back through
 * `parseMeasurementCsv` unchanged. Text cells that a spreadsheet would run as a formula are
 * escaped; a missing or non-finite number is an empty cell.
 */
import Papa from 'papaparse';
import { findUnit, fromSi, kindSpecs, type MeasurementKind } from './kinds.js';
import { fieldInfo } from '../fields.js';

export interface CsvColumn {
	label: string;
	/** SI unit written in the header, `1` for dimensionless */
	unit: string;
	values: ArrayLike<number>;
}

function header(label: string, unit: string): string {
	return `${label} [${unit === '1' || unit === '' ? '-' : unit}]`;
}

function cell(v: number | undefined): number | string {
	return v === undefined || !Number.isFinite(v) ? '' : v;
}

/** Columns of equal length side by side, one header row. Line ends are CRLF (RFC 4180). */
export function columnsToCsv(opts: { columns: CsvColumn[] }): string {
	const { columns } = opts;
	if (columns.length === 0) throw new Error('columnsToCsv needs at least one column');
	const n = columns[0].values.length;
	for (const c of columns) if (c.values.length !== n) throw new Error(`Column "${c.label}" has ${c.values.length} values, expected ${n}`);
	const data: Array<Array<number | string>> = [];
	for (let i = 0; i < n; i++) data.push(columns.map((c) => cell(c.values[i])));
	return Papa.unparse({ fields: columns.map((c) => header(c.label, c.unit)), data }, { escapeFormulae: true });
}

/** Units of the fields a snapshot may hold, for the header; unknown names are written with `?`. */
export const fieldUnits: Record<string, string> = Object.fromEntries(Object.entries(fieldInfo).map(([id, f]) => [id, f.unit]));

/**
 * A snapshot's profiles: position first, then every field in name order.
 * `positionLabel` is e.g. `height above the sparger` or `radius`.
 */
export function profilesToCsv(opts: {
	x: ArrayLike<number>;
	fields: Record<string, ArrayLike<number>>;
	positionLabel: string;
	positionUnit?: string;
	units?: Record<string, string>;
}): string {
	const units = { ...fieldUnits, ...(opts.units ?? {}) };
	const names = Object.keys(opts.fields).sort();
	return columnsToCsv({
		columns: [
			{ label: opts.positionLabel, unit: opts.positionUnit ?? 'm', values: opts.x },
			...names.map((name) => ({ label: name, unit: units[name] ?? '?', values: opts.fields[name] }))
		]
	});
}

/**
 * A residual history: step, simulated time, then every residual name that occurs (a name absent
 * in a row leaves the cell empty). Residuals are dimensionless.
 */
export function residualHistoryToCsv(opts: { rows: Array<{ step: number; timeS: number; residuals: Record<string, number> }> }): string {
	const names = [...new Set(opts.rows.flatMap((r) => Object.keys(r.residuals)))].sort();
	const fields = ['step [-]', 'time [s]', ...names.map((n) => header(n, '1'))];
	const data = opts.rows.map((r) => [r.step, cell(r.timeS), ...names.map((n) => cell(r.residuals[n]))]);
	return Papa.unparse({ fields, data }, { escapeFormulae: true });
}

/**
 * A measurement, in SI by default or in the given unit ids (those of `unitsByQuantity`), so an
 * analyst can download what was uploaded in the units it came in.
 */
export function measurementToCsv(opts: { kind: MeasurementKind; x: ArrayLike<number>; y: ArrayLike<number>; xUnit?: string; yUnit?: string }): string {
	const spec = kindSpecs[opts.kind];
	const xu = opts.xUnit ? findUnit(spec.x.quantity, opts.xUnit) : null;
	const yu = opts.yUnit ? findUnit(spec.y.quantity, opts.yUnit) : null;
	if (opts.xUnit && !xu) throw new Error(`Unknown unit "${opts.xUnit}" for ${spec.x.label}`);
	if (opts.yUnit && !yu) throw new Error(`Unknown unit "${opts.yUnit}" for ${spec.y.label}`);
	const xs = Array.from(opts.x, (v) => (xu ? fromSi(v, xu) : v));
	const ys = Array.from(opts.y, (v) => (yu ? fromSi(v, yu) : v));
	return columnsToCsv({
		columns: [
			{ label: spec.x.label, unit: xu ? xu.id : spec.x.siUnit, values: xs },
			{ label: spec.y.label, unit: yu ? yu.id : spec.y.siUnit, values: ys }
		]
	});
}

/** A safe download file name from free text: letters, digits, dot, dash and underscore only. */
export function csvFileName(...parts: string[]): string {
	const base = parts
		.map((p) => p.trim().replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^[-.]+|[-.]+$/g, ''))
		.filter((p) => p !== '')
		.join('_');
	return `${base || 'export'}.csv`;
}
