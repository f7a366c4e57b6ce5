/**
 * GET /runs/[id]/events — server-sent events of a run: `residuals`, `progress`, `snapshot`,
 * `status`. Resumes after the `Last-Event-ID` header (sent by EventSource on reconnect) or the
 * `after` query parameter (the cursor of `/runs/[id]/history`). Viewers and up; other teams get 404.
 */
import { error } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import * as runs from '$lib/server/runs';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const member = await requireMember(event, 'viewer');
	const run = await runs.getRun({ db: runs.appHandle.db, teamId: member.team.id, runId: event.params.id });
	if (!run) error(404, 'Run not found.');
	const cursor = runs.parseCursor(event.request.headers.get('last-event-id') ?? event.url.searchParams.get('after'));
	const body = runs.createEventStream({ db: runs.appHandle.db, hub: runs.appHub(), runId: run.id, cursor, signal: event.request.signal });
	return new Response(body, {
		headers: {
			'content-type': 'text/event-stream; charset=utf-8',
			'cache-control': 'no-cache, no-transform',
			connection: 'keep-alive',
			'x-accel-buffering': 'no'
		}
	});
};
