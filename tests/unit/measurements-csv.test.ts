import { describe, expect, it } from 'vitest';
import { MAX_DATA_ROWS, MAX_FILE_BYTES, parseMeasurementCsv, type ParseOptions } from '../../src/lib/measurements/index.js';

const holdup = (text: string, extra: Partial<ParseOptions> = {}) =>
	parseMeasurementCsv({ text, kind: 'holdup-height', xUnit: 'cm', yUnit: '%', columnHeightM: 2, ...extra });

function messages(r: ReturnType<typeof parseMeasurementCsv>): string[] {
	return r.ok ? [] : r.errors.map((e) => e.message);
}

describe('reading a measurement file', () => {
	it('reads a holdup profile with a header and converts cm and % to SI', () => {
		const r = holdup('z_cm,holdup_pct\r\n10,4.5\r\n50,12\r\n120.5,13.25\r\n\r\n');
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		// 1 cm = 0.01 m, 1 % = 0.01 (definitions)
		expect(r.table.x).toEqual([0.1, 0.5, 1.205]);
		expect(r.table.y[0]).toBeCloseTo(0.045, 15);
		expect(r.table.y[2]).toBeCloseTo(0.1325, 15);
		expect(r.table.header).toEqual(['z_cm', 'holdup_pct']);
		expect(r.table.rows).toEqual([2, 3, 4]);
		expect(r.table.source).toEqual({ x: [10, 50, 120.5], y: [4.5, 12, 13.25], xUnit: 'cm', yUnit: '%' });
	});

	it('reads every kind in its units without a header and with other delimiters', () => {
		// 1 kPa = 1000 Pa; 1 psi = 6894.757 Pa (common practice)
		const p = parseMeasurementCsv({ text: '0.2;121.3\n1.0;113.6\n', kind: 'pressure-height', xUnit: 'm', yUnit: 'kPa', columnHeightM: 2 });
		expect(p.ok && p.table.y).toEqual([121300, 113600]);
		const psi = parseMeasurementCsv({ text: '0,14.7\n', kind: 'pressure-height', xUnit: 'm', yUnit: 'psi', columnHeightM: 2 });
		expect(psi.ok && psi.table.y[0]).toBeCloseTo(101352.9, 1);
		const r = parseMeasurementCsv({ text: '0\t0.21\n0.5\t0.15\n0.95\t0.02\n', kind: 'holdup-radial', xUnit: '1', yUnit: '1' });
		expect(r.ok && r.table.x).toEqual([0, 0.5, 0.95]);
		const v = parseMeasurementCsv({ text: '0,32\n0.7,0\n0.9,-12.5\n', kind: 'liquid-velocity-radial', xUnit: '1', yUnit: 'cm/s' });
		expect(v.ok && v.table.y).toEqual([0.32, 0, -0.125]);
		// 1 min = 60 s; 1 mg/L = 1 g/m³ = 1e-3 kg/m³
		const d = parseMeasurementCsv({ text: 'time,DO\n0,0.5\n1.5,2.25\n', kind: 'dissolved-oxygen', xUnit: 'min', yUnit: 'mg/L' });
		expect(d.ok && d.table.x).toEqual([0, 90]);
		expect(d.ok && d.table.y[1]).toBeCloseTo(2.25e-3, 15);
	});

	it('refuses a missing value naming the row and the column', () => {
		expect(messages(holdup('z,holdup\n10,4\n20,\n'))).toEqual(['Row 3, column 2 (holdup: gas holdup): the value is missing']);
		expect(messages(holdup('10,4\n,5\n'))).toEqual(['Row 2, column 1 (height above the sparger): the value is missing']);
	});

	it('refuses a non-numeric value and hints at a decimal comma', () => {
		expect(messages(holdup('10,4\n20,abc\n'))).toEqual(['Row 2, column 2 (gas holdup): "abc" is not a number']);
		expect(messages(holdup('10;4\n20;4,5\n'))).toEqual(['Row 2, column 2 (gas holdup): "4,5" is not a number (use a point as the decimal separator)']);
	});

	it('refuses a holdup outside 0 to 1', () => {
		expect(messages(holdup('10,4\n20,104\n30,-1\n'))).toEqual([
			'Row 2, column 2 (gas holdup): 104 % is out of range (a holdup must lie between 0 and 1)',
			'Row 3, column 2 (gas holdup): -1 % is out of range (a holdup must lie between 0 and 1)'
		]);
		expect(messages(parseMeasurementCsv({ text: '0.5,1.2\n', kind: 'holdup-radial', xUnit: '1', yUnit: '1' }))).toEqual([
			'Row 1, column 2 (gas holdup): 1.2 1 is out of range (a holdup must lie between 0 and 1)'
		]);
	});

	it('refuses a height outside the column', () => {
		expect(messages(holdup('10,4\n250,5\n'))).toEqual(['Row 2, column 1 (height above the sparger): 2.5 m is outside the column (0 to 2 m above the sparger)']);
		expect(messages(holdup('-5,4\n10,5\n'))).toEqual(['Row 1, column 1 (height above the sparger): -0.05 m is outside the column (0 to 2 m above the sparger)']);
		expect(messages(parseMeasurementCsv({ text: '1.1,0.1\n', kind: 'holdup-radial', xUnit: '1', yUnit: '1' }))).toEqual([
			'Row 1, column 1 (r/R): 1.1 is out of range (r/R must lie between 0 and 1)'
		]);
	});

	it('refuses unsorted and duplicate positions', () => {
		expect(messages(holdup('10,4\n20,5\n20,6\n'))).toEqual(['Row 3, column 1 (height above the sparger): duplicate position 20 cm (also in row 2)']);
		expect(messages(holdup('10,4\n30,5\n20,6\n'))).toEqual([
			'Row 3, column 1 (height above the sparger): positions must increase down the file, but 20 cm follows a larger value in row 2'
		]);
		expect(messages(parseMeasurementCsv({ text: '0,1\n60,2\n30,3\n', kind: 'dissolved-oxygen', xUnit: 's', yUnit: 'mg/L' }))).toEqual([
			'Row 3, column 1 (time): times must increase down the file, but 30 s follows a larger value in row 2'
		]);
	});

	it('refuses an empty file and a header without data', () => {
		expect(messages(holdup(''))).toEqual(['The file is empty']);
		expect(messages(holdup('\n \n\n'))).toEqual(['The file is empty']);
		expect(messages(holdup('z,holdup\n\n'))).toEqual(['The file has a header row but no data rows']);
	});

	it('refuses a file over the size or row limit', () => {
		expect(MAX_FILE_BYTES).toBe(409_600);
		expect(MAX_DATA_ROWS).toBe(20_000);
		const big = 'x'.repeat(MAX_FILE_BYTES + 1);
		expect(messages(holdup(big))).toEqual([`The file is ${MAX_FILE_BYTES + 1} bytes; the limit is ${MAX_FILE_BYTES} bytes`]);
		const rows = Array.from({ length: MAX_DATA_ROWS + 1 }, (_, i) => `${i},0.5`).join('\n');
		expect(messages(parseMeasurementCsv({ text: rows, kind: 'dissolved-oxygen', xUnit: 's', yUnit: 'mg/L' }))).toEqual([
			`The file has ${MAX_DATA_ROWS + 1} data rows; the limit is ${MAX_DATA_ROWS}`
		]);
	});

	it('refuses rows with the wrong number of values but ignores trailing empty cells', () => {
		expect(messages(holdup('10,4,7\n20\n'))).toEqual([
			'Row 1: expected 2 values (height above the sparger, gas holdup), found 3',
			'Row 2: expected 2 values (height above the sparger, gas holdup), found 1'
		]);
		expect(holdup('z,holdup,\n10,4,\n20,5,,\n').ok).toBe(true);
	});

	it('lists every problem, capped at fifty with a count of the rest', () => {
		const text = Array.from({ length: 60 }, (_, i) => `${i},x`).join('\n');
		const m = messages(holdup(text));
		expect(m).toHaveLength(51);
		expect(m[50]).toBe('… and 10 more problems');
	});

	it('refuses an unknown unit and a height profile without the column height', () => {
		expect(messages(holdup('1,2\n', { yUnit: 'ppm' }))).toEqual(['Column 2 (gas holdup): unknown unit "ppm"']);
		expect(messages(holdup('1,2\n', { columnHeightM: undefined }))).toEqual(['The column height is needed to check the heights, and it is not set']);
	});
});
