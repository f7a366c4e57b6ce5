/** POST /runs/[id]/cancel — cancel a queued or running run. Analysts and up; other teams get 404. */
import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { codeForStatus, errorResponse } from '$lib/server/json-body';
import * as runs from '$lib/server/runs';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => {
	const member = await requireMember(event, 'analyst');
	try {
		const run = await runs.cancel({ teamId: member.team.id, runId: event.params.id });
		return json({ status: run.status, cancelRequested: run.cancelRequested });
	} catch (e) {
		if (e instanceof runs.RunRequestError) return errorResponse(e.status, codeForStatus(e.status), e.message);
		throw e;
	}
};
