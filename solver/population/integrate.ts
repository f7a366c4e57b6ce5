/**
 * Time integration of the class-method ODEs dN/dt = rates(N): the explicit Runge–Kutta pair of
 * Dormand & Prince (1980), J. Comput. Appl. Math. 6, 19 (RK5(4)7M, first-same-as-last), with the usual
 * step control h_new = h · min(5, max(0.2, 0.9 err^(−1/5))) (Hairer, Nørsett & Wanner, Solving ODEs I, II.4).
 *
 * Positivity: a step that leaves any N_i < 0 is rejected and halved. The one exception: classes reached
 * only through a chain of more events than the order of the scheme (empty classes far from the initial
 * sizes) can come out as −C h^p for every step h; when all negative classes together hold less than
 * 1e−17 of the gas volume they are set to zero, which changes the gas volume below round-off. Otherwise N
 * is never clipped, so every linear invariant of the rates, the gas volume Σ x_i N_i among them, is kept
 * to round-off (a Runge–Kutta step is a linear combination of rate vectors, each of which conserves it).
 *
 * Error norm: max_i |e_i| / (atol + rtol · max(|N_i|, |N_i,new|)). The stage buffers are allocated once per
 * integrator; a step allocates nothing.
 */
import type { KernelTable, PopulationBalance } from './pivot.js';

export interface IntegrationOptions {
	/** relative tolerance (default 1e-6) */
	relativeTolerance?: number;
	/** absolute tolerance, 1/m³ (default 1e-6 · rtol · Σ N at the start) */
	absoluteTolerance?: number;
	/** first trial step, s (default from the initial rates) */
	initialStepS?: number;
	/** largest step, s (default: the whole interval) */
	maxStepS?: number;
	/** refuse to take more steps than this (default 1e6) */
	maxSteps?: number;
}

export interface IntegrationStats {
	acceptedSteps: number;
	/** steps rejected by the error test */
	rejectedSteps: number;
	/** steps rejected because a class would have gone negative */
	positivityRejections: number;
	rateEvaluations: number;
	/** step the controller proposed after the last accepted one, s (a good `initialStepS` for the next interval) */
	nextStepS: number;
}

export interface PopulationIntegrator {
	/** advance N (1/m³, overwritten) by `durationS` under the given kernels */
	advance(N: Float64Array, table: KernelTable, durationS: number, options?: IntegrationOptions): IntegrationStats;
}

// Dormand–Prince RK5(4)7M coefficients
const A21 = 1 / 5;
const A31 = 3 / 40, A32 = 9 / 40;
const A41 = 44 / 45, A42 = -56 / 15, A43 = 32 / 9;
const A51 = 19372 / 6561, A52 = -25360 / 2187, A53 = 64448 / 6561, A54 = -212 / 729;
const A61 = 9017 / 3168, A62 = -355 / 33, A63 = 46732 / 5247, A64 = 49 / 176, A65 = -5103 / 18656;
const B1 = 35 / 384, B3 = 500 / 1113, B4 = 125 / 192, B5 = -2187 / 6784, B6 = 11 / 84;
// fifth-order minus embedded fourth-order weights
/** negative classes holding less than this fraction of the gas volume are set to zero rather than rejected */
const NEGLIGIBLE_VOLUME = 1e-17;
const E1 = 71 / 57600, E3 = -71 / 16695, E4 = 71 / 1920, E5 = -17253 / 339200, E6 = 22 / 525, E7 = -1 / 40;

