/**
 * Uniform radial finite-volume grid on r ∈ [0, R]: cell i spans [i Δr, (i+1) Δr], face j sits at
 * r = j Δr (face 0 on the axis, face N on the wall). Areas and volumes are per radian and per
 * metre of height (face area r, cell volume (r₊² − r₋²)/2), which is all a ratio ever needs.
 */
export interface RadialGrid {
	cells: number;
	radiusM: number;
	drM: number;
	/** cell-centre radii, m (length N) */
	centresM: Float64Array;
	/** face radii, m (length N + 1) */
	facesM: Float64Array;
	/** cell volumes per radian and metre, m² (length N) */
	volumes: Float64Array;
	/** Σ volumes = R²/2 */
	totalVolume: number;
}

export function createRadialGrid(o: { radiusM: number; cells: number }): RadialGrid {
	const n = o.cells;
	const dr = o.radiusM / n;
	const centres = new Float64Array(n);
	const faces = new Float64Array(n + 1);
	const volumes = new Float64Array(n);
	for (let j = 0; j <= n; j++) faces[j] = j * dr;
	// the wall face exactly at R, whatever the rounding of n·Δr
	faces[n] = o.radiusM;
	let total = 0;
	for (let i = 0; i < n; i++) {
		centres[i] = (i + 0.5) * dr;
		volumes[i] = 0.5 * (faces[i + 1] * faces[i + 1] - faces[i] * faces[i]);
		total += volumes[i];
	}
	return { cells: n, radiusM: o.radiusM, drM: dr, centresM: centres, facesM: faces, volumes, totalVolume: total };
}

/** Area-weighted section average ⟨f⟩ = Σ f V / Σ V. */
export function sectionAverage(grid: RadialGrid, f: ArrayLike<number>): number {
	let s = 0;
	for (let i = 0; i < grid.cells; i++) s += f[i] * grid.volumes[i];
	return s / grid.totalVolume;
}

/** Area-weighted section average of a product ⟨f g⟩. */
export function sectionAverageProduct(grid: RadialGrid, f: ArrayLike<number>, g: ArrayLike<number>): number {
	let s = 0;
	for (let i = 0; i < grid.cells; i++) s += f[i] * g[i] * grid.volumes[i];
	return s / grid.totalVolume;
}

/**
 * Thomas algorithm for a tridiagonal system lower[i] x[i−1] + diag[i] x[i] + upper[i] x[i+1] = rhs[i]
 * (lower[0] and upper[n−1] ignored). Writes x; `scratch` (length n) holds the modified upper
 * diagonal. Stable without pivoting for the diagonally dominant matrices built here.
 */
export function solveTridiagonal(lower: Float64Array, diag: Float64Array, upper: Float64Array, rhs: Float64Array, x: Float64Array, scratch: Float64Array): void {
	const n = diag.length;
	let beta = diag[0];
	x[0] = rhs[0] / beta;
	for (let i = 1; i < n; i++) {
		scratch[i] = upper[i - 1] / beta;
		beta = diag[i] - lower[i] * scratch[i];
		x[i] = (rhs[i] - lower[i] * x[i - 1]) / beta;
	}
	for (let i = n - 2; i >= 0; i--) x[i] -= scratch[i + 1] * x[i + 1];
}
