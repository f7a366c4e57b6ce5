/**
 * Studies: sweeps, closure matrices and grid studies whose members are ordinary queued runs.
 * Import as a namespace in the app (`import * as studyServer from '$lib/server/studies'`); call
 * the guard first (`'analyst'` to create, cancel or re-run, `'viewer'` to read).
 */
import * as commands from './commands.js';
import { appBoss, appHandle, appHub } from '../runs/app.js';
import { isUuid } from '../runs/history.js';

export { StudyRequestError, studyInputSchema, zodIssues } from './commands.js';
export type { Study, StudyIssue } from './commands.js';
export { getStudy, listMembers, listStudies, finalProfiles } from './reads.js';
export type { StudyMember, StudyListItem } from './reads.js';
export { createStudyEventStream } from './events.js';
export { appHandle, appHub };

export async function create(o: { teamId: string; userId: string; input: unknown }) {
	return commands.createStudy({ ...o, handle: appHandle, boss: await appBoss() });
}

export async function cancel(o: { teamId: string; studyId: string }) {
	if (!isUuid(o.studyId)) throw new commands.StudyRequestError('Study not found', 404);
	return commands.cancelStudy({ ...o, handle: appHandle, boss: await appBoss() });
}

export async function rerunFailed(o: { teamId: string; studyId: string; userId: string }) {
	if (!isUuid(o.studyId)) throw new commands.StudyRequestError('Study not found', 404);
	return commands.rerunFailedMembers({ ...o, handle: appHandle, boss: await appBoss() });
}
