/**
 * What the app and the worker share about the solver's verification: which solver version the results are
 * filed under, the row of `verification_results`, and queueing its computation. One row per solver version;
 * a worker of that version computes it (worker/jobs/verify.ts) and writes its progress about once per case.
 * No SvelteKit imports: the worker loads this module under tsx.
 *
 * Row life: no row (or `failed`, or `queued`/`computing` for longer than `STALE_AFTER_S`, i.e. its worker
 * died) → `queueVerification` inserts or resets it to `queued` and sends the job in ONE transaction →
 * a worker claims it (`computing`, progress 0–1) → `done` with the results, or `failed` with the message.
 */
import { eq } from 'drizzle-orm';
import type pg from 'pg';
import type PgBoss from 'pg-boss';
import { SOLVER_VERSION } from '../../../../solver/version.js';
import type { VerificationResult } from '../../../../solver/verification/types.js';
import { verificationResults } from '../db/schema.js';
import type { Db } from '../db/index.js';
import { ensureQueue, JOB_CHANNEL, verifyQueue } from '../runs/jobs.js';

export type VerificationRow = typeof verificationResults.$inferSelect;
export type { VerificationResult };

export interface VerifyJobData {
	solverVersion: string;
}

/**
 * A row left `queued` or `computing` this long is taken as orphaned (its job lost, its worker dead) and
 * queued again when someone asks for it. The whole verification takes seconds.
 */
export const STALE_AFTER_S = 600;

/** Retries are for infrastructure faults and a worker stopped mid-way (a failing case is a result, not a fault). */
const RETRY_LIMIT = 2;

/**
 * The solver version the verification results of this process are filed under: this process's
 * `SOLVER_VERSION`. Under `TWOFOLD_TEST=1` only, `TWOFOLD_TEST_VERIFY_VERSION` files them under another
 * name, so a test can pose as an upgraded app and worker without a second solver.
 */
export function verificationVersion(): string {
	const override = process.env.TWOFOLD_TEST === '1' ? process.env.TWOFOLD_TEST_VERIFY_VERSION : undefined;
	return override || SOLVER_VERSION;
}

/** The row of a solver version, or null. */
export async function getVerificationRow(db: Db, solverVersion: string): Promise<VerificationRow | null> {
	const [row] = await db.select().from(verificationResults).where(eq(verificationResults.solverVersion, solverVersion));
	return row ?? null;
}

const created = new Set<string>();

/**
 * Queue the verification of `solverVersion` unless it is done or on its way: insert its row as `queued`
 * (or reset a failed or orphaned one) and send its job on the same transaction, so there is never a queued
 * row without a job or a job without its row. Returns true when it queued. A failed row keeps its error
 * message while queued again (the page says what went wrong last time); the worker clears it.
 */
export async function queueVerification(o: { pool: pg.Pool; boss: PgBoss; solverVersion: string }): Promise<boolean> {
	const queue = verifyQueue(o.solverVersion);
	if (!created.has(queue)) {
		await ensureQueue(o.boss, queue);
		created.add(queue);
	}
	const client = await o.pool.connect();
	try {
		await client.query('BEGIN');
		const { rows } = await client.query(
			`insert into verification_results (solver_version, status, progress, queued_at)
			 values ($1, 'queued', 0, now())
			 on conflict (solver_version) do update
			   set status = 'queued', progress = 0, queued_at = now(), started_at = null, finished_at = null, worker_id = null, results = null
			 where verification_results.status = 'failed'
			    or (verification_results.status = 'queued' and verification_results.queued_at < now() - ($2::int * interval '1 second'))
			    or (verification_results.status = 'computing' and coalesce(verification_results.started_at, verification_results.queued_at) < now() - ($2::int * interval '1 second'))
			 returning solver_version`,
			[o.solverVersion, STALE_AFTER_S]
		);
		if (rows.length === 0) {
			await client.query('ROLLBACK');
			return false;
		}
		const db = { executeSql: (text: string, values: unknown[]) => client.query(text, values as unknown[]) };
		const id = await o.boss.send(queue, { solverVersion: o.solverVersion } satisfies VerifyJobData, {
			db,
			retryLimit: RETRY_LIMIT,
			retryDelay: 2,
			expireInSeconds: STALE_AFTER_S
		});
		if (!id) throw new Error(`pg-boss did not accept the verification job of solver ${o.solverVersion}`);
		await client.query('select pg_notify($1, $2)', [JOB_CHANNEL, queue]);
		await client.query('COMMIT');
		return true;
	} catch (e) {
		await client.query('ROLLBACK').catch(() => {});
		throw e;
	} finally {
		client.release();
	}
}
