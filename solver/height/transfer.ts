/**
 * Mass transfer of one dissolved gas along the height-profile column, built on the hydrodynamics of each step.
 *
 * Unknowns: the dissolved concentration c_i (kg of solute per m³ of liquid) in every cell and the solute mole
 * fraction x_k,i of every bubble class k. Per unit column volume (α_l liquid fraction, α_k class holdup):
 *   liquid   ∂(α_l c)/∂t + ∂(j_l c − α_l D_L ∂c/∂z)/∂z = Σ_k K_k (β x_k − c) − k_r α_l c
 *   class k  ∂(μ_k x_k)/∂t + ∂(Ψ_k x_k)/∂z            = −K_k (β x_k − c)
 * with j_l the liquid volume flux of the hydrodynamic step, D_L the liquid axial dispersion coefficient,
 * K_k = k_L,k a_k (a_k = 6 α_k/d_k, k_L from Higbie or Frössling with the class's slip), the saturation concentration
 * c*_k = β x_k with β = H(T) (p − p_w) (Henry's law at the local pressure, less the water vapour of a saturated gas),
 * μ_k = α_k ρ_g M_s/M_g the solute per unit mole fraction held by the class and Ψ_k = G_k M_s/M_g its flux
 * (G_k the class's gas mass flux). The gas flow of the hydrodynamics is not reduced by what dissolves (dilute
 * transfer). At and above the free surface only the liquid holds bubbles (`updateCoefficients`). k_r is a first-order
 * consumption used by the verification problems only.
 *
 * Discretisation (finite volumes on the cells of the hydrodynamics, implicit in time, one step per hydrodynamic step):
 * - liquid convection with the step's own liquid fluxes j_l at the faces, dispersion with α_l,face = the lesser of
 *   the two cells' liquid fractions; central differencing where the cell Péclet number |j_l| Δz/(α_l D_L) ≤ 2 and
 *   upwind elsewhere (the hybrid scheme of Spalding 1972), so every off-diagonal coefficient is ≤ 0;
 * - the ends are closed to dispersion (Danckwerts 1953): liquid entering carries the inlet concentration, liquid
 *   leaving carries the end cell's;
 * - each class is carried upwind by its own gas flux (gas entering carries the inlet mole fraction);
 * - the exchange K_k (β x_k − c) is implicit in both c and x_k, with the same coefficient in the liquid row and in
 *   the class row, so what leaves the gas enters the liquid exactly.
 * The unknowns of a cell are ordered (c, x_1 … x_N): the system is banded with half-bandwidth N + 1 and is solved
 * in one pass of Gaussian elimination without pivoting, O(cells · (N+1)²). The matrix is an M-matrix (positive
 * diagonal, off-diagonals ≤ 0, columns weakly diagonally dominant: each column sums to α_l/Δt or μ_k/Δt plus what
 * leaves through the ends), so elimination needs no pivoting, the new c and x_k are ≥ 0 whenever the old ones and
 * the inlet values are (in floating point too: every elimination update adds terms of one sign) and nothing is
 * clipped. Summing the rows gives the solute balance of liquid and gas to round-off. A row with nothing in it (a
 * cell without liquid, or without any gas of a class, and no flux through it) keeps its old value.
 * With 1/Δt = 0 the same system is the steady state for the hydrodynamics of the last step (`solveSteady`).
 */
import type { HeightModel } from './model.js';
import type { TransferConfig } from './config.js';
import { frosslingMassTransferCoefficient, higbieMassTransferCoefficient } from '../correlations/mass-transfer.js';

/** Cumulative solute amounts per unit column cross-section since the start, kg/m². */
export interface TransferTotals {
	/** moved from the gas into the liquid (negative: stripped) */
	transferredKgM2: number;
	liquidInKgM2: number;
	liquidOutKgM2: number;
	gasInKgM2: number;
	gasOutKgM2: number;
}

