/**
 * The solver's verification: every case of `verificationCases` run in turn, each judged against its
 * tolerance (and its expected order of accuracy). Pure and synchronous; the worker runs it on a
 * thread of its own and stores the results per solver version.
 */
import { verificationCases } from './cases.js';
import type { VerificationCase, VerificationOutcome, VerificationProgress, VerificationResult } from './types.js';

export { verificationCases } from './cases.js';
export type * from './types.js';

/** Whether an outcome meets its tolerance, its further checks and its expected order. */
export function outcomePasses(o: VerificationOutcome): boolean {
	if (!Number.isFinite(o.error) || !(o.error <= o.tolerance)) return false;
	for (const c of o.checks ?? []) {
		if (!Number.isFinite(c.value)) return false;
		if (c.atLeast ? !(c.value >= c.tolerance) : !(c.value <= c.tolerance)) return false;
	}
	if (o.order) {
		const [lo, hi] = o.order.expected;
		if (!o.order.pairwise.every((p) => p >= lo && p <= hi)) return false;
		if (!(o.order.observed >= lo && o.order.observed <= hi)) return false;
	}
	return true;
}

/**
 * Run the verification cases (all of them unless `cases` says which) and judge each. A case that throws
 * is recorded with its message, a NaN error and `passed: false`; the others still run.
 * `onProgress` is called at least once per grid or run of every case.
 */
export function runVerification(options: { onProgress?: (p: VerificationProgress) => void; cases?: readonly VerificationCase[] } = {}): VerificationResult[] {
	const cases = options.cases ?? verificationCases;
	const results: VerificationResult[] = [];
	cases.forEach((c, index) => {
		const report = (fraction: number) =>
			options.onProgress?.({ fraction: (index + Math.min(1, Math.max(0, fraction))) / cases.length, caseIndex: index, caseCount: cases.length, caseId: c.id, caseTitle: c.title });
		report(0);
		const started = performance.now();
		const head = { id: c.id, title: c.title, reference: c.reference, source: c.source, what: c.what };
		try {
			const outcome = c.run(report);
			results.push({ ...head, ...outcome, passed: outcomePasses(outcome), durationS: (performance.now() - started) / 1000 });
		} catch (e) {
			const message = e instanceof Error ? e.message : String(e);
			results.push({
				...head,
				error: Number.NaN,
				errorUnit: '',
				tolerance: Number.NaN,
				errorWhat: '',
				chart: { x: [], xLabel: '', yLabel: '', series: [] },
				passed: false,
				durationS: (performance.now() - started) / 1000,
				failure: message
			});
		}
		report(1);
	});
	return results;
}
