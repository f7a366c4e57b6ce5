/**
 * The verification page's server side (PRODUCT screen 8): the cached results of this app's solver version,
 * queued for a worker when there are none yet (or they failed), their progress while a worker computes
 * them, and the summary the printable comparison report shows for the solver versions of its runs.
 * Callers check the member's role first (`requireMember(event, 'viewer')`); the results are the same for
 * every team (they depend on the solver version only).
 */
import { and, eq, gt, inArray, isNull, sql } from 'drizzle-orm';
import { verificationCases } from '../../../../solver/verification/index.js';
import { db } from '../db/app.js';
import { verificationResults, workers } from '../db/schema.js';
import { appBoss, appHandle } from '../runs/app.js';
import { workerLostAfterS } from '../workers.js';
import { getVerificationRow, queueVerification, verificationVersion, type VerificationResult, type VerificationRow } from './shared.js';

export { verificationVersion };
export type { VerificationResult };

export interface VerificationStatus {
	solverVersion: string;
	status: VerificationRow['status'];
	/** 0–1 */
	progress: number;
	errorMessage: string | null;
	queuedAt: string;
	startedAt: string | null;
	finishedAt: string | null;
	/** host of the worker that computed (or computes) it */
	workerHost: string | null;
	caseCount: number;
	/** while computing: the case under way */
	currentCase: { index: number; title: string } | null;
	/** live workers registered with this solver version (they are the ones that can compute it) */
	liveWorkers: number;
}

export interface VerificationView extends VerificationStatus {
	/** once done: every case with its outcome */
	results: VerificationResult[] | null;
}

function statusOf(row: VerificationRow, liveWorkers: number): VerificationStatus {
	const count = verificationCases.length;
	const index = Math.min(count - 1, Math.floor(row.progress * count));
	return {
		solverVersion: row.solverVersion,
		status: row.status,
		progress: row.progress,
		errorMessage: row.errorMessage,
		queuedAt: row.queuedAt.toISOString(),
		startedAt: row.startedAt?.toISOString() ?? null,
		finishedAt: row.finishedAt?.toISOString() ?? null,
		workerHost: row.workerId ? row.workerId.split(':')[0] : null,
		caseCount: count,
		currentCase: row.status === 'computing' ? { index, title: verificationCases[index]?.title ?? '' } : null,
		liveWorkers
	};
}

async function liveWorkersOf(solverVersion: string): Promise<number> {
	const [{ n }] = await db
		.select({ n: sql<number>`count(*)::int` })
		.from(workers)
		.where(and(eq(workers.solverVersion, solverVersion), isNull(workers.stoppedAt), gt(workers.heartbeatAt, sql`now() - (${workerLostAfterS()}::int * interval '1 second')`)));
	return n;
}

/**
 * The verification of this app's solver version as the page shows it. Opening the page queues the
 * computation when there is no row yet, or the last attempt failed (or was orphaned): one transaction
 * with the row, see `queueVerification`.
 */
export async function openVerification(): Promise<VerificationView & { queuedNow: boolean }> {
	const solverVersion = verificationVersion();
	let row = await getVerificationRow(db, solverVersion);
	let queuedNow = false;
	if (!row || row.status !== 'done') {
		queuedNow = await queueVerification({ pool: appHandle.pool, boss: await appBoss(), solverVersion });
		if (queuedNow) row = await getVerificationRow(db, solverVersion);
	}
	if (!row) throw new Error(`the verification row of solver ${solverVersion} vanished`);
	return { ...statusOf(row, await liveWorkersOf(solverVersion)), results: row.status === 'done' ? ((row.results ?? []) as VerificationResult[]) : null, queuedNow };
}

/** The state of this app's solver version's verification without the results (the page polls it). */
export async function verificationStatus(): Promise<VerificationStatus | null> {
	const solverVersion = verificationVersion();
	const [row] = await db
		.select({
			solverVersion: verificationResults.solverVersion,
			status: verificationResults.status,
			progress: verificationResults.progress,
			errorMessage: verificationResults.errorMessage,
			workerId: verificationResults.workerId,
			queuedAt: verificationResults.queuedAt,
			startedAt: verificationResults.startedAt,
			finishedAt: verificationResults.finishedAt
		})
		.from(verificationResults)
		.where(eq(verificationResults.solverVersion, solverVersion));
	if (!row) return null;
	return statusOf({ ...row, results: null }, await liveWorkersOf(solverVersion));
}

export interface VerificationSummary {
	solverVersion: string;
	/** null: nothing cached for this version */
	status: VerificationRow['status'] | null;
	finishedAt: string | null;
	/** when done: one line per case */
	cases: { id: string; title: string; error: number | null; errorUnit: string; tolerance: number | null; observedOrder: number | null; passed: boolean }[];
}

/** The verification summaries of some solver versions (the printable report: the versions of its runs). */
export async function verificationSummaries(solverVersions: string[]): Promise<VerificationSummary[]> {
	const versions = [...new Set(solverVersions)];
	if (versions.length === 0) return [];
	const rows = await db.select().from(verificationResults).where(inArray(verificationResults.solverVersion, versions));
	return versions.map((v) => {
		const row = rows.find((r) => r.solverVersion === v);
		const results = row?.status === 'done' ? ((row.results ?? []) as VerificationResult[]) : [];
		return {
			solverVersion: v,
			status: row?.status ?? null,
			finishedAt: row?.finishedAt?.toISOString() ?? null,
			cases: results.map((r) => ({
				id: r.id,
				title: r.title,
				error: Number.isFinite(r.error) ? r.error : null,
				errorUnit: r.errorUnit,
				tolerance: Number.isFinite(r.tolerance) ? r.tolerance : null,
				observedOrder: r.order && Number.isFinite(r.order.observed) ? r.order.observed : null,
				passed: r.passed
			}))
		};
	});
}