export class SoluteTransport {
	readonly cfg: TransferConfig;
	readonly model: HeightModel;
	readonly n: number;
	readonly nc: number;
	/** dissolved concentration per cell, kg/m³ of liquid */
	readonly concentration: Float64Array;
	/** solute mole fraction of each class per cell */
	readonly moleFraction: Float64Array[];
	/** k_L a of each class per cell, 1/s per unit column volume (coefficients of the last step) */
	readonly kLa: Float64Array[];
	/** saturation concentration per unit mole fraction, β = H (p − p_w), kg/m³ */
	readonly saturationFactor: Float64Array;
	readonly totals: TransferTotals = { transferredKgM2: 0, liquidInKgM2: 0, liquidOutKgM2: 0, gasInKgM2: 0, gasOutKgM2: 0 };
	/** solute held per unit mole fraction by each class, μ_k (kg/m³), at the start and the end of the step */
	private readonly carrierOld: Float64Array[];
	private readonly carrierNew: Float64Array[];
	private readonly liquidOld: Float64Array;
	/** block size (1 + classes) and half-bandwidth of the system */
	private readonly block: number;
	private readonly half: number;
	private readonly band: Float64Array;
	private readonly rhs: Float64Array;
	private readonly sol: Float64Array;
	/** M_s/M_g: solute mass per unit mole fraction per unit gas mass */
	private readonly molarRatio: number;
	private readonly scratchLo: Float64Array;
	private readonly scratchDi: Float64Array;
	private readonly scratchUp: Float64Array;
	private readonly scratchRhs: Float64Array;
	/** coefficients of the last liquid face set by `face` */
	private faceLo = 0;
	private faceHi = 0;

	constructor(model: HeightModel, cfg: TransferConfig) {
		this.model = model;
		this.cfg = cfg;
		const n = model.n;
		const nc = model.nc;
		this.n = n;
		this.nc = nc;
		this.block = 1 + nc;
		this.half = this.block;
		const size = n * this.block;
		this.band = new Float64Array(size * (2 * this.half + 1));
		this.rhs = new Float64Array(size);
		this.sol = new Float64Array(size);
		this.concentration = new Float64Array(n).fill(cfg.initialConcentrationKgM3);
		this.moleFraction = [];
		this.kLa = [];
		this.carrierOld = [];
		this.carrierNew = [];
		for (let k = 0; k < nc; k++) {
			this.moleFraction.push(new Float64Array(n).fill(cfg.inletGasMoleFraction));
			this.kLa.push(new Float64Array(n));
			this.carrierOld.push(new Float64Array(n));
			this.carrierNew.push(new Float64Array(n));
		}
		this.saturationFactor = new Float64Array(n);
		this.liquidOld = new Float64Array(n);
		this.molarRatio = cfg.solute.molarMassKgMol / model.cfg.gasMolarMassKgMol;
		this.scratchLo = new Float64Array(n);
		this.scratchDi = new Float64Array(n);
		this.scratchUp = new Float64Array(n);
		this.scratchRhs = new Float64Array(n);
		this.updateCoefficients();
		this.captureOld();
	}

	/** Solute per unit mole fraction held by class k in cell i, kg/m³ (from the hydrodynamic state as it is now). */
	private carrier(k: number, i: number): number {
		return this.model.classHoldup(k, i) * this.model.gasDensity[i] * this.molarRatio;
	}

	/** Solute flux per unit mole fraction of class k through face j, kg/(m² s) (the last hydrodynamic step's gas flux). */
	private gasFlux(k: number, j: number): number {
		return this.model.classFlux[k][j] * this.molarRatio;
	}

	/** Remember the hydrodynamic state the next step starts from (after a step, a restore or at the start). */
	captureOld(): void {
		const m = this.model;
		this.liquidOld.set(m.liquidFraction);
		for (let k = 0; k < this.nc; k++) {
			const o = this.carrierOld[k];
			for (let i = 0; i < this.n; i++) o[i] = this.carrier(k, i);
		}
	}

