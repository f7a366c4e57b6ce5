/**
 * How a verification result reads, wherever it is shown: the verification page's sortable summary and
 * the printable comparison report list the same columns, formatted by the same functions (browser and
 * server alike; no server imports).
 */
import type { Column } from './components/table';
import { formatNumber } from './units';
import type { VerificationResult } from '../../solver/verification/types';

const finite = (x: number | null | undefined): x is number => x !== null && x !== undefined && Number.isFinite(x);

/** A number in a case's error unit: `0.42 %`, `1.3 mm`; `1` (dimensionless) shows no unit; `—` when not finite. */
export function verificationQuantity(x: number | null | undefined, unit: string, digits = 3): string {
	if (!finite(x)) return '—';
	return `${formatNumber(x, digits)}${unit === '1' ? '' : ` ${unit}`}`;
}

/** An order of accuracy with two decimals, `—` when there is none. */
export function orderText(p: number | null | undefined): string {
	return finite(p) ? p.toFixed(2) : '—';
}

export const resultText = (passed: boolean) => (passed ? 'pass' : 'fail');

/** How many cases pass, and the failing ones. */
export function verificationTally(results: readonly VerificationResult[]) {
	const failed = results.filter((r) => !r.passed);
	return { passed: results.length - failed.length, total: results.length, failed };
}

/** A column of the verification summary: sorts and filters by `value`, reads as `text`. */
export interface VerificationColumn extends Column<VerificationResult> {
	text: (r: VerificationResult) => string;
}

/** The summary's columns: case, source, error, tolerance, result, observed order. */
export const verificationSummaryColumns: VerificationColumn[] = [
	{ key: 'title', label: 'Case', value: (r) => r.title, text: (r) => r.title },
	{ key: 'source', label: 'Source', value: (r) => r.reference, text: (r) => r.reference },
	{ key: 'error', label: 'Error', value: (r) => r.error, align: 'right', text: (r) => verificationQuantity(r.error, r.errorUnit) },
	{ key: 'tolerance', label: 'Tolerance', value: (r) => r.tolerance, align: 'right', text: (r) => `≤ ${verificationQuantity(r.tolerance, r.errorUnit)}` },
	{ key: 'passed', label: 'Result', value: (r) => resultText(r.passed), text: (r) => resultText(r.passed) },
	{ key: 'order', label: 'Observed order', value: (r) => r.order?.observed ?? null, align: 'right', text: (r) => orderText(r.order?.observed) }
];

/** The note under the summary: what the numbers are. */
export const verificationSummaryNote =
	'A case passes when its error is within its tolerance, its further checks hold and, where a grid sequence applies, every observed order lies in the range its scheme should show.';

/** The text of one summary cell, by column key (for tables that hand back a plain `Column`). */
export function verificationCellText(key: string, r: VerificationResult): string {
	return verificationSummaryColumns.find((c) => c.key === key)?.text(r) ?? '';
}
