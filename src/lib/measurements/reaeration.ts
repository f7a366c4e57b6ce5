/**
 * Clean-water re-aeration test analysis after ASCE/EWRI 2-06 ("Measurement of Oxygen Transfer in
 * Clean Water"): the dissolved-oxygen concentration at one probe rises after deoxygenation as
 *
 *     C(t) = C∞ − (C∞ − C₀) · exp(−kLa · t)
 *
 * and kLa, C∞ (equilibrium concentration) and C₀ (concentration at t = 0) are found by non-linear
 * least squares. kLa is corrected to 20 °C with θ = 1.024, and the standard oxygen transfer rate is
 * SOTR = V · mean_i(kLa20,i · C∞20,i) over the probes.
 *
 * SI: time in s, kLa in 1/s, concentrations in kg/m³ (1 mg/L = 1e-3 kg/m³), volume in m³,
 * transfer rates in kg/s, temperature in K, pressure in Pa.
 */
import { invertDense, solveDense, studentTQuantile } from './stats.js';

/**
 * The re-aeration model C(t) = C∞ − (C∞ − C₀) exp(−kLa t).
 *
 * Example (PHYSICS §15 #29, in mg/L and h): C∞ 9.09, C₀ 0.5, kLa 10 h⁻¹, t = 10 min → 7.468.
 */
export function reaerationConcentration(opts: { timeS: number; kLaPerS: number; saturationKgM3: number; initialKgM3: number }): number {
	const { timeS, kLaPerS, saturationKgM3, initialKgM3 } = opts;
	return saturationKgM3 - (saturationKgM3 - initialKgM3) * Math.exp(-kLaPerS * timeS);
}

export interface ParameterEstimate {
	value: number;
	standardError: number;
	/** 95 % confidence interval, value ± t(0.975, n − 3) · standard error */
	ci95: [number, number];
}

export interface ReaerationFit {
	kLaPerS: ParameterEstimate;
	saturationKgM3: ParameterEstimate;
	initialKgM3: ParameterEstimate;
	/** covariance of (kLa, C∞, C₀), SI */
	covariance: number[][];
	/** measured − fitted at each point, kg/m³ */
	residualsKgM3: number[];
	fittedKgM3: number[];
	/** √(SSE / (n − 3)), kg/m³ */
	residualStandardErrorKgM3: number;
	degreesOfFreedom: number;
	/** t(0.975, n − 3) used for the intervals */
	tQuantile: number;
	iterations: number;
	/** things the analyst should look at; the fit is still returned */
	warnings: string[];
}

export type ReaerationFitResult = { ok: true; fit: ReaerationFit } | { ok: false; message: string };

/**
 * Fit kLa, C∞ and C₀ to a dissolved-oxygen series by non-linear least squares.
 *
 * Method: Levenberg–Marquardt with Marquardt's diagonal scaling, written out here because no small
 * package does bounded, dependency-free curve fitting with a covariance; the problem has three
 * parameters, so a 3×3 solve per iteration is all it takes. Time and concentration are first scaled
 * to O(1) (by the last time and the largest concentration) so the damping treats the parameters
 * alike. The start is found by variable projection: for a fixed kLa the model is linear in C∞ and
 * C₀, so a log-spaced scan over kLa with a 2×2 least-squares solve at each value gives the global
 * basin, and LM polishes it.
 *
 * Uncertainty: covariance = s² (JᵀJ)⁻¹ at the optimum with s² = SSE / (n − 3) (the usual
 * linearised estimate), standard errors its diagonal square roots, 95 % intervals with the
 * Student t quantile at n − 3 degrees of freedom.
 *
 * C₀ is the concentration at t = 0 of the given time axis; shift the times first if the test did
 * not start at 0.
 */
