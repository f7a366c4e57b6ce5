/**
 * CSV for downloads (RFC 4180: comma separated, CRLF line ends, fields with a comma, quote or line
 * break quoted with doubled quotes). Numbers are written with full precision so a spreadsheet
 * gets exactly what the solver computed.
 */
export function csvField(v: unknown): string {
	if (v === null || v === undefined) return '';
	if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
	const s = String(v);
	return /[",\r\n]/.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
}

export function toCsv(options: { header: string[]; rows: unknown[][] }): string {
	const lines = [options.header.map(csvField).join(',')];
	for (const r of options.rows) lines.push(r.map(csvField).join(','));
	return lines.join('\r\n') + '\r\n';
}

/** Column header for a field: its name and its SI unit in brackets, e.g. `pressure [Pa]`. */
export function unitHeader(name: string, unit: string): string {
	return unit && unit !== '1' ? `${name} [${unit}]` : `${name} [-]`;
}
