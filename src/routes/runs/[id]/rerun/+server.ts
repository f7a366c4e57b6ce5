/** POST /runs/[id]/rerun — queue a new run of this run's frozen case. Analysts and up. */
import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { codeForStatus, errorResponse } from '$lib/server/json-body';
import * as runs from '$lib/server/runs';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => {
	const member = await requireMember(event, 'analyst');
	try {
		const run = await runs.rerun({ teamId: member.team.id, runId: event.params.id, userId: member.user.id });
		return json({ run: { id: run.id, status: run.status, queuedAt: run.queuedAt } }, { status: 201 });
	} catch (e) {
		if (e instanceof runs.RunRequestError) return errorResponse(e.status, codeForStatus(e.status), e.message);
		throw e;
	}
};
