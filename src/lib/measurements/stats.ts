/**
 * The few statistics the re-aeration analysis needs: the Student t quantile for confidence
 * intervals, and a small dense solve. Written here because the only packages that offer them are
 * large general statistics libraries.
 */

const LANCZOS_G = 7;
const LANCZOS = [
	0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905,
	-0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7
];

/**
 * ln Γ(x) for x > 0 by the Lanczos approximation (g = 7, nine coefficients), relative error
 * about 1e-15 for x ≥ 0.5; below that through the reflection Γ(x)Γ(1−x) = π / sin(πx).
 *
 * Example: lnGamma(5) → ln 24 = 3.1780538…
 */
export function lnGamma(x: number): number {
	if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x);
	const z = x - 1;
	let a = LANCZOS[0];
	const t = z + LANCZOS_G + 0.5;
	for (let i = 1; i < LANCZOS.length; i++) a += LANCZOS[i] / (z + i);
	return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(a);
}

/** Continued fraction of the incomplete beta function (modified Lentz), Abramowitz & Stegun 26.5.8. */
function betaContinuedFraction(a: number, b: number, x: number): number {
	const tiny = 1e-300;
	let c = 1;
	let d = 1 - ((a + b) * x) / (a + 1);
	if (Math.abs(d) < tiny) d = tiny;
	d = 1 / d;
	let h = d;
	for (let m = 1; m <= 500; m++) {
		const m2 = 2 * m;
		let aa = (m * (b - m) * x) / ((a - 1 + m2) * (a + m2));
		d = 1 + aa * d;
		if (Math.abs(d) < tiny) d = tiny;
		c = 1 + aa / c;
		if (Math.abs(c) < tiny) c = tiny;
		d = 1 / d;
		h *= d * c;
		aa = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + 1 + m2));
		d = 1 + aa * d;
		if (Math.abs(d) < tiny) d = tiny;
		c = 1 + aa / c;
		if (Math.abs(c) < tiny) c = tiny;
		d = 1 / d;
		const del = d * c;
		h *= del;
		if (Math.abs(del - 1) < 1e-15) break;
	}
	return h;
}

/** Regularised incomplete beta function I_x(a, b), 0 ≤ x ≤ 1. */
export function regularizedIncompleteBeta(x: number, a: number, b: number): number {
	if (x <= 0) return 0;
	if (x >= 1) return 1;
	const front = Math.exp(lnGamma(a + b) - lnGamma(a) - lnGamma(b) + a * Math.log(x) + b * Math.log(1 - x));
	// the fraction converges fast only on this side of the mean; use the symmetry otherwise
	if (x < (a + 1) / (a + b + 2)) return (front * betaContinuedFraction(a, b, x)) / a;
	return 1 - (front * betaContinuedFraction(b, a, 1 - x)) / b;
}

/**
 * Student t cumulative distribution with ν degrees of freedom:
 * F(t) = 1 − ½ I_{ν/(ν+t²)}(ν/2, ½) for t ≥ 0, and F(−t) = 1 − F(t).
 */
export function studentTCdf(t: number, dof: number): number {
	const tail = 0.5 * regularizedIncompleteBeta(dof / (dof + t * t), dof / 2, 0.5);
	return t >= 0 ? 1 - tail : tail;
}

/**
 * Quantile of the Student t distribution: the t with F(t) = p, by bisection on the CDF
 * (monotone, so bisection cannot fail; 200 halvings reach double precision).
 *
 * Example: studentTQuantile(0.975, 10) → 2.2281…
 */
export function studentTQuantile(p: number, dof: number): number {
	if (!(p > 0 && p < 1)) throw new Error('studentTQuantile needs 0 < p < 1');
	if (!(dof > 0)) throw new Error('studentTQuantile needs dof > 0');
	if (p === 0.5) return 0;
	if (p < 0.5) return -studentTQuantile(1 - p, dof);
	let lo = 0;
	let hi = 1;
	while (studentTCdf(hi, dof) < p) hi *= 2;
	for (let i = 0; i < 200 && hi - lo > 1e-14 * hi; i++) {
		const mid = 0.5 * (lo + hi);
		if (studentTCdf(mid, dof) < p) lo = mid;
		else hi = mid;
	}
	return 0.5 * (lo + hi);
}

/**
 * Solve the small dense system A x = b by Gaussian elimination with partial pivoting; returns
 * null when A is singular to working precision. A is row-major n×n and is not modified.
 */
export function solveDense(A: number[][], b: number[]): number[] | null {
	const n = b.length;
	const M = A.map((row, i) => [...row, b[i]]);
	let scale = 0;
	for (const row of A) for (const v of row) scale = Math.max(scale, Math.abs(v));
	if (scale === 0) return null;
	for (let k = 0; k < n; k++) {
		let p = k;
		for (let i = k + 1; i < n; i++) if (Math.abs(M[i][k]) > Math.abs(M[p][k])) p = i;
		if (Math.abs(M[p][k]) <= 1e-14 * scale) return null;
		[M[k], M[p]] = [M[p], M[k]];
		for (let i = k + 1; i < n; i++) {
			const f = M[i][k] / M[k][k];
			for (let j = k; j <= n; j++) M[i][j] -= f * M[k][j];
		}
	}
	const x = new Array<number>(n).fill(0);
	for (let i = n - 1; i >= 0; i--) {
		let s = M[i][n];
		for (let j = i + 1; j < n; j++) s -= M[i][j] * x[j];
		x[i] = s / M[i][i];
	}
	return x;
}

/** Inverse of a small dense matrix, or null if singular. */
export function invertDense(A: number[][]): number[][] | null {
	const n = A.length;
	const cols: number[][] = [];
	for (let j = 0; j < n; j++) {
		const e = new Array<number>(n).fill(0);
		e[j] = 1;
		const c = solveDense(A, e);
		if (!c) return null;
		cols.push(c);
	}
	return A.map((_, i) => cols.map((c) => c[i]));
}
