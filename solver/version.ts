/** Version of the numerical models; stored with every run and checkpoint so results stay reproducible. */
export const SOLVER_VERSION = '1.3.0';

/**
 * Earlier versions whose checkpoints this version continues bit-identically. 1.3.0 gave the cross-section model
 * the bubble classes and left its one-class operations as they were, and left the height profile as in 1.2.0;
 * 1.2.0 added mass transfer along the height profile and left the hydrodynamics operation for operation as in
 * 1.1.0, so a 1.1.0 checkpoint (a case without transfer) continues; 1.1.0 added the bubble classes and left the
 * one-class height profile and the cross-section model as in 1.0.0, so a 1.0.0 checkpoint continues for one-class
 * runs only.
 */
export const CHECKPOINT_COMPATIBLE_VERSIONS: readonly string[] = ['1.2.0', '1.1.0', '1.0.0'];

/**
 * Whether a checkpoint written by `version` can continue under this solver: always for this version; for a
 * cross-section of an earlier version when it has one bubble class (earlier versions computed every cross-section
 * with one size); for a height profile of 1.2.0 always, of 1.1.0 when the case has no mass transfer, and of 1.0.0
 * when it has, besides, one bubble class.
 */
export function canContinueCheckpoint(version: string, oneClass: boolean, transfer = false, kind: 'height-profile' | 'cross-section' = 'height-profile'): boolean {
	if (version === SOLVER_VERSION) return true;
	if (!CHECKPOINT_COMPATIBLE_VERSIONS.includes(version)) return false;
	if (kind === 'cross-section') return oneClass;
	if (version === '1.2.0') return true;
	if (transfer) return false;
	if (version === '1.1.0') return true;
	return oneClass;
}
