/**
 * Cases of a column: create, edit, clone, list. The document is always the solver's validated case
 * (defaults applied), so what the worker freezes into a run is exactly what the editor showed.
 * Every query filters by the caller's team; "not found" is `null`.
 */
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import { db } from './db/app.js';
import { isUuid } from './guard.js';
import { cases, runs, signOffs } from './db/schema.js';
import { validateCase, type CaseDocument } from '../../../solver/case.js';

export type Case = typeof cases.$inferSelect;

export async function getCase(options: { teamId: string; id: string }): Promise<Case | null> {
	// a malformed id would make PostgreSQL raise instead of matching nothing
	if (!isUuid(options.id)) return null;
	const [row] = await db
		.select()
		.from(cases)
		.where(and(eq(cases.id, options.id), eq(cases.teamId, options.teamId)))
		.limit(1);
	return row ?? null;
}

function checked(document: unknown): CaseDocument {
	const r = validateCase(document);
	if (!r.ok) throw new Error(`Invalid case: ${r.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
	return r.value;
}

export async function createCase(options: { teamId: string; columnId: string; userId: string; document: unknown }): Promise<Case> {
	const doc = checked(options.document);
	const [row] = await db
		.insert(cases)
		.values({
			teamId: options.teamId,
			columnId: options.columnId,
			name: doc.name,
			kind: doc.kind,
			schemaVersion: doc.schemaVersion,
			document: doc,
			createdBy: options.userId
		})
		.returning();
	return row;
}

export async function updateCase(options: { teamId: string; id: string; document: unknown }): Promise<Case | null> {
	if (!isUuid(options.id)) return null;
	const doc = checked(options.document);
	const [row] = await db
		.update(cases)
		.set({ name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc, updatedAt: new Date() })
		.where(and(eq(cases.id, options.id), eq(cases.teamId, options.teamId)))
		.returning();
	return row ?? null;
}

/** A copy of a case in the same column, named "… (copy)", to vary one choice without losing the original. */
export async function cloneCase(options: { teamId: string; id: string; userId: string }): Promise<Case | null> {
	const source = await getCase({ teamId: options.teamId, id: options.id });
	if (!source) return null;
	const name = `${source.name} (copy)`.slice(0, 120);
	return createCase({ teamId: options.teamId, columnId: source.columnId, userId: options.userId, document: { ...source.document, name } });
}

export interface CaseListItem {
	id: string;
	name: string;
	kind: string;
	updatedAt: Date;
	drag: string;
	runCount: number;
	lastRunStatus: string | null;
	verdict: string | null;
}

/** Cases of a column with their run count, latest run status and current sign-off verdict. */
export async function listCasesForColumn(options: { teamId: string; columnId: string }): Promise<CaseListItem[]> {
	const rows = await db
		.select()
		.from(cases)
		.where(and(eq(cases.teamId, options.teamId), eq(cases.columnId, options.columnId)))
		.orderBy(desc(cases.updatedAt));
	if (rows.length === 0) return [];
	const ids = rows.map((r) => r.id);
	const runRows = await db
		.select({ caseId: runs.caseId, status: runs.status, queuedAt: runs.queuedAt })
		.from(runs)
		.where(and(eq(runs.teamId, options.teamId), inArray(runs.caseId, ids)))
		.orderBy(desc(runs.queuedAt));
	const verdicts = await latestVerdicts({ teamId: options.teamId, subjectType: 'case', subjectIds: ids });
	return rows.map((c) => {
		const mine = runRows.filter((r) => r.caseId === c.id);
		return {
			id: c.id,
			name: c.name,
			kind: c.kind,
			updatedAt: c.updatedAt,
			drag: c.document.closures.drag,
			runCount: mine.length,
			lastRunStatus: mine[0]?.status ?? null,
			verdict: verdicts.get(c.id) ?? null
		};
	});
}

/** The newest verdict per subject (the newest sign-off row is the current state). */
export async function latestVerdicts(options: {
	teamId: string;
	subjectType: 'case' | 'comparison' | 'study';
	subjectIds: string[];
}): Promise<Map<string, string>> {
	const out = new Map<string, string>();
	if (options.subjectIds.length === 0) return out;
	const rows = await db
		.selectDistinctOn([signOffs.subjectId], { subjectId: signOffs.subjectId, verdict: signOffs.verdict })
		.from(signOffs)
		.where(and(eq(signOffs.teamId, options.teamId), eq(signOffs.subjectType, options.subjectType), inArray(signOffs.subjectId, options.subjectIds)))
		.orderBy(signOffs.subjectId, desc(signOffs.createdAt));
	for (const r of rows) out.set(r.subjectId, r.verdict);
	return out;
}

/** How many cases a column has (for the column page's headings). */
export async function countCases(options: { teamId: string; columnId: string }): Promise<number> {
	const [row] = await db
		.select({ n: sql<number>`count(*)::int` })
		.from(cases)
		.where(and(eq(cases.teamId, options.teamId), eq(cases.columnId, options.columnId)));
	return row?.n ?? 0;
}
