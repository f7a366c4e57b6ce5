/** GET /api/v1/runs/[id] — one run: status, progress, summary and its frozen case. */
import { requireMember } from '$lib/server/guard';
import * as runs from '$lib/server/runs';
import { notFound, ok } from '$lib/server/api/http';
import { runDetailView } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const run = await runs.getRun({ db: runs.appHandle.db, teamId: team.id, runId: event.params.id });
	if (!run) return notFound('Run');
	return ok(runDetailView(run));
};
