/**
 * Benchmark of runs as queued jobs (figures, not assertions), against the database of
 * DATABASE_URL (`npm run bench` sets it up):
 *
 * - queue-to-start latency: a real worker process (`node --import tsx worker/index.ts`, one slot)
 *   and small runs queued one after another; `started_at − queued_at` of each run (both stamped by
 *   PostgreSQL's clock);
 * - solver-step-to-event latency with 20 SSE clients on one run over loopback: the worker's handler
 *   and solver thread run in this process, the event stream is the app's own (`createEventStream`
 *   with one LISTEN hub) on a plain Node HTTP server, and 20 `fetch` clients read it. Latency of a
 *   residual point = arrival at a client − the wall clock when the solver thread computed that step.
 *   The design delay is part of it: the thread posts its rows every ~100 ms (the main thread writes
 *   them as they arrive);
 * - stored bytes per snapshot of the reference case (2 m column, 100 cells, six fields).
 *
 * Everything it creates lives in a throw-away team that is deleted at the end.
 */
import { spawn } from 'node:child_process';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { eq, sql } from 'drizzle-orm';
import { createDb, DEFAULT_DATABASE_URL } from '../src/lib/server/db/index.js';
import { cases, columns, runs, snapshots, teams, users } from '../src/lib/server/db/schema.js';
import * as commands from '../src/lib/server/runs/commands.js';
import { createBoss, ensureQueue, SOLVE_QUEUE } from '../src/lib/server/runs/jobs.js';
import { createRunHub } from '../src/lib/server/runs/hub.js';
import { createEventStream, START_CURSOR } from '../src/lib/server/runs/events.js';
import { solveJob, type ActiveRun } from '../worker/jobs/solve.js';
import { createSolverPool, type SolverPool } from '../worker/jobs/solver-pool.js';
import type { ThreadMessage } from '../worker/jobs/solve-protocol.js';
import { defaultCase, type CaseDocument } from '../solver/index.js';

import { stats } from './stats.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');


function smallCase(): CaseDocument {
	const c = defaultCase('height-profile');
	c.name = 'bench small';
	c.geometry.heightM = 1;
	c.geometry.clearLiquidLevelM = 0.7;
	c.numerics.cells = 40;
	return c;
}

/** The reference case of the solver issue: air–water, 2 m, 0.2 m, 1.5 m clear level, 4 mm, 0.05 m/s, 100 cells. */
function referenceCase(): CaseDocument {
	const c = defaultCase('height-profile');
	c.name = 'bench reference';
	c.numerics.snapshotIntervalS = 1;
	return c;
}

