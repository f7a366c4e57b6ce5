import { error } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireMember, requireTeamRow } from '$lib/server/guard';
import { columns, measurements } from '$lib/server/db/schema';
import { csvFileName, measurementToCsv } from '$lib/measurements/export';

/** The measurement as CSV: SI by default, `?units=uploaded` for the units it was uploaded in. */
export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const column = await requireTeamRow({ table: columns, id: event.params.id, teamId: team.id, what: 'Column' });
	const m = await requireTeamRow({ table: measurements, id: event.params.measurementId, teamId: team.id, what: 'Measurement' });
	if (m.columnId !== column.id) error(404, 'Measurement not found.');
	const uploaded = event.url.searchParams.get('units') === 'uploaded';
	const csv = measurementToCsv({ kind: m.kind, x: m.data.x, y: m.data.y, xUnit: uploaded ? m.units.x : undefined, yUnit: uploaded ? m.units.y : undefined });
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${csvFileName(column.tag, m.name, uploaded ? 'uploaded-units' : 'SI')}"`
		}
	});
};
