/**
 * GET /api/v1/runs/[id]/results — the run's summary and profiles (the final snapshot, else the
 * newest). ETag / If-None-Match: a client polling an ended run gets 304 without the profiles.
 */
import { createHash } from 'node:crypto';
import { requireMember } from '$lib/server/guard';
import * as runs from '$lib/server/runs';
import { matchesEtag, notFound, ok } from '$lib/server/api/http';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const db = runs.appHandle.db;
	const run = await runs.getRun({ db, teamId: team.id, runId: event.params.id });
	if (!run) return notFound('Run');
	const infos = await runs.listSnapshots({ db, runId: run.id });
	const chosen = infos.findLast((s) => s.isFinal) ?? infos[infos.length - 1] ?? null;
	// what the body is made of: the run's state and the snapshot drawn
	const version = [run.id, run.status, run.steps, run.finishedAt?.getTime() ?? '', chosen?.id ?? '', JSON.stringify(run.summary)].join('|');
	const etag = `"${createHash('sha256').update(version).digest('base64url').slice(0, 27)}"`;
	const headers = { etag, 'cache-control': 'private, no-cache' };
	if (matchesEtag(event.request.headers.get('if-none-match'), etag)) return new Response(null, { status: 304, headers });
	const snap = chosen ? await runs.getSnapshot({ db, teamId: team.id, runId: run.id, snapshotId: chosen.id }) : null;
	const profiles = snap
		? {
				snapshotId: snap.id,
				step: snap.step,
				timeS: snap.timeS,
				isFinal: snap.isFinal,
				x: Array.from(snap.x),
				fields: Object.fromEntries(Object.entries(snap.fields).map(([name, values]) => [name, Array.from(values)]))
			}
		: null;
	return ok({ runId: run.id, status: run.status, summary: run.summary, profiles }, { headers });
};