	/**
	 * k_L a of every class and the saturation factor of every cell from the current hydrodynamic state. Below the free
	 * surface a_k = 6 α_k/d_k. The cell holding the surface (the highest crossing of α = 0.5, as the aerated height) and
	 * the cells above it hold bubbles in their liquid only, at the gas-to-liquid ratio of the last cell below the
	 * surface: a_k = 6 α_l α_k,b/((1 − α_b) d_k). So the gas above the surface, which the hydrodynamics treats as part of
	 * the cell, adds no bubble area (it would otherwise add about Δz/(2 H ε) of the column's area), and the drops of the
	 * freeboard take up almost nothing.
	 */
	updateCoefficients(): void {
		const m = this.model;
		const mc = m.cfg;
		const cfg = this.cfg;
		const n = this.n;
		const lf = m.liquidFraction;
		const factor = cfg.interfaceFactor ?? 1;
		const diff = mc.soluteDiffusivityM2S;
		// the cell holding the free surface
		let surface = 0;
		for (let i = n - 1; i >= 0; i--) {
			const a = 1 - lf[i];
			if (a < 0.5) {
				if (i === n - 1) surface = n;
				else {
					const level = m.zCentre[i] + ((0.5 - a) / (lf[i] - lf[i + 1])) * m.dz;
					const cell = Math.floor(level / m.dz);
					surface = cell < n ? cell : n;
				}
				break;
			}
		}
		const below = surface > 0 ? surface - 1 : 0;
		const gasBelow = 1 - lf[below];
		const ratio = surface > 0 && gasBelow < 1 ? 1 / (1 - gasBelow) : 0;
		for (let i = 0; i < n; i++) {
			const ulc = 0.5 * (m.liquidVelocity[i] + m.liquidVelocity[i + 1]);
			for (let k = 0; k < this.nc; k++) {
				const d = m.classes[k].diameterM;
				const ak = i < surface ? m.classHoldup(k, i) : lf[i] * m.classHoldup(k, below) * ratio;
				let value = 0;
				if (ak > 0) {
					const uk = m.classVelocity[k];
					const slip = 0.5 * (uk[i] + uk[i + 1]) - ulc;
					const kL =
						cfg.massTransferCoefficient === 'frossling'
							? frosslingMassTransferCoefficient({ diffusivityM2S: diff, diameterM: d, slipMS: slip, liquidDensityKgM3: mc.liquidDensityKgM3, liquidViscosityPaS: mc.liquidViscosityPaS })
							: slip !== 0
								? higbieMassTransferCoefficient({ diffusivityM2S: diff, diameterM: d, slipMS: slip })
								: 0;
					value = (factor * kL * 6 * ak) / d;
				}
				this.kLa[k][i] = value;
			}
			const pp = m.pressure[i] - cfg.vapourPressurePa;
			this.saturationFactor[i] = cfg.henryKgM3Pa * (pp > 0 ? pp : 0);
		}
	}

	/** One implicit step of length dt after the hydrodynamic step (the model's arrays are at the new time level). */
	step(dt: number): void {
		this.updateCoefficients();
		for (let k = 0; k < this.nc; k++) {
			const o = this.carrierNew[k];
			for (let i = 0; i < this.n; i++) o[i] = this.carrier(k, i);
		}
		this.assemble(1 / dt);
		this.solve();
		this.account(dt);
		this.captureOld();
	}

	/** The steady state of liquid and gas for the hydrodynamics of the last step; false (nothing changed) if there is none. */
	solveSteady(): boolean {
		this.updateCoefficients();
		const m = this.model;
		const n = this.n;
		// a steady state exists when solute can leave: gas or liquid passing an end
		let through = Math.abs(m.liquidFlux[0]) + Math.abs(m.liquidFlux[n]);
		for (let k = 0; k < this.nc; k++) through += Math.abs(m.classFlux[k][0]) + Math.abs(m.classFlux[k][n]);
		if (!(through > 0)) return false;
		for (let k = 0; k < this.nc; k++) this.carrierNew[k].set(this.carrierOld[k]);
		this.assemble(0);
		const c = Float64Array.from(this.concentration);
		const x = this.moleFraction.map((v) => Float64Array.from(v));
		this.solve();
		for (let i = 0; i < n; i++) {
			if (!Number.isFinite(this.concentration[i])) {
				this.concentration.set(c);
				for (let k = 0; k < this.nc; k++) this.moleFraction[k].set(x[k]);
				return false;
			}
		}
		this.captureOld();
		return true;
	}

