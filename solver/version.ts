/** Version of the numerical models; stored with every run and checkpoint so results stay reproducible. */
export const SOLVER_VERSION = '1.3.0';

/**
 * Earlier versions whose checkpoints this version continues bit-identically. 1.3.0 gave the cross-section model
 * the bubble classes and changed the several-class height profile (a class's interfacial pressure is capped at its
 * drag, and the class loops were reordered), leaving every one-class operation as it was; 1.2.0 added mass transfer
 * along the height profile; 1.1.0 added the bubble classes and left the one-class model as in 1.0.0. So an earlier
 * checkpoint continues when its run has one bubble class, and, with mass transfer, only from 1.2.0.
 */
export const CHECKPOINT_COMPATIBLE_VERSIONS: readonly string[] = ['1.2.0', '1.1.0', '1.0.0'];

/**
 * Whether a checkpoint written by `version` can continue under this solver: always for this version; for an
 * earlier listed version when the run has one bubble class (a cross-section or a height profile), and a height
 * profile with mass transfer only from 1.2.0, the version that added it.
 */
export function canContinueCheckpoint(version: string, oneClass: boolean, transfer = false, kind: 'height-profile' | 'cross-section' = 'height-profile'): boolean {
	if (version === SOLVER_VERSION) return true;
	if (!CHECKPOINT_COMPATIBLE_VERSIONS.includes(version) || !oneClass) return false;
	return kind === 'cross-section' || !transfer || version === '1.2.0';
}