export function fitReaeration(opts: { timeS: ArrayLike<number>; concentrationKgM3: ArrayLike<number> }): ReaerationFitResult {
	const n = opts.timeS.length;
	if (n !== opts.concentrationKgM3.length) return { ok: false, message: 'Times and concentrations must have the same length' };
	if (n < 4) return { ok: false, message: `A fit of three parameters needs at least 4 points; the series has ${n}` };
	let tMax = -Infinity;
	let cMax = 0;
	for (let i = 0; i < n; i++) {
		tMax = Math.max(tMax, opts.timeS[i]);
		cMax = Math.max(cMax, Math.abs(opts.concentrationKgM3[i]));
	}
	if (!(tMax > 0)) return { ok: false, message: 'The times must span a positive interval' };
	if (!(cMax > 0)) return { ok: false, message: 'The concentrations are all zero' };
	const tau = Array.from(opts.timeS, (t) => t / tMax);
	const u = Array.from(opts.concentrationKgM3, (c) => c / cMax);

	// scaled parameters q = [k, a, b]: kLa = k / tMax, C∞ = a · cMax, C₀ = b · cMax
	const model = (q: number[], i: number) => q[1] - (q[1] - q[2]) * Math.exp(-q[0] * tau[i]);
	const sse = (q: number[]) => {
		let s = 0;
		for (let i = 0; i < n; i++) {
			const r = u[i] - model(q, i);
			s += r * r;
		}
		return s;
	};

	// start: variable projection over k from 1e-3 to 1e4 time constants per series length
	let q = [1, u[n - 1], u[0]];
	let best = Infinity;
	for (let j = 0; j <= 140; j++) {
		const k = 10 ** (-3 + (7 * j) / 140);
		let sgg = 0;
		let sge = 0;
		let see = 0;
		let sgu = 0;
		let seu = 0;
		for (let i = 0; i < n; i++) {
			const e = Math.exp(-k * tau[i]);
			const g = 1 - e;
			sgg += g * g;
			sge += g * e;
			see += e * e;
			sgu += g * u[i];
			seu += e * u[i];
		}
		const ab = solveDense(
			[
				[sgg, sge],
				[sge, see]
			],
			[sgu, seu]
		);
		if (!ab) continue;
		const cand = [k, ab[0], ab[1]];
		const s = sse(cand);
		if (s < best) {
			best = s;
			q = cand;
		}
	}

	const jacobian = (p: number[]) => {
		const J: number[][] = [];
		for (let i = 0; i < n; i++) {
			const e = Math.exp(-p[0] * tau[i]);
			J.push([(p[1] - p[2]) * tau[i] * e, 1 - e, e]);
		}
		return J;
	};
	const normal = (J: number[][], p: number[]) => {
		const A = [
			[0, 0, 0],
			[0, 0, 0],
			[0, 0, 0]
		];
		const g = [0, 0, 0];
		for (let i = 0; i < n; i++) {
			const r = u[i] - model(p, i);
			const row = J[i];
			for (let a = 0; a < 3; a++) {
				g[a] += row[a] * r;
				for (let b = 0; b < 3; b++) A[a][b] += row[a] * row[b];
			}
		}
		return { A, g };
	};

	let lambda = 1e-3;
	let current = sse(q);
	let iterations = 0;
	for (; iterations < 500; iterations++) {
		const { A, g } = normal(jacobian(q), q);
		let accepted = false;
		let stepSmall = false;
		while (lambda < 1e16) {
			const damped = A.map((row, a) => row.map((v, b) => (a === b ? v + lambda * Math.max(v, 1e-300) : v)));
			const delta = solveDense(damped, g);
			if (!delta) {
				lambda *= 10;
				continue;
			}
			const trial = q.map((v, a) => v + delta[a]);
			const s = sse(trial);
			if (s <= current) {
				stepSmall = delta.every((d, a) => Math.abs(d) <= 1e-12 * (Math.abs(q[a]) + 1e-12));
				const relDrop = (current - s) / Math.max(current, 1e-300);
				q = trial;
				current = s;
				lambda = Math.max(lambda / 10, 1e-12);
				accepted = true;
				if (relDrop < 1e-14) stepSmall = true;
				break;
			}
			lambda *= 10;
		}
		if (!accepted || stepSmall) break;
	}

	if (!(q[0] > 0) || !q.every(Number.isFinite)) {
		return { ok: false, message: 'The fit found no rising exponential in this series (kLa came out non-positive)' };
	}
	const J = jacobian(q);
	const { A } = normal(J, q);
	const inv = invertDense(A);
	if (!inv) return { ok: false, message: 'kLa, C∞ and C₀ cannot be told apart from this series (the fit is singular)' };

	const dof = n - 3;
	const s2 = current / dof;
	const scale = [1 / tMax, cMax, cMax];
	const covariance = inv.map((row, a) => row.map((v, b) => s2 * v * scale[a] * scale[b]));
	const tq = studentTQuantile(0.975, dof);
	const est = (a: number): ParameterEstimate => {
		const value = q[a] * scale[a];
		const standardError = Math.sqrt(covariance[a][a]);
		return { value, standardError, ci95: [value - tq * standardError, value + tq * standardError] };
	};
	const kLa = est(0);
	const cInf = est(1);
	const c0 = est(2);
	const fittedKgM3: number[] = [];
	const residualsKgM3: number[] = [];
	for (let i = 0; i < n; i++) {
		const f = reaerationConcentration({ timeS: opts.timeS[i], kLaPerS: kLa.value, saturationKgM3: cInf.value, initialKgM3: c0.value });
		fittedKgM3.push(f);
		residualsKgM3.push(opts.concentrationKgM3[i] - f);
	}

	const warnings: string[] = [];
	const reached = 1 - Math.exp(-kLa.value * tMax);
	// ASCE 2-06 has the test run close to saturation (commonly quoted: to about 98 % of C∞, from memory)
	if (reached < 0.98) {
		warnings.push(`The series ends at ${(100 * reached).toFixed(0)} % of the rise to saturation; the test should run to about 98 % for C∞ to be well determined`);
	}
	if (kLa.ci95[0] <= 0 || kLa.standardError > 0.25 * kLa.value) {
		warnings.push('kLa is poorly determined: its standard error exceeds 25 % of the estimate');
	}
	return {
		ok: true,
		fit: {
			kLaPerS: kLa,
			saturationKgM3: cInf,
			initialKgM3: c0,
			covariance,
			residualsKgM3,
			fittedKgM3,
			residualStandardErrorKgM3: Math.sqrt(s2) * cMax,
			degreesOfFreedom: dof,
			tQuantile: tq,
			iterations,
			warnings
		}
	};
}

