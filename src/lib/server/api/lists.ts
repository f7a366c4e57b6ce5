/**
 * The API's lists: a team's columns, cases, runs, studies, measurements and comparisons, newest
 * first, a page at a time (keyset pagination on (time, id), so pages never skip or repeat a row
 * while rows are added), with the filters of the query string. Read-only; every query filters by
 * the caller's team.
 */
import { and, desc, eq, getTableColumns, gte, inArray, lt, sql, type SQL } from 'drizzle-orm';
import type { AnyPgColumn } from 'drizzle-orm/pg-core';
import { db } from '../db/app.js';
import { cases, columns, comparisons, measurements, runs, studies } from '../db/schema.js';
import { latestVerdicts } from '../cases.js';
import type { MeasurementKind } from '../../measurements/kinds.js';
import { encodeTimeCursor, type TimeCursor } from './http.js';
import type { RunStatusValue } from '../db/schema.js';

export interface PageRequest {
	cursor: TimeCursor | null;
	limit: number;
	since?: Date;
	until?: Date;
}

export interface Page<T> {
	items: T[];
	nextCursor: string | null;
}

/** The time as stored (microseconds, UTC), so a cursor compares exactly. */
const cursorText = (at: AnyPgColumn) => sql<string>`to_char(${at} at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')`;

/** The conditions of a page: the time window and "after the cursor" in (time desc, id desc) order. */
function pageWhere(at: AnyPgColumn, idColumn: AnyPgColumn, p: PageRequest): SQL[] {
	const out: SQL[] = [];
	if (p.since) out.push(gte(at, p.since));
	if (p.until) out.push(lt(at, p.until));
	if (p.cursor) out.push(sql`(${at}, ${idColumn}) < (${p.cursor.at}::timestamptz, ${p.cursor.id}::uuid)`);
	return out;
}

/** Rows were read with `limit + 1`: the extra one says there is a next page. */
function finish<R extends { id: string; cursorAt: string }>(rows: R[], limit: number): Page<Omit<R, 'cursorAt'>> {
	const more = rows.length > limit;
	const pageRows = more ? rows.slice(0, limit) : rows;
	const last = pageRows[pageRows.length - 1];
	return {
		items: pageRows.map(({ cursorAt: _c, ...rest }) => rest),
		nextCursor: more && last ? encodeTimeCursor({ at: last.cursorAt, id: last.id }) : null
	};
}

export async function listColumnsPage(o: { teamId: string } & PageRequest) {
	const rows = await db
		.select({ ...getTableColumns(columns), cursorAt: cursorText(columns.createdAt) })
		.from(columns)
		.where(and(eq(columns.teamId, o.teamId), ...pageWhere(columns.createdAt, columns.id, o)))
		.orderBy(desc(columns.createdAt), desc(columns.id))
		.limit(o.limit + 1);
	return finish(rows, o.limit);
}

export async function listCasesPage(o: { teamId: string; columnId?: string } & PageRequest) {
	const rows = await db
		.select({
			id: cases.id,
			columnId: cases.columnId,
			name: cases.name,
			kind: cases.kind,
			schemaVersion: cases.schemaVersion,
			createdAt: cases.createdAt,
			updatedAt: cases.updatedAt,
			cursorAt: cursorText(cases.createdAt)
		})
		.from(cases)
		.where(and(eq(cases.teamId, o.teamId), o.columnId ? eq(cases.columnId, o.columnId) : undefined, ...pageWhere(cases.createdAt, cases.id, o)))
		.orderBy(desc(cases.createdAt), desc(cases.id))
		.limit(o.limit + 1);
	return finish(rows, o.limit);
}

