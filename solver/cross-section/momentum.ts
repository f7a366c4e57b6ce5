/**
 * Axial momentum of both phases across the section, fully developed (no axial derivatives but
 * the pressure gradient), backward Euler in time:
 *
 *   liquid: ρ_l α_l ∂u_l/∂t = (1/r) ∂/∂r (r w μ_eff ∂u_l/∂r) + α_l G − α_l ρ_l g + F_D − F_VM
 *   gas:    ρ_g α  ∂u_g/∂t = α G − α ρ_g g − F_D + F_VM
 *
 * with G = −dp/dz (one number for the section), the interfacial drag on the liquid
 * F_D = α f(u_g − u_l) (f the drag per unit gas volume, linearised about the old slip:
 * f(s) ≈ f'(s⁰) s + e, e = f(s⁰) − f'(s⁰) s⁰), the virtual-mass force on the gas
 * F_VM = C_VM α ρ_l ∂(u_l − u_g)/∂t (PHYSICS §2; the convective parts vanish in fully developed
 * flow), so the gas carries the added mass C_VM α ρ_l, and the stress weight w = α_l in the
 * two-fluid form. Axis: symmetry (zero stress). Wall: τ_w = λ u of the first cell, λ from the
 * wall function or μ/(Δr/2) for a resolved no-slip wall.
 *
 * With several bubble classes k (PHYSICS §8.8) each has its own gas equation, drag and virtual mass,
 * all sharing G; the liquid carries Σ_k F_D,k − F_VM,k and its fraction is α_l = 1 − Σ_k α_k.
 *
 * The gas equations have no radial coupling, so each u_g,k is eliminated cell by cell,
 * u_g,k = a_k u_l + b_k + c_k G, and the liquid equation becomes tridiagonal. It is linear in G:
 * u_l = u⁰ + G u¹ (one matrix, two right-hand sides), and G follows from the liquid flux
 * constraint ⟨α_l u_l⟩ = U_l exactly, not iteratively.
 */
import { type RadialGrid, solveTridiagonal } from './grid.js';

export interface AxialMomentumInput {
	grid: RadialGrid;
	/** time step, s; Infinity solves the steady equations */
	dtS: number;
	liquidDensityKgM3: number;
	gasDensityKgM3: number;
	gravityMS2: number;
	/** gas holdup per cell (new time level); with several classes the sum over the classes */
	holdup: Float64Array;
	/** stress weight per face (length N + 1), normally α_l at the face; index 0 and N unused */
	stressWeight: Float64Array;
	/** effective viscosity per face (length N + 1), Pa·s; index 0 and N unused */
	faceViscosityPaS: Float64Array;
	/** τ_w = λ u_l of the wall cell, Pa·s/m */
	wallCoefficientPaSM: number;
	/** virtual-mass coefficient per cell */
	virtualMassCoefficient: Float64Array;
	/** slope f' of the drag per unit gas volume against slip, per cell, kg m⁻³ s⁻¹ (> 0) */
	dragSlope: Float64Array;
	/** offset e of the linearised drag per unit gas volume, per cell, N/m³ */
	dragOffset: Float64Array;
	liquidVelocityOld: Float64Array;
	gasVelocityOld: Float64Array;
	superficialLiquidVelocityMS: number;
	/** outputs */
	liquidVelocity: Float64Array;
	gasVelocity: Float64Array;
	/** scratch space, length ≥ 8 N */
	work: Float64Array;
	/**
	 * Several bubble classes: each with its own holdup, virtual mass, drag linearisation and velocities
	 * (old and output). When given, the one-class fields `virtualMassCoefficient`, `dragSlope`, `dragOffset`,
	 * `gasVelocityOld` and `gasVelocity` are ignored.
	 */
	classes?: readonly GasClassMomentum[];
}

/** One bubble class in the axial momentum step. */
export interface GasClassMomentum {
	holdup: Float64Array;
	virtualMassCoefficient: Float64Array;
	dragSlope: Float64Array;
	dragOffset: Float64Array;
	gasVelocityOld: Float64Array;
	gasVelocity: Float64Array;
}