/**
 * Keep the points between `lowFraction` and `highFraction` of the equilibrium concentration, the
 * truncation ASCE 2-06 prescribes before the final fit (commonly quoted as 20 % and 98 % of C∞,
 * from memory). Returns the kept times and concentrations.
 */
export function truncateReaerationSeries(opts: {
	timeS: ArrayLike<number>;
	concentrationKgM3: ArrayLike<number>;
	saturationKgM3: number;
	lowFraction?: number;
	highFraction?: number;
}): { timeS: number[]; concentrationKgM3: number[] } {
	const lo = (opts.lowFraction ?? 0.2) * opts.saturationKgM3;
	const hi = (opts.highFraction ?? 0.98) * opts.saturationKgM3;
	const timeS: number[] = [];
	const concentrationKgM3: number[] = [];
	for (let i = 0; i < opts.timeS.length; i++) {
		const c = opts.concentrationKgM3[i];
		if (c >= lo && c <= hi) {
			timeS.push(opts.timeS[i]);
			concentrationKgM3.push(c);
		}
	}
	return { timeS, concentrationKgM3 };
}

/** Customary temperature coefficient of kLa for oxygen in clean water. */
export const KLA_THETA = 1.024;

/**
 * kLa at 20 °C: kLa20 = kLaT · θ^(20 − T[°C]), θ = 1.024 by default.
 *
 * Example (PHYSICS §15 #30): 10 h⁻¹ at 15 °C → 11.259 h⁻¹.
 */
export function kLaAt20C(opts: { kLaPerS: number; temperatureK: number; theta?: number }): number {
	const theta = opts.theta ?? KLA_THETA;
	return opts.kLaPerS * theta ** (20 - (opts.temperatureK - 273.15));
}

/**
 * Oxygen solubility in fresh water in equilibrium with water-saturated air at 101.325 kPa,
 * Benson & Krause (1984), as given in APHA Standard Methods:
 * ln C_s[mg/L] = −139.34411 + 1.575701e5/T − 6.642308e7/T² + 1.243800e10/T³ − 8.621949e11/T⁴,
 * T in K. Returns kg/m³. No pressure or salinity correction.
 *
 * Example: 293.15 K → 9.092e-3 kg/m³ (9.092 mg/L).
 */