	private at(row: number, col: number): number {
		return row * (2 * this.half + 1) + (col - row + this.half);
	}

	/** Fill the banded system; invDt = 1/Δt, or 0 for the steady state. */
	private assemble(invDt: number): void {
		const m = this.model;
		const { n, nc, block, band, rhs } = this;
		const cfg = this.cfg;
		const dz = m.dz;
		const inv = 1 / dz;
		const lf = m.liquidFraction;
		const lfx = m.liquidFlux;
		const dl = cfg.dispersionM2S;
		const cin = cfg.inletConcentrationKgM3;
		const xin = cfg.inletGasMoleFraction;
		const sink = cfg.liquidSinkPerS ?? 0;
		const c = this.concentration;
		band.fill(0);
		for (let i = 0; i < n; i++) {
			const row = i * block;
			// liquid row
			let diag = (invDt + sink) * lf[i];
			let r = invDt * this.liquidOld[i] * c[i];
			if (i === 0) {
				const f = lfx[0];
				if (f > 0) r += f * cin * inv;
				else diag -= f * inv;
			} else {
				this.face(i);
				diag -= this.faceHi * inv;
				band[this.at(row, row - block)] = -this.faceLo * inv;
			}
			if (i === n - 1) {
				const f = lfx[n];
				if (f > 0) diag += f * inv;
				else r -= f * cin * inv;
			} else {
				this.face(i + 1);
				diag += this.faceLo * inv;
				band[this.at(row, row + block)] = this.faceHi * inv;
			}
			const beta = this.saturationFactor[i];
			for (let k = 0; k < nc; k++) {
				const kk = this.kLa[k][i];
				diag += kk;
				band[this.at(row, row + 1 + k)] = -kk * beta;
			}
			band[this.at(row, row)] = diag;
			rhs[row] = r;
			// class rows
			for (let k = 0; k < nc; k++) {
				const g = row + 1 + k;
				const kk = this.kLa[k][i];
				const x = this.moleFraction[k];
				let dg = invDt * this.carrierNew[k][i] + kk * beta;
				let rg = invDt * this.carrierOld[k][i] * x[i];
				band[this.at(g, row)] = -kk;
				const fb = this.gasFlux(k, i);
				if (fb > 0) {
					if (i === 0) rg += fb * xin * inv;
					else band[this.at(g, g - block)] = -fb * inv;
				} else dg -= fb * inv;
				const ft = this.gasFlux(k, i + 1);
				if (ft > 0) dg += ft * inv;
				else if (i === n - 1) rg -= ft * xin * inv;
				else band[this.at(g, g + block)] = ft * inv;
				band[this.at(g, g)] = dg;
				rhs[g] = rg;
			}
		}
		// rows with nothing in them keep their old value
		const width = 2 * this.half + 1;
		for (let g = 0; g < n * block; g++) {
			if (band[g * width + this.half] !== 0) continue;
			for (let q = 0; q < width; q++) band[g * width + q] = 0;
			band[g * width + this.half] = 1;
			const i = Math.floor(g / block);
			const s = g - i * block;
			rhs[g] = s === 0 ? c[i] : this.moleFraction[s - 1][i];
		}
	}

	/**
	 * Liquid face j (between cells j − 1 and j): the flux is faceLo·c_{j−1} + faceHi·c_j with faceLo ≥ 0 ≥ faceHi;
	 * central differencing up to a cell Péclet number of 2, upwind beyond.
	 */
	private face(j: number): void {
		const m = this.model;
		const lf = m.liquidFraction;
		const f = m.liquidFlux[j];
		const e = (this.cfg.dispersionM2S * (lf[j - 1] < lf[j] ? lf[j - 1] : lf[j])) / m.dz;
		const af = f < 0 ? -f : f;
		if (e > 0 && af <= 2 * e) {
			this.faceLo = 0.5 * f + e;
			this.faceHi = 0.5 * f - e;
		} else {
			this.faceLo = (f > 0 ? f : 0) + e;
			this.faceHi = (f < 0 ? f : 0) - e;
		}
	}

