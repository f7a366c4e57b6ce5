/**
 * GET /studies/[id]/events — server-sent events of a study: `members` (changed member rows; all of
 * them first) and `progress` (counts by status, time left). Viewers and up; other teams get 404.
 */
import { error } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import * as studyServer from '$lib/server/studies';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const member = await requireMember(event, 'viewer');
	const study = await studyServer.getStudy({ db: studyServer.appHandle.db, teamId: member.team.id, studyId: event.params.id });
	if (!study) error(404, 'Study not found.');
	const body = studyServer.createStudyEventStream({ db: studyServer.appHandle.db, hub: studyServer.appHub(), teamId: member.team.id, studyId: study.id, signal: event.request.signal });
	return new Response(body, {
		headers: {
			'content-type': 'text/event-stream; charset=utf-8',
			'cache-control': 'no-cache, no-transform',
			connection: 'keep-alive',
			'x-accel-buffering': 'no'
		}
	});
};