export function oxygenSaturationKgM3(opts: { temperatureK: number }): number {
	const T = opts.temperatureK;
	const lnCs = -139.34411 + 1.575701e5 / T - 6.642308e7 / T ** 2 + 1.2438e10 / T ** 3 - 8.621949e11 / T ** 4;
	return Math.exp(lnCs) * 1e-3;
}

/**
 * Equilibrium concentration at standard conditions (20 °C, 1 atm): C∞20 = C∞T / (τ Ω) with
 * τ = C_s(T) / C_s(20 °C) from Benson & Krause and Ω = P_b / 101325 Pa (the ASCE form, from memory).
 */
export function saturationAt20C(opts: { saturationKgM3: number; temperatureK: number; barometricPressurePa?: number }): number {
	const tau = oxygenSaturationKgM3({ temperatureK: opts.temperatureK }) / oxygenSaturationKgM3({ temperatureK: 293.15 });
	const omega = (opts.barometricPressurePa ?? 101325) / 101325;
	return opts.saturationKgM3 / (tau * omega);
}

/**
 * Standard oxygen transfer rate, kg O₂/s: SOTR = V · mean_i(kLa20,i · C∞20,i) over the
 * determination points (probes).
 *
 * Example (PHYSICS §15 #31): V = 1 m³, kLa20 = 10 h⁻¹, C∞20 = 9.09 g/m³ → 90.9 g/h.
 */
export function standardOxygenTransferRateKgS(opts: { liquidVolumeM3: number; points: Array<{ kLa20PerS: number; saturation20KgM3: number }> }): number {
	if (opts.points.length === 0) throw new Error('SOTR needs at least one determination point');
	let s = 0;
	for (const p of opts.points) s += p.kLa20PerS * p.saturation20KgM3;
	return (opts.liquidVolumeM3 * s) / opts.points.length;
}

export interface ReaerationAnalysis {
	fit: ReaerationFit;
	kLa20PerS: ParameterEstimate;
	saturation20KgM3: ParameterEstimate;
	sotrKgS: ParameterEstimate;
}

/**
 * The whole analysis of one probe's series: fit, kLa and C∞ at standard conditions, and SOTR for
 * the liquid volume. The temperature and pressure corrections are exact scalings, so the intervals
 * scale with them; the SOTR interval uses the first-order (delta-method) variance of the product
 * kLa · C∞ including their covariance.
 */
export function analyseReaeration(opts: {
	timeS: ArrayLike<number>;
	concentrationKgM3: ArrayLike<number>;
	temperatureK: number;
	liquidVolumeM3: number;
	barometricPressurePa?: number;
	theta?: number;
}): { ok: true; analysis: ReaerationAnalysis } | { ok: false; message: string } {
	const r = fitReaeration(opts);
	if (!r.ok) return r;
	const fit = r.fit;
	const fk = kLaAt20C({ kLaPerS: 1, temperatureK: opts.temperatureK, theta: opts.theta });
	const fc = saturationAt20C({ saturationKgM3: 1, temperatureK: opts.temperatureK, barometricPressurePa: opts.barometricPressurePa });
	const tq = fit.tQuantile;
	const scaled = (e: ParameterEstimate, f: number): ParameterEstimate => ({
		value: e.value * f,
		standardError: e.standardError * f,
		ci95: [e.ci95[0] * f, e.ci95[1] * f]
	});
	const k20 = scaled(fit.kLaPerS, fk);
	const c20 = scaled(fit.saturationKgM3, fc);
	const sotr = standardOxygenTransferRateKgS({ liquidVolumeM3: opts.liquidVolumeM3, points: [{ kLa20PerS: k20.value, saturation20KgM3: c20.value }] });
	const cov = fit.covariance[0][1] * fk * fc;
	const varProduct = c20.value ** 2 * k20.standardError ** 2 + k20.value ** 2 * c20.standardError ** 2 + 2 * k20.value * c20.value * cov;
	const seSotr = opts.liquidVolumeM3 * Math.sqrt(Math.max(varProduct, 0));
	return {
		ok: true,
		analysis: {
			fit,
			kLa20PerS: k20,
			saturation20KgM3: c20,
			sotrKgS: { value: sotr, standardError: seSotr, ci95: [sotr - tq * seSotr, sotr + tq * seSotr] }
		}
	};
}
