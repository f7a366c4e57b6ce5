/** GET /runs/[id]/profiles.csv — the final (or latest) snapshot's profiles, SI units in the header. */
import { error } from '@sveltejs/kit';
import { and, desc, eq } from 'drizzle-orm';
import type { RequestHandler } from './$types';
import { requireMember } from '$lib/server/guard';
import { db } from '$lib/server/db/app';
import { snapshots } from '$lib/server/db/schema';
import * as runs from '$lib/server/runs';
import { toCsv, unitHeader } from '$lib/csv';
import { fieldLabel, profileOrder } from '$lib/fields';

export const GET: RequestHandler = async (event) => {
	const member = await requireMember(event, 'viewer');
	const run = await runs.getRun({ db, teamId: member.team.id, runId: event.params.id });
	if (!run) error(404, 'Run not found.');
	// the final snapshot when there is one, else the newest (a cancelled run)
	const [row] = await db
		.select({ data: snapshots.data })
		.from(snapshots)
		.where(and(eq(snapshots.runId, run.id)))
		.orderBy(desc(snapshots.isFinal), desc(snapshots.step))
		.limit(1);
	if (!row) error(404, 'This run has no profiles yet.');
	const snap = runs.decodeSnapshot(row.data);
	const kind = run.caseDocument.kind;
	const order = profileOrder(kind);
	const names = Object.keys(snap.fields).sort((a, b) => (order.indexOf(a) + 1 || 99) - (order.indexOf(b) + 1 || 99));
	const header = [kind === 'cross-section' ? unitHeader('radius', 'm') : unitHeader('height above sparger', 'm'), ...names.map((n) => unitHeader(fieldLabel(n).label, fieldLabel(n).unit))];
	const rows = Array.from(snap.x, (x, i) => [x, ...names.map((n) => snap.fields[n][i])]);
	return new Response(toCsv({ header, rows }), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="run-${run.id.slice(0, 8)}-profiles.csv"`
		}
	});
};
