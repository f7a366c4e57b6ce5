/**
 * Wall lubrication: the lateral force that keeps bubbles off a wall (radial models only).
 *
 * All laws give the force per unit mixture volume on the gas, directed away from the wall, as a
 * non-negative magnitude; `y` is the distance of the point from the wall, `u_r` the slip parallel
 * to the wall (the axial slip in a column), `D` the column diameter.
 *
 * - Antal, Lahey & Flaherty (1991), Int. J. Multiphase Flow 17(5), 635–652:
 *     F = (α ρ_l u_r² / d) · max(0, C_W1 + C_W2 d/y),  C_W1 = −0.01, C_W2 = 0.05
 *   (the defaults of later validation work, from memory), zero beyond y = (C_W2/−C_W1)·d = 5 d.
 * - Tomiyama (1998), 3rd Int. Conf. Multiphase Flow, Lyon; pipe form:
 *     F = C_W (d/2) α ρ_l u_r² [1/y² − 1/(D − y)²],
 *     C_W = 0.47 (Eo < 1), exp(−0.933 Eo + 0.179) (1 ≤ Eo ≤ 5), 0.00599 Eo − 0.0187 (5 < Eo ≤ 33),
 *     0.179 (Eo > 33); zero on the axis (y = D/2), where the two walls balance.
 * - Hosokawa, Tomiyama, Misaki & Hamada (2002), ASME FEDSM2002-31148:
 *     F = C_W (d/(2 y²)) α ρ_l u_r²,  C_W = max(7/Re^1.9, 0.0217 Eo); decays as 1/y².
 * - Frank, Zwart, Krepper, Prasser & Lucas (2008), Nucl. Eng. Des. 238, 647–659:
 *     F = C_W(Eo) α ρ_l u_r² · max{0, (1/C_WD)(1 − y/(C_WC d)) / (y (y/(C_WC d))^(p−1))},
 *     Tomiyama's C_W(Eo), C_WD = 6.8, C_WC = 10, p = 1.7; zero beyond y = C_WC d = 10 d.
 * Coefficients of all four are from memory of the papers (PHYSICS.md §5).
 */

export type WallLubricationModel = 'none' | 'antal' | 'tomiyama' | 'hosokawa' | 'frank';

export const ANTAL_CW1 = -0.01;
export const ANTAL_CW2 = 0.05;
export const FRANK_CWD = 6.8;
export const FRANK_CWC = 10.0;
export const FRANK_P = 1.7;

/** Tomiyama (1998) wall coefficient C_W(Eo). */
export function tomiyamaWallCoefficient(eotvos: number): number {
	if (eotvos < 1) return 0.47;
	if (eotvos <= 5) return Math.exp(-0.933 * eotvos + 0.179);
	if (eotvos <= 33) return 0.00599 * eotvos - 0.0187;
	return 0.179;
}

/** Hosokawa et al. (2002) wall coefficient. */
export function hosokawaWallCoefficient(o: { reynolds: number; eotvos: number }): number {
	const re = Math.max(Math.abs(o.reynolds), 1e-12);
	return Math.max(7 / Math.pow(re, 1.9), 0.0217 * o.eotvos);
}

export interface WallLubricationInput {
	model: WallLubricationModel;
	holdup: number;
	liquidDensityKgM3: number;
	/** slip parallel to the wall, m/s */
	slipVelocityMS: number;
	diameterM: number;
	/** distance from the wall, m (> 0) */
	wallDistanceM: number;
	/** column diameter, m (Tomiyama's two-wall form) */
	columnDiameterM: number;
	reynolds: number;
	eotvos: number;
}

/** Magnitude of the wall-lubrication force per unit mixture volume, N/m³, pointing away from the wall. */
export function wallLubricationForce(o: WallLubricationInput): number {
	const y = o.wallDistanceM;
	const d = o.diameterM;
	if (o.model === 'none' || !(y > 0)) return 0;
	const scale = o.holdup * o.liquidDensityKgM3 * o.slipVelocityMS * o.slipVelocityMS;
	switch (o.model) {
		case 'antal':
			return (scale / d) * Math.max(0, ANTAL_CW1 + (ANTAL_CW2 * d) / y);
		case 'tomiyama': {
			const other = o.columnDiameterM - y;
			// beyond the axis the opposite wall is nearer; the force there belongs to the other side
			if (!(other > y)) return 0;
			return tomiyamaWallCoefficient(o.eotvos) * (d / 2) * scale * (1 / (y * y) - 1 / (other * other));
		}
		case 'hosokawa':
			return (hosokawaWallCoefficient(o) * d * scale) / (2 * y * y);
		case 'frank': {
			const s = y / (FRANK_CWC * d);
			return tomiyamaWallCoefficient(o.eotvos) * scale * Math.max(0, (1 - s) / (FRANK_CWD * y * Math.pow(s, FRANK_P - 1)));
		}
	}
}
