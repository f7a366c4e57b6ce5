/**
 * Reading a measurement file: CSV (papaparse) with two columns — position or time first, the
 * measured value second — in the units the uploader names. The result is the table in SI or the
 * list of every problem found, each naming the row and the column.
 *
 * File rules:
 * - at most {@link MAX_FILE_BYTES} bytes (400 KiB, inside the app server's default 512 kB request
 *   limit with room for the form fields) and {@link MAX_DATA_ROWS} data rows (20 000: a
 *   dissolved-oxygen logger at one reading a second fills five and a half hours);
 * - an optional header row (a first row whose cells are all non-numeric); blank lines are skipped;
 * - tab, semicolon or comma as the delimiter (in that order of preference); a point as the decimal
 *   separator;
 * - row numbers count the records of the file from 1, the header included, as a spreadsheet shows them.
 */
import Papa from 'papaparse';
import { findUnit, kindSpecs, toSi, type ColumnSpec, type MeasurementKind, type Unit } from './kinds.js';

export const MAX_FILE_BYTES = 409_600;
export const MAX_DATA_ROWS = 20_000;
/** Beyond this many problems the list ends with a count of the rest: nobody reads 20 000 lines. */
const MAX_LISTED_ISSUES = 50;

export interface CsvIssue {
	/** file row (1-based, header included), or null for a problem of the whole file */
	row: number | null;
	/** 1 or 2, or null */
	column: number | null;
	message: string;
}

export interface MeasurementTable {
	kind: MeasurementKind;
	/** x (position or time) in SI, strictly increasing */
	x: number[];
	/** measured value in SI */
	y: number[];
	/** the values as written in the file, for the preview */
	source: { x: number[]; y: number[]; xUnit: string; yUnit: string };
	/** the header row, if the file had one */
	header: [string, string] | null;
	/** file row of each point */
	rows: number[];
}

export type ParseResult = { ok: true; table: MeasurementTable } | { ok: false; errors: CsvIssue[] };

