/**
 * The verification cases the verification page shows (solver/verification/): every case runs, has a
 * finite error within its tolerance, and reports its progress; the faucet's observed order is that of
 * a first-order scheme. The same set-ups are asserted one by one in the other solver tests.
 */
import { describe, expect, it } from 'vitest';
import { runVerification, verificationCases, outcomePasses } from '../../solver/verification/index.js';
import type { VerificationProgress } from '../../solver/verification/types.js';

describe('the verification cases', () => {
	const progress: VerificationProgress[] = [];
	const t0 = performance.now();
	const results = runVerification({ onProgress: (p) => progress.push(p) });
	const wallS = (performance.now() - t0) / 1000;

	it('all run, each with a finite error within its tolerance, a source and a chart', () => {
		expect(results.map((r) => r.id)).toEqual(verificationCases.map((c) => c.id));
		expect(new Set(results.map((r) => r.id)).size).toBe(results.length);
		for (const r of results) {
			expect(r.failure, r.id).toBeUndefined();
			expect(Number.isFinite(r.error), r.id).toBe(true);
			expect(r.error, `${r.id}: ${r.error} ${r.errorUnit}`).toBeLessThanOrEqual(r.tolerance);
			expect(r.passed, r.id).toBe(true);
			expect(r.source).toMatch(/\(\d{4}\)|definition|Hydrostatics|Analytic|Conservation/);
			expect(r.chart.series.length).toBeGreaterThan(1);
			for (const s of r.chart.series) expect(s.y.length, `${r.id}: ${s.label}`).toBe(r.chart.x.length);
			for (let i = 1; i < r.chart.x.length; i++) expect(r.chart.x[i], `${r.id}: x ascending`).toBeGreaterThan(r.chart.x[i - 1]);
		}
		// the set stays cheap: a few seconds here, well inside the half minute it may take on a worker
		expect(wallS).toBeLessThan(30);
	});

	it('gives the faucet an observed order between ½ and 1 at t = 0.5 s and about 1 at steady state', () => {
		const transient = results.find((r) => r.id === 'faucet-transient')!;
		expect(transient.order?.cells).toEqual([48, 96, 192]);
		expect(transient.order!.observed).toBeGreaterThan(0.4);
		expect(transient.order!.observed).toBeLessThan(1.0);
		const steady = results.find((r) => r.id === 'faucet-steady')!;
		expect(Math.abs(steady.order!.observed - 1)).toBeLessThan(0.25);
		expect(Math.abs(results.find((r) => r.id === 'recirculation-profile')!.order!.observed - 2)).toBeLessThan(0.1);
	});

	it('reports progress from 0 to 1 without going back', () => {
		expect(progress[0].fraction).toBe(0);
		expect(progress.at(-1)!.fraction).toBe(1);
		for (let i = 1; i < progress.length; i++) expect(progress[i].fraction).toBeGreaterThanOrEqual(progress[i - 1].fraction);
		expect(new Set(progress.map((p) => p.caseId)).size).toBe(verificationCases.length);
	});

	it('fails a case that misses its tolerance, its expected order or a check, and records one that throws', () => {
		const base = results.find((r) => r.id === 'faucet-transient')!;
		expect(outcomePasses({ ...base, error: base.tolerance * 2 })).toBe(false);
		expect(outcomePasses({ ...base, order: { ...base.order!, pairwise: [0.1, 0.2], observed: 0.2 } })).toBe(false);
		expect(outcomePasses({ ...base, checks: [{ label: 'x', value: 2, tolerance: 1, unit: '1' }] })).toBe(false);
		expect(outcomePasses({ ...base, checks: [{ label: 'x', value: 2, tolerance: 1, unit: '1', atLeast: true }] })).toBe(true);
		const [broken] = runVerification({ cases: [{ id: 'broken', title: 'Broken', reference: 'none', source: 'none', what: 'throws', run: () => { throw new Error('no such grid'); } }] });
		expect(broken.passed).toBe(false);
		expect(broken.failure).toBe('no such grid');
		expect(Number.isNaN(broken.error)).toBe(true);
	});
});
