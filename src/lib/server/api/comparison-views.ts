/** Comparisons in the API's wire form (`comparisonSummarySchema`, `comparisonDetailSchema`). */
import type { z } from 'zod';
import { latestVerdicts } from '../cases.js';
import { loadComparedRuns, type Comparison } from '../comparisons.js';
import type { comparisonDetailSchema, comparisonSummarySchema } from './schemas.js';

type Verdict = z.output<typeof comparisonSummarySchema>['verdict'];

export function comparisonSummaryView(c: Comparison & { verdict: string | null }): z.output<typeof comparisonSummarySchema> {
	return {
		id: c.id,
		name: c.name,
		columnId: c.columnId,
		runIds: c.runIds,
		baselineRunId: c.baselineRunId,
		measurementId: c.measurementId,
		createdAt: c.createdAt.toISOString(),
		verdict: c.verdict as Verdict
	};
}

/** A comparison with its runs (saved order) and their design numbers. */
export async function comparisonDetail(teamId: string, c: Comparison): Promise<z.output<typeof comparisonDetailSchema>> {
	const [verdicts, runs] = await Promise.all([latestVerdicts({ teamId, subjectType: 'comparison', subjectIds: [c.id] }), loadComparedRuns({ teamId, runIds: c.runIds })]);
	return {
		...comparisonSummaryView({ ...c, verdict: verdicts.get(c.id) ?? null }),
		runs: runs.map((r) => ({
			id: r.id,
			caseId: r.caseId,
			caseName: r.caseName,
			status: r.status as z.output<typeof comparisonDetailSchema>['runs'][number]['status'],
			queuedAt: new Date(r.queuedAt).toISOString(),
			design: r.design
		}))
	};
}