export async function benchJobs(options: { url?: string; runs?: number; clients?: number } = {}): Promise<Record<string, unknown>> {
	const url = options.url ?? process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL;
	const handle = createDb({ url, max: 6, applicationName: 'twofold-bench' });
	const boss = createBoss({ url, role: 'app' });
	boss.on('error', () => {});
	await boss.start();
	await ensureQueue(boss);
	const suffix = randomBytes(4).toString('hex');
	const [team] = await handle.db.insert(teams).values({ name: `Bench ${suffix}`, slug: `bench-${suffix}`, maxActiveRuns: 100 }).returning();
	const [user] = await handle.db.insert(users).values({ email: `bench-${suffix}@bench.invalid`, name: 'bench' }).returning();
	const [column] = await handle.db.insert(columns).values({ teamId: team.id, tag: 'B-1', diameterM: 0.2, heightM: 2 }).returning();
	const storeCase = async (doc: CaseDocument) =>
		(await handle.db.insert(cases).values({ teamId: team.id, columnId: column.id, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc }).returning())[0].id;
	const waitEnded = async (runId: string) => {
		for (;;) {
			const [r] = await handle.db.select().from(runs).where(eq(runs.id, runId));
			if (!['queued', 'running'].includes(r.status)) return r;
			await new Promise((res) => setTimeout(res, 20));
		}
	};

	try {
		// ---------------------------------------------------------------- queue to start
		const worker = spawn(process.execPath, ['--import', 'tsx', 'worker/index.ts'], {
			cwd: ROOT,
			env: { ...process.env, DATABASE_URL: url, TWOFOLD_WORKER_CONCURRENCY: '1', SMTP_PORT: process.env.SMTP_PORT ?? '1' },
			stdio: ['ignore', 'pipe', 'pipe']
		});
		let log = '';
		worker.stdout.on('data', (d) => (log += d));
		worker.stderr.on('data', (d) => (log += d));
		const ready = Date.now();
		while (!log.includes('working solve-run')) {
			if (worker.exitCode !== null || Date.now() - ready > 60_000) throw new Error(`bench worker did not start:\n${log}`);
			await new Promise((r) => setTimeout(r, 50));
		}
		const smallId = await storeCase(smallCase());
		const startLatencyMs: number[] = [];
		// one warm-up run (connections, solver thread), not counted
		await waitEnded((await commands.queue({ handle, boss, teamId: team.id, caseId: smallId, userId: user.id })).id);
		for (let i = 0; i < (options.runs ?? 10); i++) {
			// idle worker: the run waits only for the wake-up (or the next poll)
			await new Promise((r) => setTimeout(r, 300));
			const run = await commands.queue({ handle, boss, teamId: team.id, caseId: smallId, userId: user.id });
			const done = await waitEnded(run.id);
			if (done.startedAt) startLatencyMs.push(done.startedAt.getTime() - done.queuedAt.getTime());
		}
		const exited = new Promise((r) => worker.once('exit', r));
		worker.kill('SIGTERM');
		await exited;

		// ---------------------------------------------------------------- step to event, 20 clients
		const clients = options.clients ?? 20;
		const refDoc = referenceCase();
		const refId = await storeCase(refDoc);
		const run = await commands.queue({ handle, boss, teamId: team.id, caseId: refId, userId: user.id });
		// this process works the run itself: withdraw the job from the queue
		await boss.cancel(SOLVE_QUEUE, run.jobId!);

		const hub = createRunHub({ url });
		await hub.ready();
		const server = http.createServer((req, res) => {
			const controller = new AbortController();
			req.on('close', () => controller.abort());
			res.writeHead(200, { 'content-type': 'text/event-stream', 'cache-control': 'no-cache' });
			const body = createEventStream({ db: handle.db, hub, runId: run.id, cursor: START_CURSOR, signal: controller.signal });
			void (async () => {
				for await (const chunk of body as unknown as AsyncIterable<Uint8Array>) res.write(chunk);
				res.end();
			})().catch(() => res.end());
		});
		await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
		const port = (server.address() as { port: number }).port;

		const computedAtMs = new Map<number, number>();
		const arrivalsMs: { step: number; atMs: number }[] = [];
		const readers = Array.from({ length: clients }, async (_, i) => {
			const controller = new AbortController();
			const res = await fetch(`http://127.0.0.1:${port}/runs/${run.id}/events?client=${i}`, { signal: controller.signal });
			const decoder = new TextDecoder();
			let buffer = '';
			try {
				for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
					const now = Date.now();
					buffer += decoder.decode(chunk, { stream: true });
					let cut: number;
					while ((cut = buffer.indexOf('\n\n')) >= 0) {
						const block = buffer.slice(0, cut);
						buffer = buffer.slice(cut + 2);
						const event = /^event: (.*)$/m.exec(block)?.[1];
						const data = /^data: (.*)$/m.exec(block)?.[1];
						if (event === 'residuals' && data) for (const p of JSON.parse(data).points as { step: number }[]) arrivalsMs.push({ step: p.step, atMs: now });
						if (event === 'status' && data && !['queued', 'running'].includes(JSON.parse(data).status)) {
							controller.abort();
							return;
						}
					}
				}
			} catch {
				// aborted at the final status
			}
		});

		// the real handler, on a solver thread of its own; paced so the run spans many write cycles
		const base = createSolverPool(1);
		const pool: SolverPool = {
			...base,
			acquire() {
				const t = base.acquire();
				t.worker.on('message', (m: ThreadMessage) => {
					if (m.type === 'residuals') for (const r of m.rows) computedAtMs.set(r.step, r.atMs);
				});
				return t;
			}
		};
		const stepPauseMs = 3;
		await solveJob(
			{
				handle,
				boss,
				workerId: `${os.hostname()}:${process.pid}:bench`,
				flushIntervalMs: 100,
				checkpointIntervalS: 3,
				stepPauseMs,
				pool,
				active: new Set<ActiveRun>(),
				isStopping: () => false,
				log: () => {}
			},
			{ id: run.jobId!, name: SOLVE_QUEUE, data: { runId: run.id }, expireInSeconds: 3600 }
		);
		await Promise.all(readers);
		server.close();
		await hub.close();
		await base.close();
		const latencies = arrivalsMs.filter((a) => computedAtMs.has(a.step)).map((a) => a.atMs - computedAtMs.get(a.step)!);
		const ended = await waitEnded(run.id);

		// ---------------------------------------------------------------- snapshot size
		const snaps = await handle.db
			.select({ bytes: sql<number>`octet_length(${snapshots.data})::int`, isFinal: snapshots.isFinal })
			.from(snapshots)
			.where(eq(snapshots.runId, run.id));
		const fields = 6;
		const cells = refDoc.numerics.cells;
		const finalBytes = snaps.find((s) => s.isFinal)?.bytes ?? NaN;
		const periodic = snaps.filter((s) => !s.isFinal).map((s) => s.bytes);
		const periodicBytes = periodic.length ? Math.round(periodic.reduce((a, b) => a + b, 0) / periodic.length) : NaN;
		const perValue = (bytes: number) => Math.round((bytes / (fields * cells)) * 100) / 100;

		return {
			queueToStartMs: { ...stats(startLatencyMs), note: 'one idle worker process, woken by NOTIFY (polling every 0.5 s is the fallback); after one warm-up run' },
			stepToEventMs: {
				...stats(latencies),
				clients,
				run: { status: ended.status, steps: ended.steps, wallTimeS: Math.round(ended.wallTimeS * 100) / 100, stepPauseMs },
				note: 'solver thread computes a step → posts its rows every ~100 ms → main thread writes them at once + NOTIFY → LISTEN hub → one shared read → SSE → 20 fetch clients on loopback'
			},
			snapshotBytes: {
				case: 'reference (2 m, 100 cells)',
				fields,
				cells,
				periodicSnapshotBytes: periodicBytes,
				periodicBytesPerValuePerCell: perValue(periodicBytes),
				finalSnapshotBytes: finalBytes,
				finalBytesPerValuePerCell: perValue(finalBytes),
				snapshotsStored: snaps.length,
				note: 'msgpack of a [field, cell] typed array + cell positions + field names; periodic snapshots Float32, the final one Float64 (bit-identical); per value figures include the positions and header'
			}
		};
	} finally {
		await handle.db.delete(teams).where(eq(teams.id, team.id));
		await handle.db.delete(users).where(eq(users.id, user.id));
		await boss.stop({ graceful: false, wait: false }).catch(() => {});
		await handle.close();
	}
}

// `npx tsx bench/jobs.ts` runs this benchmark alone
if (import.meta.url === `file://${process.argv[1]}`) {
	console.log(JSON.stringify(await benchJobs(), null, 2));
	process.exit(0);
}
