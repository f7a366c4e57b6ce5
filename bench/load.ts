/**
 * Load figures of the built app (printed, never asserted), against the database of DATABASE_URL
 * (`npm run bench` sets it up). The app is `node build` on a free loopback port (the test helper
 * `startApp`, which builds first when `build/` is stale), with one real worker process.
 *
 * - 100 viewers of one run: 100 clients follow `/runs/<id>/events` (the `SseFollower` of the tests,
 *   which reconnects like EventSource) while a paced worker solves the reference case. Neither a
 *   residual row nor an event carries a time of its own, so the time a step is stored is observed
 *   here: this process LISTENs on the run channel (the worker NOTIFYs in the transaction that
 *   writes the rows, so the notification arrives after their commit) and reads which steps are new
 *   at once; those steps are stamped with the arrival of that notification. Latency of a step at a
 *   viewer = arrival of the event carrying it − that stamp (same clock, same process). The
 *   observer's own notification → read delay is printed as the figure's uncertainty. Missed
 *   events = stored residual steps a viewer never received, compared with the table at the end.
 * - A burst of authenticated requests from concurrent clients, half pages (session cookies of
 *   three members) and half JSON API (`/api/v1`, one personal token per client, so the default
 *   rate limit of 60 per token at once is not what is measured): latency p50/p95/p99 of whole
 *   responses (body read), throughput, errors (anything but 200, or no answer). While the burst
 *   runs, a fourth member signs in for the first time (password form, argon2); the same sign-in of
 *   another member on the idle app before the burst is printed beside it.
 *
 * Everything it creates lives in a throw-away team that is deleted at the end.
 */
import { createHash, randomBytes } from 'node:crypto';
import { and, asc, eq, gt, inArray } from 'drizzle-orm';
import pg from 'pg';
import { startApp, type RunningApp } from '../tests/helpers/app.js';
import { createTestTeam } from '../tests/helpers/team.js';
import { signedInClient, TestClient } from '../tests/helpers/http.js';
import { startWorker, type WorkerProcess } from '../tests/helpers/workers.js';
import { ENDED, SseFollower, referenceCase, storedSteps, waitForStatus } from '../tests/helpers/runs.js';
import { createDb, DEFAULT_DATABASE_URL } from '../src/lib/server/db/index.js';
import { apiTokens, cases, columns, residuals, teams, users } from '../src/lib/server/db/schema.js';
import { RUN_CHANNEL } from '../src/lib/server/runs/jobs.js';
import type { Role } from '../src/lib/server/db/schema.js';

import { round, stats as sampleStats } from './stats.js';

const stats = (values: number[]) => sampleStats(values, { p99: true });

const cookieOf = (c: TestClient) => [...c.cookies].map(([k, v]) => `${k}=${v}`).join('; ');

/**
 * When each residual step of a run was first readable outside the worker: LISTEN, and on every
 * notification of the run read the steps beyond the last one seen. Reads never overlap; the steps
 * a read finds are stamped with the earliest notification it answers.
 */
async function observeStoredSteps(url: string, db: ReturnType<typeof createDb>['db'], runId: string) {
	const storedAtMs = new Map<number, number>();
	const readDelayMs: number[] = [];
	let lastStep = 0;
	let reading = false;
	let pendingSinceMs: number | null = null;
	let closed = false;
	const read = async (stampMs: number) => {
		reading = true;
		try {
			readDelayMs.push(Date.now() - stampMs);
			const rows = await db
				.select({ step: residuals.step })
				.from(residuals)
				.where(and(eq(residuals.runId, runId), gt(residuals.step, lastStep)))
				.orderBy(asc(residuals.step));
			for (const r of rows) if (!storedAtMs.has(r.step)) storedAtMs.set(r.step, stampMs);
			if (rows.length) lastStep = Math.max(lastStep, rows[rows.length - 1].step);
		} finally {
			reading = false;
		}
		if (pendingSinceMs !== null && !closed) {
			const next = pendingSinceMs;
			pendingSinceMs = null;
			await read(next);
		}
	};
	const client = new pg.Client({ connectionString: url, application_name: 'twofold-bench-observer' });
	await client.connect();
	client.on('notification', (msg) => {
		if (msg.channel !== RUN_CHANNEL || msg.payload !== runId) return;
		const now = Date.now();
		if (reading) pendingSinceMs ??= now;
		else void read(now).catch(() => {});
	});
	await client.query(`LISTEN ${RUN_CHANNEL}`);
	return {
		storedAtMs,
		readDelayMs,
		async close() {
			closed = true;
			while (reading) await new Promise((r) => setTimeout(r, 10));
			await client.end();
		}
	};
}

