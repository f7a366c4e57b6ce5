/**
 * GET /api/v1/measurements — the team's measurements (without their points), newest first.
 * POST /api/v1/measurements — upload one, as JSON (`csv` text or `rows` of [x, y]) or as a
 * `text/csv` body with the fields in the query string. The same checks as the upload page
 * (`createMeasurement` re-reads everything); analysts and up.
 */
import { requireMember } from '$lib/server/guard';
import { errorResponse, readBody, readCapped, type InputIssue } from '$lib/server/json-body';
import { createMeasurement } from '$lib/server/measurements';
import { MAX_FILE_BYTES, type CsvIssue } from '$lib/measurements/csv';
import { invalid, ok, parseListQuery, parseQuery } from '$lib/server/api/http';
import { listMeasurementsPage } from '$lib/server/api/lists';
import { measurementCsvQuery, measurementDetailView, measurementsQuery, measurementSummaryView, measurementUploadBody } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

/** A JSON upload carries the points as text or numbers: room for 20 000 rows either way. */
const MAX_JSON_BYTES = 512 * 1024;

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const q = parseListQuery(event.url, measurementsQuery);
	if (!q.ok) return q.response;
	const page = await listMeasurementsPage({ teamId: team.id, columnId: q.data.column, kind: q.data.kind, ...q.data });
	return ok({ items: page.items.map(measurementSummaryView), nextCursor: page.nextCursor });
};

/** The file's problems as issues: `rows.<i>.<j>` for JSON rows, `csv` (the message names the row) for text. */
function csvIssues(errors: CsvIssue[], source: 'csv' | 'rows'): InputIssue[] {
	return errors.map((e) => {
		if (source === 'csv' || e.row === null) return { path: source, message: e.message };
		return { path: e.column === null ? `rows.${e.row - 1}` : `rows.${e.row - 1}.${e.column - 1}`, message: e.message };
	});
}

export const POST: RequestHandler = async (event) => {
	const { team, user } = await requireMember(event, 'analyst');
	const mediaType = (event.request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	let form: Record<string, unknown>;
	let csvText: string;
	let source: 'csv' | 'rows' = 'csv';
	let fileName: string | null = null;
	if (mediaType === 'text/csv') {
		const q = parseQuery(event.url, measurementCsvQuery);
		if (!q.ok) return q.response;
		const bytes = await readCapped(event.request, MAX_FILE_BYTES);
		if (!bytes) return errorResponse(413, 'body_too_large', `The file is larger than ${MAX_FILE_BYTES} bytes, the limit`);
		form = q.data;
		csvText = new TextDecoder().decode(bytes);
		fileName = q.data.fileName ?? null;
	} else {
		const body = await readBody(event.request, measurementUploadBody, { maxBytes: MAX_JSON_BYTES });
		if (!body.ok) return body.response;
		const { csv, rows } = body.data;
		if ((csv === undefined) === (rows === undefined)) {
			return invalid([{ path: csv === undefined ? '' : 'rows', message: 'Send the data either as csv (the file as text) or as rows ([x, y] pairs), not both' }]);
		}
		form = body.data;
		if (rows) source = 'rows';
		csvText = csv ?? (rows ?? []).map(([x, y]) => `${x},${y}`).join('\n');
		fileName = body.data.fileName ?? null;
	}
	const r = await createMeasurement({ teamId: team.id, userId: user.id, columnId: String(form.columnId), form, csvText, fileName });
	if (!r) return errorResponse(404, 'not_found', 'Column not found.', [{ path: 'columnId', message: 'No column of your team has this id' }]);
	if (!r.ok) {
		const issues = [...Object.entries(r.fieldErrors).map(([path, message]) => ({ path, message })), ...csvIssues(r.csvErrors, source)];
		return invalid(issues);
	}
	return ok(measurementDetailView(r.measurement), { status: 201 });
};
