/** POST /api/v1/studies/[id]/rerun — queue again the members that failed or were cancelled. Analysts and up. */
import { requireMember } from '$lib/server/guard';
import * as studyServer from '$lib/server/studies';
import { moduleRefusal, ok } from '$lib/server/api/http';
import { runView } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => {
	const { team, user } = await requireMember(event, 'analyst');
	try {
		const queued = await studyServer.rerunFailed({ teamId: team.id, studyId: event.params.id, userId: user.id });
		return ok({ runs: queued.map(runView) }, { status: 201 });
	} catch (e) {
		const refusal = moduleRefusal(e);
		if (refusal) return refusal;
		throw e;
	}
};
