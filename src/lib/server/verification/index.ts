/**
 * The verification page's server side (PRODUCT screen 8): the cached results of this app's solver version,
 * queued for a worker when there are none yet (or they failed), their progress while a worker computes
 * them; `verificationViews` serves the page and the printable comparison report (the solver versions of its runs).
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

/** A solver version with no cached verification at all (never computed, or never asked for). */
export interface NoVerification {
	solverVersion: string;
	status: null;
	/** live workers registered with this solver version */
	liveWorkers: number;
}

/** No chart: what a summary (the printable report) carries instead of the plotted series. */
const NO_CHART: VerificationResult['chart'] = { x: [], xLabel: '', yLabel: '', series: [] };

/**
 * The cached verification of each of `solverVersions` (in that order, duplicates once), as it is: never
 * queued from here. The verification page shows its own version through this, the printable report the
 * versions of its runs. `charts: false` leaves out the plotted series (a summary needs only the numbers).
 */
export async function verificationViews(solverVersions: string[], options: { charts?: boolean } = {}): Promise<Array<VerificationView | NoVerification>> {
	const versions = [...new Set(solverVersions)];
	if (versions.length === 0) return [];
	const rows = await db.select().from(verificationResults).where(inArray(verificationResults.solverVersion, versions));
	return Promise.all(
		versions.map(async (solverVersion) => {
			const row = rows.find((r) => r.solverVersion === solverVersion);
			const liveWorkers = await liveWorkersOf(solverVersion);
			if (!row) return { solverVersion, status: null, liveWorkers } satisfies NoVerification;
			let results = row.status === 'done' ? ((row.results ?? []) as VerificationResult[]) : null;
			if (results && options.charts === false) results = results.map((r) => ({ ...r, chart: NO_CHART }));
			return { ...statusOf(row, liveWorkers), results } satisfies VerificationView;
		})
	);
}

/**
 * The verification of this app's solver version as the page shows it. Opening the page queues the
 * computation when there is no row yet, or the last attempt failed (or was orphaned): one transaction
 * with the row, see `queueVerification`.
 */
export async function openVerification(): Promise<VerificationView & { queuedNow: boolean }> {
	const solverVersion = verificationVersion();
	const row = await getVerificationRow(db, solverVersion);
	let queuedNow = false;
	if (!row || row.status !== 'done') queuedNow = await queueVerification({ pool: appHandle.pool, boss: await appBoss(), solverVersion });
	const [view] = await verificationViews([solverVersion]);
	if (!view || view.status === null) throw new Error(`the verification row of solver ${solverVersion} vanished`);
	return { ...view, queuedNow };
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
