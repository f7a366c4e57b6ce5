import { describe, expect, it } from 'vitest';
import { columnsToCsv, csvFileName, measurementToCsv, parseMeasurementCsv, profilesToCsv, residualHistoryToCsv } from '../../src/lib/measurements/index.js';

describe('CSV exports', () => {
	it('writes a measurement that reads back unchanged in SI', () => {
		const x = [0.1, 0.35, 1.2345678901234567];
		const y = [0.0123456789, 0.2, 1 / 3];
		const csv = measurementToCsv({ kind: 'holdup-height', x, y });
		expect(csv.split('\r\n')[0]).toBe('height above the sparger [m],gas holdup [-]');
		const back = parseMeasurementCsv({ text: csv, kind: 'holdup-height', xUnit: 'm', yUnit: '1', columnHeightM: 2 });
		expect(back.ok && back.table.x).toEqual(x);
		expect(back.ok && back.table.y).toEqual(y);
	});

	it('writes a measurement in the units it was uploaded in', () => {
		const csv = measurementToCsv({ kind: 'dissolved-oxygen', x: [0, 90], y: [0.5e-3, 2.25e-3], xUnit: 'min', yUnit: 'mg/L' });
		const lines = csv.split('\r\n');
		expect(lines[0]).toBe('time [min],dissolved oxygen [mg/L]');
		expect(lines[2]).toBe('1.5,2.25');
	});

	it('writes profiles with the position first and fields in name order', () => {
		const csv = profilesToCsv({ x: new Float64Array([0.05, 0.15]), fields: { pressure: new Float64Array([101000, 100000]), holdup: new Float64Array([0.1, NaN]) }, positionLabel: 'height' });
		expect(csv).toBe('height [m],holdup [-],pressure [Pa]\r\n0.05,0.1,101000\r\n0.15,,100000');
	});

	it('writes a residual history with an empty cell where a residual is absent', () => {
		const csv = residualHistoryToCsv({
			rows: [
				{ step: 1, timeS: 0.01, residuals: { gasMass: 1e-3, liquidMass: 2e-4 } },
				{ step: 2, timeS: 0.02, residuals: { gasMass: 5e-4 } }
			]
		});
		expect(csv).toBe('step [-],time [s],gasMass [-],liquidMass [-]\r\n1,0.01,0.001,0.0002\r\n2,0.02,0.0005,');
	});

	it('escapes text a spreadsheet would run as a formula and refuses ragged columns', () => {
		expect(columnsToCsv({ columns: [{ label: '=HYPERLINK("x")', unit: '1', values: [1] }] }).split('\r\n')[0]).toBe('"\'=HYPERLINK(""x"") [-]"');
		expect(() => columnsToCsv({ columns: [{ label: 'a', unit: '1', values: [1] }, { label: 'b', unit: '1', values: [] }] })).toThrow('Column "b" has 0 values, expected 1');
	});

	it('makes safe file names', () => {
		expect(csvFileName('C-201 / pilot', 'holdup profile')).toBe('C-201-pilot_holdup-profile.csv');
		expect(csvFileName('../..')).toBe('export.csv');
		expect(csvFileName('')).toBe('export.csv');
	});
});
