/**
 * GET /runs/[id]/snapshots/[snapshotId] — one snapshot's profiles as JSON
 * (`{ id, step, timeS, isFinal, x: number[], fields: { name: number[] } }`), or the stored
 * msgpack bytes with `?format=msgpack` (decode with msgpackr `new Packr({ moreTypes: true })`).
 * Viewers and up; other teams get 404.
 */
import { error, json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import * as runs from '$lib/server/runs';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const member = await requireMember(event, 'viewer');
	const snapshotId = Number(event.params.snapshotId);
	const where = { db: runs.appHandle.db, teamId: member.team.id, runId: event.params.id, snapshotId };
	if (event.url.searchParams.get('format') === 'msgpack') {
		const bytes = await runs.getSnapshotBytes(where);
		if (!bytes) error(404, 'Snapshot not found.');
		return new Response(new Uint8Array(bytes), { headers: { 'content-type': 'application/x-msgpack', 'cache-control': 'private, max-age=31536000, immutable' } });
	}
	const snap = await runs.getSnapshot(where);
	if (!snap) error(404, 'Snapshot not found.');
	const fields: Record<string, number[]> = {};
	for (const [name, values] of Object.entries(snap.fields)) fields[name] = Array.from(values);
	return json(
		{ id: snap.id, step: snap.step, timeS: snap.timeS, isFinal: snap.isFinal, x: Array.from(snap.x), fields },
		{ headers: { 'cache-control': 'private, max-age=31536000, immutable' } }
	);
};
