/**
 * Geometric grid of bubble-volume pivots for the class method, and the hat-function lumping of a
 * volume onto its two neighbouring pivots that keeps both number and volume (Kumar & Ramkrishna 1996,
 * Chem. Eng. Sci. 51, 1311: a particle of volume v with x_i ≤ v < x_{i+1} counts as
 * (x_{i+1} − v)/(x_{i+1} − x_i) at x_i and (v − x_i)/(x_{i+1} − x_i) at x_{i+1}).
 *
 * Outside the grid only the volume can be kept: a volume below the first pivot counts as v/x_0
 * bubbles of the first class, one above the last as v/x_{n−1} of the last class. So gas volume is
 * conserved always, bubble number whenever every event stays inside the grid.
 */

export interface PivotGrid {
	/** number of classes n */
	classes: number;
	/** volume ratio of successive pivots, x_{i+1}/x_i (2 = the doubling grid) */
	ratio: number;
	/** pivot volumes x_i, m³ */
	volumesM3: Float64Array;
	/** volume-equivalent diameters of the pivots, m */
	diametersM: Float64Array;
}

/** Volume of a sphere of diameter d, m³. */
export function sphereVolumeM3(diameterM: number): number {
	return (Math.PI / 6) * diameterM * diameterM * diameterM;
}

/** Diameter of a sphere of volume v, m. */
export function sphereDiameterM(volumeM3: number): number {
	return Math.cbrt((6 / Math.PI) * volumeM3);
}

/**
 * Pivots x_i = x_0 r^i, i = 0 … n − 1, x_0 the volume of a sphere of `minDiameterM`.
 * @example pivotGrid({ minDiameterM: 1e-3, ratio: 2, classes: 16 }) // 1 mm … 32 mm (diameters grow by 2^(1/3))
 */
export function pivotGrid(o: { minDiameterM: number; ratio: number; classes: number }): PivotGrid {
	if (!(o.minDiameterM > 0 && Number.isFinite(o.minDiameterM))) throw new Error('Pivot grid: the smallest diameter must be a positive number of metres');
	if (!(o.ratio > 1 && Number.isFinite(o.ratio))) throw new Error('Pivot grid: the volume ratio must be greater than 1');
	if (!(Number.isInteger(o.classes) && o.classes >= 2)) throw new Error('Pivot grid: at least 2 classes are needed');
	const n = o.classes;
	const volumesM3 = new Float64Array(n);
	const diametersM = new Float64Array(n);
	const v0 = sphereVolumeM3(o.minDiameterM);
	for (let i = 0; i < n; i++) {
		volumesM3[i] = v0 * Math.pow(o.ratio, i);
		diametersM[i] = i === 0 ? o.minDiameterM : sphereDiameterM(volumesM3[i]);
	}
	return { classes: n, ratio: o.ratio, volumesM3, diametersM };
}

/** Index i of the pivot with x_i ≤ v < x_{i+1}; −1 below the first pivot, n − 1 at or above the last. */
export function pivotBelow(grid: PivotGrid, volumeM3: number): number {
	const x = grid.volumesM3;
	const n = grid.classes;
	if (volumeM3 < x[0]) return -1;
	if (volumeM3 >= x[n - 1]) return n - 1;
	let lo = 0;
	let hi = n - 1; // x[lo] ≤ v < x[hi]
	while (hi - lo > 1) {
		const mid = (lo + hi) >> 1;
		if (x[mid] <= volumeM3) lo = mid;
		else hi = mid;
	}
	return lo;
}

/** Where a volume lands: `low` bubbles at pivot `index`, `high` bubbles at pivot `index + 1`. */
export interface Lumping {
	index: number;
	low: number;
	high: number;
}

/**
 * Number- and volume-preserving lumping of one bubble of volume v (Kumar & Ramkrishna 1996, fixed pivot).
 * Written into `into` (no allocation); `index + 1` may equal n only with `high` = 0.
 * Below the grid: index 0, low = v/x_0; above: index n − 2, high = v/x_{n−1} (volume kept, number not).
 */
export function lumpVolume(grid: PivotGrid, volumeM3: number, into: Lumping): Lumping {
	const x = grid.volumesM3;
	const n = grid.classes;
	const i = pivotBelow(grid, volumeM3);
	if (i < 0) {
		into.index = 0;
		into.low = volumeM3 / x[0];
		into.high = 0;
	} else if (i >= n - 1) {
		into.index = n - 2;
		into.low = 0;
		into.high = volumeM3 / x[n - 1];
	} else {
		const low = (x[i + 1] - volumeM3) / (x[i + 1] - x[i]);
		into.index = i;
		into.low = low;
		into.high = 1 - low;
	}
	return into;
}

const gaussCache = new Map<number, { nodes: Float64Array; weights: Float64Array }>();

/**
 * Gauss–Legendre nodes and weights on [0, 1] (Newton on the Legendre recurrence; Abramowitz & Stegun 25.4.29).
 * Exact for polynomials up to degree 2m − 1.
 */
export function gaussLegendreUnit(m: number): { nodes: Float64Array; weights: Float64Array } {
	const cached = gaussCache.get(m);
	if (cached) return cached;
	const nodes = new Float64Array(m);
	const weights = new Float64Array(m);
	for (let i = 0; i < m; i++) {
		let x = Math.cos((Math.PI * (i + 0.75)) / (m + 0.5));
		let dp = 1;
		for (let it = 0; it < 100; it++) {
			let p0 = 1;
			let p1 = x;
			for (let k = 2; k <= m; k++) {
				const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
				p0 = p1;
				p1 = p2;
			}
			dp = (m * (x * p1 - p0)) / (x * x - 1);
			const dx = p1 / dp;
			x -= dx;
			if (Math.abs(dx) < 1e-16) break;
		}
		// recompute the derivative at the converged node
		let p0 = 1;
		let p1 = x;
		for (let k = 2; k <= m; k++) {
			const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
			p0 = p1;
			p1 = p2;
		}
		dp = (m * (x * p1 - p0)) / (x * x - 1);
		nodes[m - 1 - i] = 0.5 * (1 + x);
		weights[m - 1 - i] = 1 / ((1 - x * x) * dp * dp);
	}
	const rule = { nodes, weights };
	gaussCache.set(m, rule);
	return rule;
}