/** Runs without their (large) frozen case documents, by queue time. */
export async function listRunsPage(o: { teamId: string; columnId?: string; caseId?: string; studyId?: string; statuses?: RunStatusValue[] } & PageRequest) {
	const { caseDocument: _frozen, ...rest } = getTableColumns(runs);
	const rows = await db
		.select({ ...rest, cursorAt: cursorText(runs.queuedAt) })
		.from(runs)
		.where(
			and(
				eq(runs.teamId, o.teamId),
				o.columnId ? eq(runs.columnId, o.columnId) : undefined,
				o.caseId ? eq(runs.caseId, o.caseId) : undefined,
				o.studyId ? eq(runs.studyId, o.studyId) : undefined,
				o.statuses?.length ? inArray(runs.status, o.statuses) : undefined,
				...pageWhere(runs.queuedAt, runs.id, o)
			)
		)
		.orderBy(desc(runs.queuedAt), desc(runs.id))
		.limit(o.limit + 1);
	return finish(rows, o.limit);
}

export async function listStudiesPage(o: { teamId: string; columnId?: string } & PageRequest) {
	const rows = await db
		.select({
			id: studies.id,
			name: studies.name,
			kind: studies.kind,
			columnId: studies.columnId,
			caseId: studies.caseId,
			memberCount: studies.memberCount,
			measurementId: studies.measurementId,
			createdAt: studies.createdAt,
			cancelledAt: studies.cancelledAt,
			cursorAt: cursorText(studies.createdAt)
		})
		.from(studies)
		.where(and(eq(studies.teamId, o.teamId), o.columnId ? eq(studies.columnId, o.columnId) : undefined, ...pageWhere(studies.createdAt, studies.id, o)))
		.orderBy(desc(studies.createdAt), desc(studies.id))
		.limit(o.limit + 1);
	return finish(rows, o.limit);
}

export async function listMeasurementsPage(o: { teamId: string; columnId?: string; kind?: MeasurementKind } & PageRequest) {
	const rows = await db
		.select({
			id: measurements.id,
			columnId: measurements.columnId,
			kind: measurements.kind,
			name: measurements.name,
			superficialGasVelocityMS: measurements.superficialGasVelocityMS,
			temperatureK: measurements.temperatureK,
			pressurePa: measurements.pressurePa,
			sourceNote: measurements.sourceNote,
			fileName: measurements.fileName,
			points: sql<number>`jsonb_array_length(${measurements.data}->'x')`,
			createdAt: measurements.createdAt,
			cursorAt: cursorText(measurements.createdAt)
		})
		.from(measurements)
		.where(
			and(
				eq(measurements.teamId, o.teamId),
				o.columnId ? eq(measurements.columnId, o.columnId) : undefined,
				o.kind ? eq(measurements.kind, o.kind) : undefined,
				...pageWhere(measurements.createdAt, measurements.id, o)
			)
		)
		.orderBy(desc(measurements.createdAt), desc(measurements.id))
		.limit(o.limit + 1);
	return finish(rows, o.limit);
}

export async function listComparisonsPage(o: { teamId: string; columnId?: string } & PageRequest) {
	const rows = await db
		.select({ ...getTableColumns(comparisons), cursorAt: cursorText(comparisons.createdAt) })
		.from(comparisons)
		.where(and(eq(comparisons.teamId, o.teamId), o.columnId ? eq(comparisons.columnId, o.columnId) : undefined, ...pageWhere(comparisons.createdAt, comparisons.id, o)))
		.orderBy(desc(comparisons.createdAt), desc(comparisons.id))
		.limit(o.limit + 1);
	const page = finish(rows, o.limit);
	const verdicts = await latestVerdicts({ teamId: o.teamId, subjectType: 'comparison', subjectIds: page.items.map((c) => c.id) });
	return { items: page.items.map((c) => ({ ...c, verdict: verdicts.get(c.id) ?? null })), nextCursor: page.nextCursor };
}

/** One column of the team, or null (also for a malformed id). */
export async function teamColumn(o: { teamId: string; id: string }) {
	if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(o.id)) return null;
	const [row] = await db
		.select()
		.from(columns)
		.where(and(eq(columns.id, o.id), eq(columns.teamId, o.teamId)))
		.limit(1);
	return row ?? null;
}
