/** Latency figures shared by the benches: nearest-rank percentiles of a sample, rounded for printing. */

/** Nearest-rank percentile of an ascending sample (NaN when empty). */
export function percentile(sorted: number[], p: number): number {
	if (sorted.length === 0) return NaN;
	return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
}

export const round = (x: number, d = 1) => Math.round(x * 10 ** d) / 10 ** d;

/** count, p50, p95 (p99 when asked) and max of a sample, to 0.1. */
export function stats(values: number[], o: { p99?: boolean } = {}) {
	const s = [...values].sort((a, b) => a - b);
	return {
		count: s.length,
		p50: round(percentile(s, 50)),
		p95: round(percentile(s, 95)),
		...(o.p99 ? { p99: round(percentile(s, 99)) } : {}),
		max: round(s[s.length - 1] ?? NaN)
	};
}
