/**
 * GET /runs/[id]/history — what a run page loads first: the run, every residual point, the
 * snapshot list, and the event cursor to open `/runs/[id]/events?after=<cursor>` with, so the live
 * stream continues exactly where the history ends. Viewers and up; other teams get 404.
 */
import { error, json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import * as runs from '$lib/server/runs';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const member = await requireMember(event, 'viewer');
	const run = await runs.getRun({ db: runs.appHandle.db, teamId: member.team.id, runId: event.params.id });
	if (!run) error(404, 'Run not found.');
	// the events of the stream up to now are the history: read them the same way
	const { events, cursor } = await runs.readEvents({ db: runs.appHandle.db, runId: run.id, cursor: runs.START_CURSOR });
	const residuals = events.flatMap((e) => (e.event === 'residuals' ? (e.data as { points: runs.ResidualPoint[] }).points : []));
	const snapshots = await runs.listSnapshots({ db: runs.appHandle.db, runId: run.id });
	const { workerId: _worker, jobId: _job, ...visible } = run;
	return json({ run: visible, residuals, snapshots, cursor: runs.formatCursor(cursor) });
};
