/**
 * GET /api/v1/runs/[id]/snapshots/[snapshotId] — one snapshot's profiles as JSON, or the stored
 * msgpack bytes when the Accept header asks for msgpack. Snapshots never change: cacheable.
 */
import { requireMember } from '$lib/server/guard';
import * as runs from '$lib/server/runs';
import { negotiate, notAcceptable, notFound, ok } from '$lib/server/api/http';
import type { RequestHandler } from './$types';

const OFFERED = ['application/json', 'application/x-msgpack', 'application/msgpack', 'application/vnd.msgpack'] as const;
const CACHE = 'private, max-age=31536000, immutable';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const type = negotiate(event.request.headers.get('accept'), OFFERED);
	const snapshotId = /^\d{1,15}$/.test(event.params.snapshotId) ? Number(event.params.snapshotId) : NaN;
	const where = { db: runs.appHandle.db, teamId: team.id, runId: event.params.id, snapshotId };
	if (!Number.isSafeInteger(snapshotId)) return notFound('Snapshot');
	if (!type) {
		// a 404 stays a 404 whatever was asked for
		if (!(await runs.getSnapshotBytes(where))) return notFound('Snapshot');
		return notAcceptable(['application/json', 'application/x-msgpack']);
	}
	if (type !== 'application/json') {
		const bytes = await runs.getSnapshotBytes(where);
		if (!bytes) return notFound('Snapshot');
		return new Response(new Uint8Array(bytes), { headers: { 'content-type': 'application/x-msgpack', 'cache-control': CACHE, vary: 'accept' } });
	}
	const snap = await runs.getSnapshot(where);
	if (!snap) return notFound('Snapshot');
	const fields = Object.fromEntries(Object.entries(snap.fields).map(([name, values]) => [name, Array.from(values)]));
	return ok({ id: snap.id, step: snap.step, timeS: snap.timeS, isFinal: snap.isFinal, x: Array.from(snap.x), fields }, { headers: { 'cache-control': CACHE, vary: 'accept' } });
};
