/**
 * Radial gas continuity in conservative cylindrical form,
 *
 *   ∂α/∂t + (1/r) ∂(r F)/∂r = 0,   F = α v_g = w α − 𝒟 ∂α/∂r,
 *
 * where w is the drift velocity of the gas under lift and wall lubrication against drag and 𝒟 the
 * holdup diffusivity of turbulent dispersion. Finite volumes, donor-cell (upwind) drift and central
 * diffusion, both implicit (backward Euler): the matrix is an M-matrix, so the holdup stays
 * non-negative at any time step. Boundary fluxes are exactly zero: on the axis by symmetry (and
 * zero face area), at the wall because no gas leaves through it.
 *
 * Conservation to round-off: after the implicit solve the face fluxes are evaluated from the
 * solved holdup and the update α = α⁰ − Δt (r₊F₊ − r₋F₋)/V is applied in flux form, so the
 * section's gas changes only by the boundary fluxes, which are zero, whatever the accuracy of
 * the linear solve.
 */
import { type RadialGrid, solveTridiagonal } from './grid.js';

export interface HoldupTransportInput {
	grid: RadialGrid;
	dtS: number;
	holdupOld: Float64Array;
	/** drift velocity per face (length N + 1), m/s, positive towards the wall */
	faceDriftMS: Float64Array;
	/** holdup diffusivity per face (length N + 1), m²/s */
	faceDiffusivityM2S: Float64Array;
	/** outputs: new holdup (length N) and face flux r·F per radian (length N + 1) */
	holdup: Float64Array;
	faceFlux: Float64Array;
	/** scratch, length ≥ 5 N */
	work: Float64Array;
}

export function transportHoldup(o: HoldupTransportInput): void {
	const { grid } = o;
	const n = grid.cells;
	const dr = grid.drM;
	const inv = 1 / o.dtS;
	const w = o.work;
	const lower = w.subarray(0, n);
	const diag = w.subarray(n, 2 * n);
	const upper = w.subarray(2 * n, 3 * n);
	const rhs = w.subarray(3 * n, 4 * n);
	const scratch = w.subarray(4 * n, 5 * n);
	for (let i = 0; i < n; i++) {
		const v = grid.volumes[i];
		let dg = v * inv;
		let lo = 0;
		let up = 0;
		if (i > 0) {
			const a = grid.facesM[i];
			const wf = o.faceDriftMS[i];
			const df = o.faceDiffusivityM2S[i] / dr;
			// flux through the left face leaves cell i when negative: −A (w⁺ α_{i−1} + w⁻ α_i − 𝒟 (α_i − α_{i−1})/Δr)
			lo = -a * (Math.max(wf, 0) + df);
			dg += a * (-Math.min(wf, 0) + df);
		}
		if (i < n - 1) {
			const a = grid.facesM[i + 1];
			const wf = o.faceDriftMS[i + 1];
			const df = o.faceDiffusivityM2S[i + 1] / dr;
			dg += a * (Math.max(wf, 0) + df);
			up = a * (Math.min(wf, 0) - df);
		}
		lower[i] = lo;
		upper[i] = up;
		diag[i] = dg;
		rhs[i] = v * inv * o.holdupOld[i];
	}
	solveTridiagonal(lower, diag, upper, rhs, o.holdup, scratch);
	o.faceFlux[0] = 0;
	o.faceFlux[n] = 0;
	for (let j = 1; j < n; j++) {
		const wf = o.faceDriftMS[j];
		const aL = o.holdup[j - 1];
		const aR = o.holdup[j];
		o.faceFlux[j] = grid.facesM[j] * (Math.max(wf, 0) * aL + Math.min(wf, 0) * aR - (o.faceDiffusivityM2S[j] * (aR - aL)) / dr);
	}
	for (let i = 0; i < n; i++) {
		o.holdup[i] = o.holdupOld[i] - (o.dtS * (o.faceFlux[i + 1] - o.faceFlux[i])) / grid.volumes[i];
	}
}
