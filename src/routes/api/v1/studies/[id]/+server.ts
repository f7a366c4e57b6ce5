/** GET /api/v1/studies/[id] — one study with its members (the newest run at each position) and progress. */
import { requireMember } from '$lib/server/guard';
import * as studyServer from '$lib/server/studies';
import { studyProgress } from '$lib/studies/results';
import { notFound, ok } from '$lib/server/api/http';
import { studyDetailView } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const db = studyServer.appHandle.db;
	const study = await studyServer.getStudy({ db, teamId: team.id, studyId: event.params.id });
	if (!study) return notFound('Study');
	const members = await studyServer.listMembers({ db, teamId: team.id, studyId: study.id });
	return ok(studyDetailView(study, members, studyProgress(members)));
};
