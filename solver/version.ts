/** Version of the numerical models; stored with every run and checkpoint so results stay reproducible. */
export const SOLVER_VERSION = '1.1.0';

/**
 * Earlier versions whose checkpoints this version continues bit-identically: 1.1.0 added the bubble classes
 * and left the one-class height profile and the cross-section model operation for operation as in 1.0.0.
 */
export const CHECKPOINT_COMPATIBLE_VERSIONS: readonly string[] = ['1.0.0'];

/** Whether a checkpoint written by `version` can continue under this solver (one-class or cross-section runs only for the older ones). */
export function canContinueCheckpoint(version: string, oneClass: boolean): boolean {
	return version === SOLVER_VERSION || (oneClass && CHECKPOINT_COMPATIBLE_VERSIONS.includes(version));
}