	/** Gaussian elimination on the band without pivoting (an M-matrix), then back substitution. */
	private solve(): void {
		const { band, rhs, sol, half } = this;
		const size = this.n * this.block;
		const width = 2 * half + 1;
		for (let p = 0; p < size; p++) {
			const pivot = band[p * width + half];
			const last = p + half < size - 1 ? p + half : size - 1;
			for (let r = p + 1; r <= last; r++) {
				const a = band[r * width + (p - r + half)];
				if (a === 0) continue;
				const l = a / pivot;
				band[r * width + (p - r + half)] = 0;
				for (let q = p + 1; q <= last; q++) band[r * width + (q - r + half)] -= l * band[p * width + (q - p + half)];
				rhs[r] -= l * rhs[p];
			}
		}
		for (let p = size - 1; p >= 0; p--) {
			let s = rhs[p];
			const last = p + half < size - 1 ? p + half : size - 1;
			for (let q = p + 1; q <= last; q++) s -= band[p * width + (q - p + half)] * sol[q];
			sol[p] = s / band[p * width + half];
		}
		const block = this.block;
		for (let i = 0; i < this.n; i++) {
			this.concentration[i] = sol[i * block];
			for (let k = 0; k < this.nc; k++) this.moleFraction[k][i] = sol[i * block + 1 + k];
		}
	}

	/** Add the step's exchange and end fluxes to the totals (the same values the rows of the system hold). */
	private account(dt: number): void {
		const m = this.model;
		const { n, nc } = this;
		const c = this.concentration;
		const cin = this.cfg.inletConcentrationKgM3;
		const xin = this.cfg.inletGasMoleFraction;
		const t = this.totals;
		t.transferredKgM2 += dt * m.dz * this.transferRateSum();
		const f0 = m.liquidFlux[0];
		const fn = m.liquidFlux[n];
		if (f0 > 0) t.liquidInKgM2 += dt * f0 * cin;
		else t.liquidOutKgM2 -= dt * f0 * c[0];
		if (fn > 0) t.liquidOutKgM2 += dt * fn * c[n - 1];
		else t.liquidInKgM2 -= dt * fn * cin;
		for (let k = 0; k < nc; k++) {
			const x = this.moleFraction[k];
			const g0 = this.gasFlux(k, 0);
			const gn = this.gasFlux(k, n);
			if (g0 > 0) t.gasInKgM2 += dt * g0 * xin;
			else t.gasOutKgM2 -= dt * g0 * x[0];
			if (gn > 0) t.gasOutKgM2 += dt * gn * x[n - 1];
			else t.gasInKgM2 -= dt * gn * xin;
		}
	}

	/** Local transfer rate from the gas into the liquid, Σ_k K_k (β x_k − c), kg/(m³ s) per unit column volume. */
	transferRate(i: number): number {
		let s = 0;
		const beta = this.saturationFactor[i];
		const c = this.concentration[i];
		for (let k = 0; k < this.nc; k++) s += this.kLa[k][i] * (beta * this.moleFraction[k][i] - c);
		return s;
	}

	/** Σ_i of the local transfer rate, kg/(m³ s) (times Δz: per unit cross-section). */
	private transferRateSum(): number {
		let s = 0;
		for (let i = 0; i < this.n; i++) s += this.transferRate(i);
		return s;
	}

	/** Solute dissolved in the liquid per unit cross-section, kg/m². */
	liquidInventoryKgM2(): number {
		const m = this.model;
		let s = 0;
		for (let i = 0; i < this.n; i++) s += m.liquidFraction[i] * this.concentration[i];
		return s * m.dz;
	}

