/** Version of the numerical models; stored with every run and checkpoint so results stay reproducible. */
export const SOLVER_VERSION = '1.2.0';

/**
 * Earlier versions whose checkpoints this version continues bit-identically. 1.2.0 added mass transfer along the
 * height profile and left the hydrodynamics operation for operation as in 1.1.0, so a 1.1.0 checkpoint (a case
 * without transfer) continues; 1.1.0 added the bubble classes and left the one-class height profile and the
 * cross-section model as in 1.0.0, so a 1.0.0 checkpoint continues for one-class and cross-section runs only.
 */
export const CHECKPOINT_COMPATIBLE_VERSIONS: readonly string[] = ['1.1.0', '1.0.0'];

/**
 * Whether a checkpoint written by `version` can continue under this solver: always for this version; for 1.1.0 when
 * the case has no mass transfer; for 1.0.0 when it has, besides, one bubble class (or is a cross-section run).
 */
export function canContinueCheckpoint(version: string, oneClass: boolean, transfer = false): boolean {
	if (version === SOLVER_VERSION) return true;
	if (transfer) return false;
	if (version === '1.1.0') return true;
	return oneClass && version === '1.0.0';
}
