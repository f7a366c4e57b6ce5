/** GET /runs/[id]/residuals.csv — the whole residual history, one row per recorded step. */
import { error } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireMember } from '$lib/server/guard';
import { db } from '$lib/server/db/app';
import * as runs from '$lib/server/runs';
import { toCsv, unitHeader } from '$lib/csv';

export const GET: RequestHandler = async (event) => {
	const member = await requireMember(event, 'viewer');
	const run = await runs.getRun({ db, teamId: member.team.id, runId: event.params.id });
	if (!run) error(404, 'Run not found.');
	const points = await runs.listResiduals({ db, runId: run.id });
	const names = [...new Set(points.flatMap((p) => Object.keys(p.values)))].sort();
	const header = ['step', unitHeader('simulated time', 's'), ...names.map((n) => unitHeader(n, '1'))];
	const rows = points.map((p) => [p.step, p.timeS, ...names.map((n) => p.values[n])]);
	return new Response(toCsv({ header, rows }), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="run-${run.id.slice(0, 8)}-residuals.csv"`
		}
	});
};
