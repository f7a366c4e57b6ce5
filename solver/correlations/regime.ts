/**
 * Flow regime indicator (homogeneous / heterogeneous).
 *
 * No transition correlation with verified constants is available to this project (PHYSICS §8.6), so the
 * indicator uses the common-practice band for air–water-like systems in columns D ≥ 0.15 m with fine
 * spargers: transition at U_G ≈ 0.03–0.05 m/s. It is labelled as common practice wherever shown.
 */
export const REGIME_BAND_LOW_MS = 0.03;
export const REGIME_BAND_HIGH_MS = 0.05;

export interface RegimeEstimate {
	/** 0 homogeneous, 1 heterogeneous (split at the middle of the band) */
	value: 0 | 1;
	label: string;
	inTransitionBand: boolean;
}

export function regimeFromBand(o: { superficialGasVelocityMS: number }): RegimeEstimate {
	const u = o.superficialGasVelocityMS;
	const mid = 0.5 * (REGIME_BAND_LOW_MS + REGIME_BAND_HIGH_MS);
	const inBand = u >= REGIME_BAND_LOW_MS && u <= REGIME_BAND_HIGH_MS;
	const value: 0 | 1 = u < mid ? 0 : 1;
	const name = value === 0 ? 'homogeneous' : 'heterogeneous';
	// Inside the band either regime is seen in practice (the sparger decides), so the label says so
	// rather than stating the half-way split as a verdict.
	const label = inBand
		? `transitional, leaning ${name} (inside the common-practice transition band 0.03–0.05 m/s)`
		: `${name} (common-practice band: transition at 0.03–0.05 m/s)`;
	return { value, label, inTransitionBand: inBand };
}

/** Regime from a transition velocity of a named correlation (the two-class model's own transition). */
export function regimeFromTransition(o: { superficialGasVelocityMS: number; transitionVelocityMS: number; source: string }): RegimeEstimate {
	const value: 0 | 1 = o.superficialGasVelocityMS <= o.transitionVelocityMS ? 0 : 1;
	const name = value === 0 ? 'homogeneous' : 'heterogeneous';
	return { value, label: `${name} (transition at ${o.transitionVelocityMS.toFixed(3)} m/s, ${o.source})`, inTransitionBand: false };
}
