import type { PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { hasRole } from '$lib/server/roles';
import * as studyServer from '$lib/server/studies';
import { latestVerdicts } from '$lib/server/cases';

/** The team's studies, newest first, with their members' progress. */
export const load: PageServerLoad = async (event) => {
	const member = await requireMember(event, 'viewer');
	const list = await studyServer.listStudies({ db: studyServer.appHandle.db, teamId: member.team.id });
	const verdicts = await latestVerdicts({ teamId: member.team.id, subjectType: 'study', subjectIds: list.map((s) => s.id) });
	return {
		studies: list.map((s) => ({ ...s, verdict: verdicts.get(s.id) ?? null })),
		canStart: hasRole(member.role, 'analyst')
	};
};
