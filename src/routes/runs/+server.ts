/** POST /runs — queue a run of a case: body `{ caseId }` (JSON or form). Analysts and up. */
import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireMember } from '$lib/server/guard';
import { codeForStatus, errorResponse, readBody } from '$lib/server/json-body';
import * as runs from '$lib/server/runs';
import type { RequestHandler } from './$types';

const queueBody = z.object(
	{
		caseId: z.uuid({
			error: (issue) =>
				issue.input === undefined ? 'caseId is required: the id of the case to run (a UUID)' : 'caseId must be a case id (a UUID, 36 characters)'
		})
	},
	{ error: 'The body must be a JSON object with caseId, the id of the case to run (a UUID)' }
);

export const POST: RequestHandler = async (event) => {
	const member = await requireMember(event, 'analyst');
	const body = await readBody(event.request, queueBody);
	if (!body.ok) return body.response;
	try {
		const run = await runs.queue({ teamId: member.team.id, caseId: body.data.caseId, userId: member.user.id });
		return json({ run: publicRun(run) }, { status: 201 });
	} catch (e) {
		if (e instanceof runs.RunRequestError) return errorResponse(e.status, codeForStatus(e.status), e.message);
		throw e;
	}
};

function publicRun(run: runs.Run) {
	const { caseDocument: _frozen, workerId: _worker, jobId: _job, ...rest } = run;
	return rest;
}
