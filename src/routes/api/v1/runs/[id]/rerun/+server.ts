/** POST /api/v1/runs/[id]/rerun — queue a new run of this run's frozen case. Analysts and up. */
import { requireMember } from '$lib/server/guard';
import * as runs from '$lib/server/runs';
import { moduleRefusal, ok } from '$lib/server/api/http';
import { runView } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => {
	const { team, user } = await requireMember(event, 'analyst');
	try {
		return ok({ run: runView(await runs.rerun({ teamId: team.id, runId: event.params.id, userId: user.id })) }, { status: 201 });
	} catch (e) {
		const refusal = moduleRefusal(e);
		if (refusal) return refusal;
		throw e;
	}
};