export async function benchLoad(options: { url?: string; viewers?: number; requests?: number; concurrency?: number } = {}): Promise<Record<string, unknown>> {
	const url = options.url ?? process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL;
	const viewerCount = options.viewers ?? 100;
	const requestCount = options.requests ?? 2000;
	const concurrency = options.concurrency ?? 50;
	const handle = createDb({ url, max: 4, applicationName: 'twofold-bench' });
	const t = await createTestTeam({ db: handle.db, name: `Bench load ${randomBytes(3).toString('hex')}` });
	await handle.db.update(teams).set({ maxActiveRuns: 10 }).where(eq(teams.id, t.team.id));
	let app: RunningApp | null = null;
	let worker: WorkerProcess | null = null;
	try {
		app = await startApp();
		const baseUrl = app.baseUrl;
		const [column] = await handle.db.insert(columns).values({ teamId: t.team.id, tag: 'L-1', diameterM: 0.2, heightM: 2 }).returning();
		const doc = referenceCase('bench load reference');
		const [caseRow] = await handle.db
			.insert(cases)
			.values({ teamId: t.team.id, columnId: column.id, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc })
			.returning();

		// ---------------------------------------------------------------- sessions (one timed on the idle app)
		const viewer = await signedInClient(baseUrl, t.members.viewer);
		const lead = await signedInClient(baseUrl, t.members.lead);
		const idleSignIn0 = performance.now();
		const analyst = await signedInClient(baseUrl, t.members.analyst);
		const idleSignInMs = performance.now() - idleSignIn0;

		// ---------------------------------------------------------------- 100 viewers of one run
		const queued = await analyst.postJson('/runs', { caseId: caseRow.id });
		if (queued.status !== 201) throw new Error(`queueing the bench run gave HTTP ${queued.status}: ${await queued.text()}`);
		const runId = ((await queued.json()) as { run: { id: string } }).run.id;
		const observer = await observeStoredSteps(url, handle.db, runId);
		const cookie = cookieOf(viewer);
		const followers = Array.from(
			{ length: viewerCount },
			(_, i) => new SseFollower({ baseUrl, path: `/runs/${runId}/events?viewer=${i}`, cookie, timeoutMs: 90_000 })
		);
		// every viewer connected (and has the queued status) before the worker starts
		const connectDeadline = Date.now() + 30_000;
		while (followers.some((f) => f.events.length === 0)) {
			if (Date.now() > connectDeadline) throw new Error('not every viewer connected within 30 s');
			await new Promise((r) => setTimeout(r, 50));
		}
		const stepPauseMs = 5;
		worker = await startWorker(app, { TWOFOLD_WORKER_STEP_PAUSE_MS: String(stepPauseMs) });
		const ended = await waitForStatus(handle.db, runId, ENDED, 90_000);
		await Promise.all(followers.map((f) => f.done.catch(() => {})));
		await observer.close();
		await worker.stop();
		worker = null;

		const stored = await storedSteps(handle.db, runId);
		const latencies: number[] = [];
		let missed = 0;
		let viewersMissing = 0;
		let duplicates = 0;
		let reconnects = 0;
		for (const f of followers) {
			reconnects += f.connections - 1;
			const seen = new Set<number>();
			for (const e of f.events) {
				if (e.event !== 'residuals') continue;
				for (const p of e.data.points as { step: number }[]) {
					if (seen.has(p.step)) duplicates++;
					seen.add(p.step);
					const at = observer.storedAtMs.get(p.step);
					if (at !== undefined) latencies.push(e.receivedAtMs - at);
				}
			}
			const lost = stored.filter((s) => !seen.has(s)).length;
			missed += lost;
			if (lost) viewersMissing++;
		}
		const sse = {
			viewers: viewerCount,
			storeToViewerMs: stats(latencies),
			storedSteps: stored.length,
			stepsStampedByObserver: observer.storedAtMs.size,
			missedEvents: missed,
			viewersMissingEvents: viewersMissing,
			duplicateEvents: duplicates,
			reconnects,
			observerNotifyToReadMs: stats(observer.readDelayMs),
			run: { status: ended.status, steps: ended.steps, wallTimeS: round(ended.wallTimeS, 2), stepPauseMs },
			note:
				'latency per (viewer, residual step): arrival at the viewer − arrival of the NOTIFY after the commit that stored the step, as seen by a LISTEN connection of the bench; the worker writes rows every ~100 ms, so this excludes the solver → write delay; missed = stored steps a viewer never received; all 100 viewers share one session cookie'
		};

		// ---------------------------------------------------------------- burst of pages and API requests
		const roles: Role[] = ['viewer', 'analyst', 'lead', 'admin'];
		const tokens: string[] = [];
		for (let i = 0; i < concurrency; i++) {
			const role = roles[i % roles.length];
			const token = 'tf_' + randomBytes(32).toString('base64url');
			await handle.db.insert(apiTokens).values({
				teamId: t.team.id,
				userId: t.members[role].id,
				name: `bench ${i}`,
				prefix: token.slice(0, 10),
				tokenHash: createHash('sha256').update(token).digest('hex'),
				scope: 'role'
			});
			tokens.push(token);
		}
		const pageCookies = [viewer, analyst, lead].map(cookieOf);
		const pages = ['/', '/columns', `/columns/${column.id}`, `/cases/${caseRow.id}`, `/runs/${runId}`, '/studies'];
		const apiPaths = ['/api/v1/me', '/api/v1/columns', `/api/v1/columns/${column.id}`, `/api/v1/cases/${caseRow.id}`, `/api/v1/runs/${runId}`, '/api/v1/runs'];
		const pageMs: number[] = [];
		const apiMs: number[] = [];
		const allMs: number[] = [];
		const errors: Record<string, number> = {};
		let next = 0;
		let done = 0;
		let signInUnderLoadMs = NaN;
		let signInError: string | null = null;
		let signInAtRequest = 0;
		const signInAfter = Math.round(requestCount / 10);
		let signIn: Promise<void> = Promise.resolve();
		const burst0 = performance.now();
		const client = async (c: number) => {
			for (;;) {
				const i = next++;
				if (i >= requestCount) return;
				const isPage = i % 2 === 0;
				const path = isPage ? pages[(i / 2) % pages.length] : apiPaths[((i - 1) / 2) % apiPaths.length];
				const headers: Record<string, string> = isPage
					? { accept: 'text/html', cookie: pageCookies[c % pageCookies.length] }
					: { accept: 'application/json', authorization: `Bearer ${tokens[c]}` };
				const r0 = performance.now();
				try {
					const res = await fetch(new URL(path, baseUrl), { redirect: 'manual', headers });
					await res.arrayBuffer();
					if (res.status !== 200) errors[`HTTP ${res.status}`] = (errors[`HTTP ${res.status}`] ?? 0) + 1;
				} catch (e) {
					const k = (e as Error).message;
					errors[k] = (errors[k] ?? 0) + 1;
				}
				const ms = performance.now() - r0;
				(isPage ? pageMs : apiMs).push(ms);
				allMs.push(ms);
				done++;
				if (done === signInAfter) {
					// a member who has not signed in yet, while the other requests keep coming
					signInAtRequest = done;
					signIn = (async () => {
						const s0 = performance.now();
						try {
							await new TestClient(baseUrl).signIn(t.members.admin.email, t.members.admin.password);
							signInUnderLoadMs = performance.now() - s0;
						} catch (e) {
							signInError = (e as Error).message;
						}
					})();
				}
			}
		};
		await Promise.all(Array.from({ length: concurrency }, (_, c) => client(c)));
		const burstS = (performance.now() - burst0) / 1000;
		await signIn;
		const errorCount = Object.values(errors).reduce((a, b) => a + b, 0);
		const burst = {
			requests: requestCount,
			concurrentClients: concurrency,
			latencyMs: stats(allMs),
			pageLatencyMs: stats(pageMs),
			apiLatencyMs: stats(apiMs),
			throughputReqPerS: round(requestCount / burstS),
			wallTimeS: round(burstS, 2),
			errors: errorCount,
			errorsByKind: errors,
			signInDuringBurstMs: round(signInUnderLoadMs),
			signInDuringBurstError: signInError,
			signInStartedAfterRequests: signInAtRequest,
			signInIdleMs: round(idleSignInMs),
			note: `half pages (${pages.length} kinds, session cookies of viewer, analyst and lead), half /api/v1 GETs (${apiPaths.length} kinds, one token per client); each client sends its next request when the previous answer's body is read; sign-in = the password form POST through to its session cookie (argon2 verify)`
		};
		return { sseViewers: sse, burst };
	} finally {
		await worker?.kill().catch(() => {});
		await app?.stop().catch(() => {});
		const userIds = Object.values(t.members).map((m) => m.id);
		await handle.db.delete(teams).where(eq(teams.id, t.team.id));
		await handle.db.delete(users).where(inArray(users.id, userIds));
		await handle.close();
	}
}

// `npx tsx bench/load.ts` runs this benchmark alone (DATABASE_URL: a migrated database)
if (import.meta.url === `file://${process.argv[1]}`) {
	console.log(JSON.stringify(await benchLoad(), null, 2));
	process.exit(0);
}