	/** Solute in the gas per unit cross-section, kg/m². */
	gasInventoryKgM2(): number {
		let s = 0;
		for (let k = 0; k < this.nc; k++) for (let i = 0; i < this.n; i++) s += this.carrier(k, i) * this.moleFraction[k][i];
		return s * this.model.dz;
	}

	/** Liquid-volume average of the dissolved concentration, kg/m³. */
	meanConcentration(): number {
		const m = this.model;
		let s = 0;
		let v = 0;
		for (let i = 0; i < this.n; i++) {
			s += m.liquidFraction[i] * this.concentration[i];
			v += m.liquidFraction[i];
		}
		return v > 0 ? s / v : this.cfg.initialConcentrationKgM3;
	}

	/**
	 * Mole fraction of the cell's gas as a whole (the classes weighted by the solute they can hold); where the cell
	 * holds (nearly) no gas (every class below a holdup of 1e-9), that of the gas fed.
	 */
	mixedMoleFraction(i: number): number {
		let s = 0;
		let w = 0;
		for (let k = 0; k < this.nc; k++) {
			if (!(this.model.classHoldup(k, i) > 1e-9)) continue;
			const mu = this.carrier(k, i);
			s += mu * this.moleFraction[k][i];
			w += mu;
		}
		return w > 0 ? s / w : this.cfg.inletGasMoleFraction;
	}

	/** Mole fraction of the gas leaving at the top (flux-weighted over the classes); the inlet value if no gas leaves. */
	outletMoleFraction(): number {
		const n = this.n;
		let s = 0;
		let w = 0;
		for (let k = 0; k < this.nc; k++) {
			const f = this.model.classFlux[k][n];
			if (f > 0) {
				s += f * this.moleFraction[k][n - 1];
				w += f;
			}
		}
		return w > 0 ? s / w : this.cfg.inletGasMoleFraction;
	}

	/**
	 * Transfer rate into a liquid held at one uniform concentration, with each class in its steady state for the
	 * hydrodynamics of the last step (an upwind march per class, implicit in the exchange), kg/(m² s) per unit
	 * cross-section. Linear in the concentration: the re-aeration model of a well-mixed liquid follows from two calls.
	 */
	uniformLiquidRate(concentrationKgM3: number): number {
		const m = this.model;
		const n = this.n;
		const inv = 1 / m.dz;
		const xin = this.cfg.inletGasMoleFraction;
		const lo = this.scratchLo;
		const di = this.scratchDi;
		const up = this.scratchUp;
		const rhs = this.scratchRhs;
		let total = 0;
		for (let k = 0; k < this.nc; k++) {
			for (let i = 0; i < n; i++) {
				const kk = this.kLa[k][i];
				const fb = this.gasFlux(k, i);
				const ft = this.gasFlux(k, i + 1);
				let d = kk * this.saturationFactor[i];
				let r = kk * concentrationKgM3;
				lo[i] = 0;
				up[i] = 0;
				if (fb > 0) {
					if (i === 0) r += fb * xin * inv;
					else lo[i] = -fb * inv;
				} else d -= fb * inv;
				if (ft > 0) d += ft * inv;
				else if (i === n - 1) r -= ft * xin * inv;
				else up[i] = ft * inv;
				if (d === 0) {
					d = 1;
					lo[i] = 0;
					up[i] = 0;
					r = xin;
				}
				di[i] = d;
				rhs[i] = r;
			}
			// Thomas algorithm (an M-matrix: no pivoting)
			for (let i = 1; i < n; i++) {
				const l = lo[i] / di[i - 1];
				di[i] -= l * up[i - 1];
				rhs[i] -= l * rhs[i - 1];
			}
			rhs[n - 1] /= di[n - 1];
			for (let i = n - 2; i >= 0; i--) rhs[i] = (rhs[i] - up[i] * rhs[i + 1]) / di[i];
			for (let i = 0; i < n; i++) total += this.kLa[k][i] * (this.saturationFactor[i] * rhs[i] - concentrationKgM3);
		}
		return total * m.dz;
	}
}
