/** GET / POST /api/v1/studies/[id]/signoffs — a study's sign-offs; a lead records a verdict. */
import * as studyServer from '$lib/server/studies';
import { signOffEndpoints } from '$lib/server/api/signoff-endpoints';

const endpoints = signOffEndpoints({
	subjectType: 'study',
	path: '/studies',
	what: 'Study',
	load: (teamId, id) => studyServer.getStudy({ db: studyServer.appHandle.db, teamId, studyId: id })
});

export const GET = endpoints.GET;
export const POST = endpoints.POST;
