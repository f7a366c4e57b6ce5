import { describe, expect, it } from 'vitest';
import { csvField, toCsv, unitHeader } from '../../src/lib/csv';

describe('CSV downloads', () => {
	// RFC 4180 §2: fields containing commas, quotes or line breaks are quoted; quotes are doubled
	it('quotes fields with commas, quotes or line breaks as RFC 4180 requires', () => {
		expect(csvField('a,b')).toBe('"a,b"');
		expect(csvField('say "hi"')).toBe('"say ""hi"""');
		expect(csvField('two\nlines')).toBe('"two\nlines"');
		expect(csvField('plain')).toBe('plain');
	});

	it('writes numbers at full precision and leaves non-finite values empty', () => {
		expect(csvField(0.1 + 0.2)).toBe('0.30000000000000004');
		expect(csvField(Number.NaN)).toBe('');
		expect(csvField(null)).toBe('');
	});

	it('ends every record with CRLF, header first', () => {
		expect(toCsv({ header: ['z [m]', 'holdup [-]'], rows: [[0.01, 0.05], [0.03, 0.06]] })).toBe('z [m],holdup [-]\r\n0.01,0.05\r\n0.03,0.06\r\n');
	});

	it('names the unit of every column', () => {
		expect(unitHeader('pressure', 'Pa')).toBe('pressure [Pa]');
		expect(unitHeader('holdup', '1')).toBe('holdup [-]');
	});
});
