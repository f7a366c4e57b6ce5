/** What the column page lists under the column: its cases, runs and comparisons. */
import { and, desc, eq } from 'drizzle-orm';
import { db } from './db/app.js';
import { runs, users } from './db/schema.js';
import { listCasesForColumn } from './cases.js';
import { listComparisons } from './comparisons.js';

export async function columnOverview(options: { teamId: string; columnId: string }) {
	const runRows = await db
		.select({
			id: runs.id,
			caseId: runs.caseId,
			caseName: runs.caseDocument,
			status: runs.status,
			queuedAt: runs.queuedAt,
			steps: runs.steps,
			simulatedTimeS: runs.simulatedTimeS,
			summary: runs.summary,
			queuedByEmail: users.email
		})
		.from(runs)
		.leftJoin(users, eq(users.id, runs.queuedBy))
		.where(and(eq(runs.teamId, options.teamId), eq(runs.columnId, options.columnId)))
		.orderBy(desc(runs.queuedAt))
		.limit(200);
	return {
		cases: await listCasesForColumn(options),
		runs: runRows.map((r) => {
			const design = (r.summary as { design?: Record<string, { value: number }> } | null)?.design;
			return {
				id: r.id,
				caseId: r.caseId,
				caseName: r.caseName.name,
				drag: r.caseName.closures.drag,
				status: r.status,
				queuedAt: r.queuedAt,
				steps: r.steps,
				simulatedTimeS: r.simulatedTimeS,
				holdup: design?.overallHoldup?.value ?? design?.sectionHoldup?.value ?? null,
				queuedByEmail: r.queuedByEmail
			};
		}),
		comparisons: await listComparisons(options)
	};
}
