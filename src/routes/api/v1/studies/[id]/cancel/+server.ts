/** POST /api/v1/studies/[id]/cancel — cancel every queued and running member. Analysts and up. */
import { requireMember } from '$lib/server/guard';
import * as studyServer from '$lib/server/studies';
import { moduleRefusal, ok } from '$lib/server/api/http';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'analyst');
	try {
		return ok(await studyServer.cancel({ teamId: team.id, studyId: event.params.id }));
	} catch (e) {
		const refusal = moduleRefusal(e);
		if (refusal) return refusal;
		throw e;
	}
};