export function createPopulationIntegrator(balance: PopulationBalance): PopulationIntegrator {
	const n = balance.grid.classes;
	const x = balance.grid.volumesM3;
	const k1 = new Float64Array(n);
	const k2 = new Float64Array(n);
	const k3 = new Float64Array(n);
	const k4 = new Float64Array(n);
	const k5 = new Float64Array(n);
	const k6 = new Float64Array(n);
	const k7 = new Float64Array(n);
	const y = new Float64Array(n);
	const yNew = new Float64Array(n);

	function advance(N: Float64Array, table: KernelTable, durationS: number, options: IntegrationOptions = {}): IntegrationStats {
		const stats: IntegrationStats = { acceptedSteps: 0, rejectedSteps: 0, positivityRejections: 0, rateEvaluations: 0, nextStepS: 0 };
		if (!(durationS >= 0)) throw new Error('Integration interval must not be negative');
		if (durationS === 0) return stats;
		const rtol = options.relativeTolerance ?? 1e-6;
		let total = 0;
		for (let i = 0; i < n; i++) {
			if (!(N[i] >= 0)) throw new Error(`Class ${i} starts with ${N[i]} bubbles per m³`);
			total += N[i];
		}
		const atol = options.absoluteTolerance ?? Math.max(1e-6 * rtol * total, Number.MIN_VALUE);
		const maxSteps = options.maxSteps ?? 1_000_000;
		const hMax = Math.min(options.maxStepS ?? durationS, durationS);
		const rates = balance.rates;

		y.set(N.subarray(0, n));
		rates(y, k1, table);
		stats.rateEvaluations++;
		let h = options.initialStepS ?? 0;
		if (!(h > 0)) {
			// Hairer's simple estimate h = 0.01 ‖y‖/‖f‖ in the error norm
			let ny = 0;
			let nf = 0;
			for (let i = 0; i < n; i++) {
				const sc = atol + rtol * Math.abs(y[i]);
				ny = Math.max(ny, Math.abs(y[i]) / sc);
				nf = Math.max(nf, Math.abs(k1[i]) / sc);
			}
			h = nf > 0 ? (0.01 * ny) / nf : hMax;
		}
		h = Math.min(h, hMax);
		let t = 0;
		const hMin = 1e-14 * durationS;

		while (t < durationS) {
			if (stats.acceptedSteps + stats.rejectedSteps + stats.positivityRejections >= maxSteps) {
				throw new Error(`Population balance: ${maxSteps} steps were not enough for ${durationS} s`);
			}
			let last = false;
			if (t + h >= durationS || t + 1.01 * h >= durationS) {
				h = durationS - t;
				last = true;
			}
			for (let i = 0; i < n; i++) yNew[i] = y[i] + h * A21 * k1[i];
			rates(yNew, k2, table);
			for (let i = 0; i < n; i++) yNew[i] = y[i] + h * (A31 * k1[i] + A32 * k2[i]);
			rates(yNew, k3, table);
			for (let i = 0; i < n; i++) yNew[i] = y[i] + h * (A41 * k1[i] + A42 * k2[i] + A43 * k3[i]);
			rates(yNew, k4, table);
			for (let i = 0; i < n; i++) yNew[i] = y[i] + h * (A51 * k1[i] + A52 * k2[i] + A53 * k3[i] + A54 * k4[i]);
			rates(yNew, k5, table);
			for (let i = 0; i < n; i++) yNew[i] = y[i] + h * (A61 * k1[i] + A62 * k2[i] + A63 * k3[i] + A64 * k4[i] + A65 * k5[i]);
			rates(yNew, k6, table);
			let negativeVolume = 0;
			let volume = 0;
			for (let i = 0; i < n; i++) {
				const v = y[i] + h * (B1 * k1[i] + B3 * k3[i] + B4 * k4[i] + B5 * k5[i] + B6 * k6[i]);
				yNew[i] = v;
				if (v < 0) negativeVolume -= v * x[i];
				else volume += v * x[i];
			}
			stats.rateEvaluations += 5;
			if (negativeVolume > 0 && negativeVolume <= NEGLIGIBLE_VOLUME * volume) {
				// below round-off of the gas volume: a class reached only through a chain of more events than
				// the order of the scheme can come out as −C h^p for every h; set it to zero
				for (let i = 0; i < n; i++) if (yNew[i] < 0) yNew[i] = 0;
				negativeVolume = 0;
			}
			if (negativeVolume > 0) {
				stats.positivityRejections++;
				h *= 0.5;
				if (h < hMin) throw new Error('Population balance: the step needed to keep every class non-negative became too small');
				continue;
			}
			rates(yNew, k7, table);
			stats.rateEvaluations++;
			let err = 0;
			for (let i = 0; i < n; i++) {
				const e = h * (E1 * k1[i] + E3 * k3[i] + E4 * k4[i] + E5 * k5[i] + E6 * k6[i] + E7 * k7[i]);
				const sc = atol + rtol * Math.max(Math.abs(y[i]), Math.abs(yNew[i]));
				const r = Math.abs(e) / sc;
				if (r > err) err = r;
			}
			if (err <= 1) {
				t = last ? durationS : t + h;
				y.set(yNew);
				k1.set(k7);
				stats.acceptedSteps++;
				const grow = err === 0 ? 5 : Math.min(5, Math.max(0.2, 0.9 * Math.pow(err, -0.2)));
				h = Math.min(h * grow, hMax);
				stats.nextStepS = h;
			} else {
				stats.rejectedSteps++;
				h *= Math.max(0.2, 0.9 * Math.pow(err, -0.2));
				if (h < hMin) throw new Error('Population balance: the step needed for the error tolerance became too small');
			}
		}
		N.set(y);
		return stats;
	}

	return { advance };
}
