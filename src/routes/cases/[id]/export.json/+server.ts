import { error } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import type { RequestHandler } from './$types';
import { requireMember } from '$lib/server/guard';
import { db } from '$lib/server/db/app';
import { columns } from '$lib/server/db/schema';
import * as cases from '$lib/server/cases';
import { validateCase } from '$solver/case';
import { caseToJson } from '$lib/measurements/case-json';
import { csvFileName } from '$lib/measurements/export';

/** The case as a versioned JSON document (its schemaVersion first), for download and re-import. */
export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const row = await cases.getCase({ teamId: team.id, id: event.params.id });
	if (!row) error(404, 'Case not found.');
	// a case stored by an older schema is exported with today's defaults filled in
	const checked = validateCase(row.document);
	if (!checked.ok) error(500, 'The stored case does not pass the case schema.');
	const [column] = await db.select({ tag: columns.tag }).from(columns).where(eq(columns.id, row.columnId));
	const name = csvFileName(column?.tag ?? '', row.name).replace(/\.csv$/, '.case.json');
	return new Response(caseToJson(checked.value), {
		headers: { 'content-type': 'application/json; charset=utf-8', 'content-disposition': `attachment; filename="${name}"` }
	});
};
