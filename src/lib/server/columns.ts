/** Columns (equipment items) of a team. Every query filters by the caller's team. */
import { and, asc, desc, eq, ilike, or, sql } from 'drizzle-orm';
import { z } from 'zod';
import { db } from './db/app.js';
import { columns } from './db/schema.js';

export type Column = typeof columns.$inferSelect;

const positiveNumber = (what: string, maxM: number) =>
	z
		.string()
		.trim()
		.min(1, `Enter the ${what}.`)
		.transform((s) => Number(s.replace(',', '.')))
		.refine((n) => Number.isFinite(n) && n > 0, `The ${what} must be a positive number of metres.`)
		.refine((n) => n <= maxM, `The ${what} looks too large (over ${maxM} m).`);

/** The column form; inputs in metres (SI). */
export const columnForm = z.object({
	tag: z
		.string()
		.trim()
		.min(1, 'Enter a tag, e.g. C-201.')
		.max(40, 'Keep the tag under 40 characters.'),
	service: z.string().trim().max(200, 'Keep the service under 200 characters.').default(''),
	diameterM: positiveNumber('inner diameter', 20),
	heightM: positiveNumber('height', 100),
	notes: z.string().trim().max(4000, 'Keep the notes under 4000 characters.').default('')
});
export type ColumnInput = z.infer<typeof columnForm>;

export const SORTABLE = ['tag', 'service', 'diameterM', 'heightM', 'updatedAt'] as const;
export type ColumnSort = (typeof SORTABLE)[number];

export async function listColumns(options: { teamId: string; sort?: ColumnSort; descending?: boolean; filter?: string }) {
	const sortColumn = columns[options.sort ?? 'tag'];
	// the filter is plain text: % and _ match themselves, not any characters
	const pattern = `%${(options.filter ?? '').replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
	const where = options.filter
		? and(eq(columns.teamId, options.teamId), or(ilike(columns.tag, pattern), ilike(columns.service, pattern)))
		: eq(columns.teamId, options.teamId);
	return db
		.select()
		.from(columns)
		.where(where)
		.orderBy(options.descending ? desc(sortColumn) : asc(sortColumn), asc(columns.tag));
}

export async function countColumns(teamId: string): Promise<number> {
	const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(columns).where(eq(columns.teamId, teamId));
	return row?.n ?? 0;
}

/** Is the tag taken in this team (ignoring `exceptId`)? Tags are unique per team. */
export async function tagTaken(options: { teamId: string; tag: string; exceptId?: string }): Promise<boolean> {
	const rows = await db
		.select({ id: columns.id })
		.from(columns)
		.where(and(eq(columns.teamId, options.teamId), sql`lower(${columns.tag}) = lower(${options.tag})`));
	return rows.some((r) => r.id !== options.exceptId);
}

export async function createColumn(options: { teamId: string; userId: string; input: ColumnInput }): Promise<Column> {
	const [row] = await db
		.insert(columns)
		.values({ ...options.input, teamId: options.teamId, createdBy: options.userId })
		.returning();
	return row;
}

export async function updateColumn(options: { teamId: string; id: string; input: ColumnInput }): Promise<Column | null> {
	const [row] = await db
		.update(columns)
		.set({ ...options.input, updatedAt: new Date() })
		.where(and(eq(columns.id, options.id), eq(columns.teamId, options.teamId)))
		.returning();
	return row ?? null;
}

export async function deleteColumn(options: { teamId: string; id: string }): Promise<boolean> {
	const rows = await db
		.delete(columns)
		.where(and(eq(columns.id, options.id), eq(columns.teamId, options.teamId)))
		.returning({ id: columns.id });
	return rows.length > 0;
}