/** Solve the axial momentum equations of the liquid and every gas class for one step; returns G = −dp/dz, Pa/m. */
export function solveAxialMomentum(o: AxialMomentumInput): number {
	const { grid, holdup } = o;
	const n = grid.cells;
	const dr = grid.drM;
	const rl = o.liquidDensityKgM3;
	const rg = o.gasDensityKgM3;
	const g = o.gravityMS2;
	const inv = o.dtS === Infinity ? 0 : 1 / o.dtS;
	const classes: readonly GasClassMomentum[] = o.classes ?? [
		{ holdup, virtualMassCoefficient: o.virtualMassCoefficient, dragSlope: o.dragSlope, dragOffset: o.dragOffset, gasVelocityOld: o.gasVelocityOld, gasVelocity: o.gasVelocity }
	];
	const nc = classes.length;
	const w = o.work;
	const lower = w.subarray(0, n);
	const diag = w.subarray(n, 2 * n);
	const upper = w.subarray(2 * n, 3 * n);
	const r0 = w.subarray(3 * n, 4 * n);
	const r1 = w.subarray(4 * n, 5 * n);
	const u0 = w.subarray(5 * n, 6 * n);
	const u1 = w.subarray(6 * n, 7 * n);
	const scratch = w.subarray(7 * n, 8 * n);
	// the gas relations u_g,k = a_k u_l + b_k + c_k G are rebuilt after the solve from the same numbers
	for (let i = 0; i < n; i++) {
		const al = 1 - holdup[i];
		const v = grid.volumes[i];
		// liquid inertia with the added mass of every class: (α_l + Σ C_VM,k α_k) ρ_l/Δt
		let added = 0;
		for (let k = 0; k < nc; k++) added += classes[k].virtualMassCoefficient[i] * classes[k].holdup[i];
		const ml = (al + added) * rl * inv;
		let dg = ml;
		let rhs0 = ml * o.liquidVelocityOld[i];
		let rhs1 = al;
		for (let k = 0; k < nc; k++) {
			const ck = classes[k];
			const a = ck.holdup[i];
			const cvm = ck.virtualMassCoefficient[i];
			const mg = (rg + cvm * rl) * inv;
			const cc = cvm * rl * inv;
			const dd = ck.dragSlope[i];
			const ee = ck.dragOffset[i];
			const den = mg + dd;
			const ga = (cc + dd) / den;
			const gb = (mg * ck.gasVelocityOld[i] - cc * o.liquidVelocityOld[i] - rg * g - ee) / den;
			const gc = 1 / den;
			// (C + D) with C = α cc, D = α dd
			const cd = a * (cc + dd);
			dg = dg - cd * ga + a * dd;
			rhs0 = rhs0 - a * cc * ck.gasVelocityOld[i] + cd * gb + a * ee;
			rhs1 = rhs1 + cd * gc;
		}
		dg = v * dg;
		let lo = 0;
		let up = 0;
		if (i > 0) {
			const k = (grid.facesM[i] * o.stressWeight[i] * o.faceViscosityPaS[i]) / dr;
			lo = -k;
			dg += k;
		}
		if (i < n - 1) {
			const k = (grid.facesM[i + 1] * o.stressWeight[i + 1] * o.faceViscosityPaS[i + 1]) / dr;
			up = -k;
			dg += k;
		} else {
			dg += grid.facesM[n] * al * o.wallCoefficientPaSM;
		}
		lower[i] = lo;
		upper[i] = up;
		diag[i] = dg;
		r0[i] = v * (rhs0 - al * rl * g);
		r1[i] = v * rhs1;
	}
	solveTridiagonal(lower, diag, upper, r0, u0, scratch);
	solveTridiagonal(lower, diag, upper, r1, u1, scratch);
	let q0 = 0;
	let q1 = 0;
	for (let i = 0; i < n; i++) {
		const wv = (1 - holdup[i]) * grid.volumes[i];
		q0 += wv * u0[i];
		q1 += wv * u1[i];
	}
	const G = (o.superficialLiquidVelocityMS * grid.totalVolume - q0) / q1;
	for (let i = 0; i < n; i++) {
		const ul = u0[i] + G * u1[i];
		o.liquidVelocity[i] = ul;
		for (let k = 0; k < nc; k++) {
			const ck = classes[k];
			const cvm = ck.virtualMassCoefficient[i];
			const mg = (rg + cvm * rl) * inv;
			const cc = cvm * rl * inv;
			const dd = ck.dragSlope[i];
			const den = mg + dd;
			ck.gasVelocity[i] = ((cc + dd) * ul + mg * ck.gasVelocityOld[i] - cc * o.liquidVelocityOld[i] - rg * g - ck.dragOffset[i] + G) / den;
		}
	}
	return G;
}
