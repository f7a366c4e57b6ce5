/**
 * GET /api/v1/runs/[id]/events — the run's live events (server-sent events), the same stream as
 * the run page's: `residuals`, `progress`, `snapshot`, `status`. Resumes after `Last-Event-ID` or
 * `?after=`. With a token: `curl -N -H "Authorization: Bearer $TWOFOLD_TOKEN" …/events`.
 */
import { requireMember } from '$lib/server/guard';
import * as runs from '$lib/server/runs';
import { notFound, parseQuery } from '$lib/server/api/http';
import { eventsQuery } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const run = await runs.getRun({ db: runs.appHandle.db, teamId: team.id, runId: event.params.id });
	if (!run) return notFound('Run');
	const q = parseQuery(event.url, eventsQuery);
	if (!q.ok) return q.response;
	const cursor = runs.parseCursor(event.request.headers.get('last-event-id') ?? q.data.after);
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