export interface ParseOptions {
	text: string;
	kind: MeasurementKind;
	/** unit id of column 1 (see `unitsByQuantity`) */
	xUnit: string;
	/** unit id of column 2 */
	yUnit: string;
	/** column height (sparger to top), m: required for the kinds measured along the height */
	columnHeightM?: number;
	maxBytes?: number;
	maxRows?: number;
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const DECIMAL_COMMA = /^[+-]?\d+,\d+$/;

function isBlank(cells: string[]): boolean {
	return cells.every((c) => c.trim() === '');
}

function looksNumeric(cell: string): boolean {
	const t = cell.trim();
	return NUMBER.test(t) || DECIMAL_COMMA.test(t);
}

/**
 * Tab if the file has tabs, else semicolon if it has semicolons (the spreadsheet export where the
 * comma is the decimal separator), else comma. Papaparse's own guess is left aside because a
 * semicolon file with decimal commas looks to it like a comma file.
 */
function chooseDelimiter(text: string): string {
	if (text.includes('\t')) return '\t';
	if (text.includes(';')) return ';';
	return ',';
}

/** Shortest readable form of an SI number for messages. */
function fmt(v: number): string {
	return Number.isInteger(v) ? String(v) : String(Number(v.toPrecision(6)));
}

/** Parse and check a measurement file; never throws. */
export function parseMeasurementCsv(opts: ParseOptions): ParseResult {
	const spec = kindSpecs[opts.kind];
	const maxBytes = opts.maxBytes ?? MAX_FILE_BYTES;
	const maxRows = opts.maxRows ?? MAX_DATA_ROWS;
	const errors: CsvIssue[] = [];

	const xUnit = findUnit(spec.x.quantity, opts.xUnit);
	const yUnit = findUnit(spec.y.quantity, opts.yUnit);
	if (!xUnit) errors.push({ row: null, column: 1, message: `Column 1 (${spec.x.label}): unknown unit "${opts.xUnit}"` });
	if (!yUnit) errors.push({ row: null, column: 2, message: `Column 2 (${spec.y.label}): unknown unit "${opts.yUnit}"` });
	let heightM = Infinity;
	if (spec.xIsHeight) {
		if (opts.columnHeightM === undefined || !(opts.columnHeightM > 0)) {
			errors.push({ row: null, column: null, message: 'The column height is needed to check the heights, and it is not set' });
		} else heightM = opts.columnHeightM;
	}
	if (errors.length) return { ok: false, errors };

	const bytes = new TextEncoder().encode(opts.text).length;
	if (bytes > maxBytes) {
		return { ok: false, errors: [{ row: null, column: null, message: `The file is ${bytes} bytes; the limit is ${maxBytes} bytes` }] };
	}
	const text = opts.text.replace(/^\uFEFF/, '');
	if (text.trim() === '') return { ok: false, errors: [{ row: null, column: null, message: 'The file is empty' }] };

	const parsed = Papa.parse<string[]>(text, { header: false, skipEmptyLines: false, dynamicTyping: false, delimiter: chooseDelimiter(text) });
	// field counts are checked per row below, with the column names; only quoting errors come from here
	for (const e of parsed.errors) {
		if (e.type === 'Quotes') errors.push({ row: (e.row ?? 0) + 1, column: null, message: `Row ${(e.row ?? 0) + 1}: ${e.message}` });
	}
	const records = parsed.data;

	let first = records.findIndex((r) => !isBlank(r));
	let header: [string, string] | null = null;
	const firstCells = first >= 0 ? records[first].map((c) => c.trim()).filter((c) => c !== '') : [];
	if (firstCells.length > 0 && firstCells.every((c) => !looksNumeric(c))) {
		const h = records[first].map((c) => c.trim());
		header = [h[0] ?? '', h[1] ?? ''];
		first += 1;
	}
	const dataIdx: number[] = [];
	for (let i = Math.max(first, 0); i < records.length; i++) if (!isBlank(records[i])) dataIdx.push(i);
	if (first < 0 || dataIdx.length === 0) {
		errors.push({ row: null, column: null, message: header ? 'The file has a header row but no data rows' : 'The file is empty' });
		return { ok: false, errors };
	}
	if (dataIdx.length > maxRows) {
		errors.push({ row: null, column: null, message: `The file has ${dataIdx.length} data rows; the limit is ${maxRows}` });
		return { ok: false, errors };
	}

	const name = (col: 1 | 2): string => {
		const c: ColumnSpec = col === 1 ? spec.x : spec.y;
		const h = header?.[col - 1];
		return h && h !== c.label ? `column ${col} (${h}: ${c.label})` : `column ${col} (${c.label})`;
	};
	const cellValue = (row: number, col: 1 | 2, raw: string | undefined): number | null => {
		const t = (raw ?? '').trim();
		if (t === '') {
			errors.push({ row, column: col, message: `Row ${row}, ${name(col)}: the value is missing` });
			return null;
		}
		if (!NUMBER.test(t)) {
			const hint = DECIMAL_COMMA.test(t) ? ' (use a point as the decimal separator)' : '';
			errors.push({ row, column: col, message: `Row ${row}, ${name(col)}: "${t}" is not a number${hint}` });
			return null;
		}
		const v = Number(t);
		if (!Number.isFinite(v)) {
			errors.push({ row, column: col, message: `Row ${row}, ${name(col)}: "${t}" is out of the number range` });
			return null;
		}
		return v;
	};

	const table: MeasurementTable = {
		kind: opts.kind,
		x: [],
		y: [],
		source: { x: [], y: [], xUnit: (xUnit as Unit).id, yUnit: (yUnit as Unit).id },
		header,
		rows: []
	};
	// the last accepted position, for the order check
	let prev: { x: number; row: number } | null = null;
	const positionWord = spec.x.quantity === 'time' ? 'time' : 'position';

	for (const i of dataIdx) {
		const row = i + 1;
		const cells = records[i];
		// spreadsheets often write trailing delimiters: empty cells beyond the second are ignored
		const extra = cells.slice(2);
		if (cells.length < 2 || !isBlank(extra)) {
			errors.push({
				row,
				column: null,
				message: `Row ${row}: expected 2 values (${spec.x.label}, ${spec.y.label}), found ${cells.length - extra.filter((c) => c.trim() === '').length}`
			});
			continue;
		}
		const xv = cellValue(row, 1, cells[0]);
		const yv = cellValue(row, 2, cells[1]);
		let xSi: number | null = null;
		if (xv !== null) {
			xSi = toSi(xv, xUnit as Unit);
			if (!Number.isFinite(xSi)) {
				// a huge value in a large unit (1e306 h) overflows in SI
				errors.push({ row, column: 1, message: `Row ${row}, ${name(1)}: ${fmt(xv)} ${(xUnit as Unit).id} is out of the number range in SI` });
				xSi = null;
			} else if (spec.xIsHeight && (xSi < 0 || xSi > heightM)) {
				errors.push({ row, column: 1, message: `Row ${row}, ${name(1)}: ${fmt(xSi)} m is outside the column (0 to ${fmt(heightM)} m above the sparger)` });
			} else if (xSi < spec.xRange[0] || xSi > spec.xRange[1]) {
				const what = spec.x.quantity === 'time' ? 'a time must not be negative' : 'r/R must lie between 0 and 1';
				errors.push({ row, column: 1, message: `Row ${row}, ${name(1)}: ${fmt(xSi)} is out of range (${what})` });
			}
			if (prev && xSi !== null) {
				if (xSi === prev.x) {
					errors.push({ row, column: 1, message: `Row ${row}, ${name(1)}: duplicate ${positionWord} ${fmt(xv)} ${(xUnit as Unit).id} (also in row ${prev.row})` });
				} else if (xSi < prev.x) {
					errors.push({
						row,
						column: 1,
						message: `Row ${row}, ${name(1)}: ${positionWord}s must increase down the file, but ${fmt(xv)} ${(xUnit as Unit).id} follows a larger value in row ${prev.row}`
					});
				}
			}
			if (xSi !== null && (!prev || xSi > prev.x)) prev = { x: xSi, row };
		}
		let ySi: number | null = null;
		if (yv !== null) {
			ySi = toSi(yv, yUnit as Unit);
			if (!Number.isFinite(ySi)) {
				errors.push({ row, column: 2, message: `Row ${row}, ${name(2)}: ${fmt(yv)} ${(yUnit as Unit).id} is out of the number range in SI` });
				ySi = null;
			} else if (ySi < spec.yRange[0] || ySi > spec.yRange[1]) {
				errors.push({ row, column: 2, message: `Row ${row}, ${name(2)}: ${fmt(yv)} ${(yUnit as Unit).id} is out of range (${spec.yRangeText})` });
			}
		}
		if (xv !== null && yv !== null && xSi !== null && ySi !== null) {
			table.x.push(xSi);
			table.y.push(ySi);
			table.source.x.push(xv);
			table.source.y.push(yv);
			table.rows.push(row);
		}
	}

	if (errors.length) {
		if (errors.length > MAX_LISTED_ISSUES) {
			const rest = errors.length - MAX_LISTED_ISSUES;
			errors.length = MAX_LISTED_ISSUES;
			errors.push({ row: null, column: null, message: `… and ${rest} more problems` });
		}
		return { ok: false, errors };
	}
	return { ok: true, table };
}
