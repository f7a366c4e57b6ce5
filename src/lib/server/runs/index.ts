/**
 * Runs: queue, cancel, re-run, history, snapshots and live events. Import as a namespace in the
 * app (`import * as runs from '$lib/server/runs'`); the worker imports the modules it needs directly.
 *
 * The app-bound verbs below use the app's pool and pg-boss sender; callers check the member's role
 * first (`requireMember(event, 'analyst')` for queue/cancel/re-run, `'viewer'` to read).
 */
import * as commands from './commands.js';
import { appBoss, appHandle, appHub } from './app.js';
import { isUuid } from './history.js';

export { RunRequestError, ACTIVE_STATUSES, TERMINAL_STATUSES } from './commands.js';
export type { Run } from './commands.js';
export { getRun, listRunsForColumn, listResiduals, listSnapshots, getSnapshot, getSnapshotBytes } from './history.js';
export type { ResidualPoint, SnapshotInfo, RunListItem } from './history.js';
export { readEvents, createEventStream, parseCursor, formatCursor, START_CURSOR } from './events.js';
export type { EventCursor, RunEvent } from './events.js';
export { encodeSnapshot, decodeSnapshot } from './codec.js';
export { appHandle, appHub };

/** Queue a run of a team's case (throws `RunRequestError` for the member's mistakes). */
export async function queue(o: { teamId: string; caseId: string; userId: string }): Promise<commands.Run> {
	// a malformed id would make PostgreSQL raise: it names no case of the team
	if (!isUuid(o.caseId)) throw new commands.RunRequestError('Case not found', 404);
	return commands.queue({ ...o, handle: appHandle, boss: await appBoss() });
}

/** Queue a new run of an earlier run's frozen case. */
export async function rerun(o: { teamId: string; runId: string; userId: string }): Promise<commands.Run> {
	if (!isUuid(o.runId)) throw new commands.RunRequestError('Run not found', 404);
	return commands.rerun({ ...o, handle: appHandle, boss: await appBoss() });
}

/** Cancel a queued or running run (a running one stops within about a second). */
export async function cancel(o: { teamId: string; runId: string }): Promise<commands.Run> {
	if (!isUuid(o.runId)) throw new commands.RunRequestError('Run not found', 404);
	return commands.cancel({ ...o, handle: appHandle, boss: await appBoss() });
}
