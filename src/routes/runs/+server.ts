/** POST /runs — queue a run of a case: body `{ caseId }` (JSON or form). Analysts and up. */
import { error, json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import * as runs from '$lib/server/runs';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => {
	const member = await requireMember(event, 'analyst');
	const type = event.request.headers.get('content-type') ?? '';
	const caseId = type.includes('application/json')
		? ((await event.request.json().catch(() => ({}))) as { caseId?: unknown }).caseId
		: (await event.request.formData()).get('caseId');
	if (typeof caseId !== 'string' || !caseId) error(400, 'caseId is required');
	try {
		const run = await runs.queue({ teamId: member.team.id, caseId, userId: member.user.id });
		return json({ run: publicRun(run) }, { status: 201 });
	} catch (e) {
		if (e instanceof runs.RunRequestError) return json({ message: e.message }, { status: e.status });
		throw e;
	}
};

function publicRun(run: runs.Run) {
	const { caseDocument: _frozen, workerId: _worker, jobId: _job, ...rest } = run;
	return rest;
}
