/** GET /studies/[id]/members.csv — every member's inputs, status and design numbers (SI). */
import { error } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireMember } from '$lib/server/guard';
import * as studyServer from '$lib/server/studies';
import { membersToCsv } from '$lib/studies/results';
import { csvFileName } from '$lib/measurements/export';

export const GET: RequestHandler = async (event) => {
	const member = await requireMember(event, 'viewer');
	const db = studyServer.appHandle.db;
	const study = await studyServer.getStudy({ db, teamId: member.team.id, studyId: event.params.id });
	if (!study) error(404, 'Study not found.');
	const members = await studyServer.listMembers({ db, teamId: member.team.id, studyId: study.id });
	return new Response(membersToCsv(members), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${csvFileName(study.name, 'members')}"`
		}
	});
};
