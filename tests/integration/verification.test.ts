/**
 * The verification page end to end: the built app queues the verification when the page is opened, a
 * real worker process computes it on its own thread and stores it per solver version, and the page and
 * the printable comparison report show it. A second app and worker filed under another version name
 * (`TWOFOLD_TEST_VERIFY_VERSION`, read only under `TWOFOLD_TEST=1`) stand for an upgrade: opening the page
 * there computes the verification again, while the first version's results stay as they were.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import { startApp, type RunningApp } from '../helpers/app.js';
import { openTestDb } from '../helpers/db.js';
import { signedInClient, type TestClient } from '../helpers/http.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';
import { startWorker, waitFor, type WorkerProcess } from '../helpers/workers.js';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { verificationResults } from '../../src/lib/server/db/schema.js';
import { SOLVER_VERSION } from '../../solver/version.js';
import { defaultCase } from '../../solver/case.js';
import { verificationCases } from '../../solver/verification/index.js';
import type { VerificationResult } from '../../solver/verification/types.js';
import type { VerificationStatus } from '../../src/lib/server/verification/index.js';
import { orderText, verificationQuantity } from '../../src/lib/verification.js';

const NEXT = `${SOLVER_VERSION}-next-test`;
const OLD = 'old-0.9-test';

let handle: DbHandle;
let team: TestTeam;
let app: RunningApp;
let app2: RunningApp | null = null;
const workers: WorkerProcess[] = [];
let viewer: TestClient;

const workerIdOf = (w: WorkerProcess) => /\[worker ([^\]]+)\]/.exec(w.output())?.[1] ?? '';
const row = async (version: string) => (await handle.db.select().from(verificationResults).where(eq(verificationResults.solverVersion, version)))[0] ?? null;

async function status(client: TestClient): Promise<VerificationStatus | null> {
	const res = await client.get('/verification/status', { accept: 'application/json' });
	expect(res.status).toBe(200);
	return ((await res.json()) as { verification: VerificationStatus | null }).verification;
}

/** Server-rendered HTML to its text: no comments, tags as spaces, entities of the report decoded, spaces collapsed. */
const textOf = (html: string) =>
	html
		.replace(/<!--[\s\S]*?-->/g, '')
		.replace(/<[^>]+>/g, ' ')
		.replace(/&amp;/g, '&')
		.replace(/&lt;/g, '<')
		.replace(/&gt;/g, '>')
		.replace(/&#39;|&apos;/g, "'")
		.replace(/&quot;/g, '"')
		.replace(/\s+/g, ' ')
		.trim();
const cellsOf = (rowHtml: string) => [...rowHtml.matchAll(/<td[^>]*>([\s\S]*?)<\/td>/g)].map((m) => textOf(m[1]));
/** The report's verification section (up to the end of the report). */
function sectionOf(html: string): string {
	const at = html.indexOf('data-testid="report-verification"');
	expect(at, 'the verification section').toBeGreaterThan(-1);
	return html.slice(html.lastIndexOf('<section', at), html.indexOf('</section>', at));
}
/** One solver version's part of that section. */
function versionBlock(section: string, version: string): string {
	const parts = section.split('data-testid="report-verification-version"').slice(1);
	const part = parts.find((p) => p.includes(`data-version="${version}"`));
	expect(part, `the part of solver ${version}`).toBeDefined();
	return part!;
}

/**
 * A comparison of one converged run per solver version (a column, a case and a run each, written as the worker
 * would leave them) and its printable report's verification section, read by the viewer.
 */
async function reportSectionOfVersions(versions: string[], what: string): Promise<string> {
	const { pool } = handle;
	const tag = `${what}-${Date.now().toString(36)}`;
	const { rows: col } = await pool.query(`insert into columns (team_id, tag, service, diameter_m, height_m) values ($1, $2, $3, 0.2, 2) returning id`, [team.team.id, tag, `verification ${what} test`]);
	const runIds: string[] = [];
	for (const version of versions) {
		const doc = defaultCase();
		doc.name = `case of ${version}`;
		const { rows: c } = await pool.query(`insert into cases (team_id, column_id, name, kind, schema_version, document) values ($1, $2, $3, 'height-profile', $4, $5) returning id`, [
			team.team.id,
			col[0].id,
			doc.name,
			doc.schemaVersion,
			JSON.stringify(doc)
		]);
		const summary = { kind: 'height-profile', status: 'converged', design: { overallHoldup: { value: 0.12, unit: '1', label: 'Overall gas holdup of the aerated region' } } };
		const { rows: r } = await pool.query(
			`insert into runs (team_id, column_id, case_id, case_document, solver_version, status, summary) values ($1, $2, $3, $4, $5, 'converged', $6) returning id`,
			[team.team.id, col[0].id, c[0].id, JSON.stringify(doc), version, JSON.stringify(summary)]
		);
		runIds.push(r[0].id);
	}
	const { rows: cmp } = await pool.query(`insert into comparisons (team_id, column_id, name, run_ids, baseline_run_id) values ($1, $2, $3, $4, $5) returning id`, [
		team.team.id,
		col[0].id,
		`Versions on ${tag}`,
		JSON.stringify(runIds),
		runIds[0]
	]);
	const res = await viewer.get(`/compare/${cmp[0].id}/report`);
	expect(res.status).toBe(200);
	return sectionOf(await res.text());
}

/** Poll the status endpoint as the page does until the verification ends; the progress values seen. */
async function untilEnded(client: TestClient, what: string): Promise<number[]> {
	const seen: number[] = [];
	await waitFor(
		async () => {
			const s = await status(client);
			if (s) seen.push(s.progress);
			return s && (s.status === 'done' || s.status === 'failed');
		},
		{ timeoutMs: 120_000, everyMs: 200, what }
	);
	return seen;
}

beforeAll(async () => {
	handle = await openTestDb();
	team = await createTestTeam({ db: handle.db });
	// results are per solver version, not per team: start from none for the versions used here
	await handle.db.delete(verificationResults).where(inArray(verificationResults.solverVersion, [SOLVER_VERSION, NEXT, OLD]));
	app = await startApp();
	workers.push(await startWorker(app));
	viewer = await signedInClient(app.baseUrl, team.members.viewer);
}, 180_000);

afterAll(async () => {
	for (const w of workers) await w.stop();
	await app2?.stop();
	await app?.stop();
	await handle?.close();
});

describe('the verification page', () => {
	it('lists every case with a finite error and the faucet’s observed order, computed by a worker of this solver version', async () => {
		const page = await viewer.get('/verification');
		expect(page.status).toBe(200);
		// opening the page queued it, row and job together
		const queued = await row(SOLVER_VERSION);
		expect(queued?.status).toMatch(/queued|computing|done/);
		const seen = await untilEnded(viewer, 'the verification of this solver version');
		expect(seen.every((p) => p >= 0 && p <= 1)).toBe(true);

		const done = (await row(SOLVER_VERSION))!;
		expect(done.status, done.errorMessage ?? '').toBe('done');
		expect(done.workerId).toBe(workerIdOf(workers[0]));
		expect(done.progress).toBe(1);
		expect(done.finishedAt).not.toBeNull();
		const results = done.results as VerificationResult[];
		expect(results.map((r) => r.id)).toEqual(verificationCases.map((c) => c.id));
		for (const r of results) {
			expect(r.failure, r.id).toBeUndefined();
			expect(Number.isFinite(r.error), `${r.id}: error ${r.error}`).toBe(true);
			expect(r.passed, `${r.id}: ${r.error} ${r.errorUnit} against ${r.tolerance}`).toBe(true);
		}
		const faucet = results.find((r) => r.id === 'faucet-transient')!;
		// first-order upwinding: order ½ at the void front, 1 in the smooth part (Ransom 1987; PHYSICS §11.1)
		expect(faucet.order!.cells).toEqual([48, 96, 192]);
		expect(faucet.order!.observed).toBeGreaterThan(0.4);
		expect(faucet.order!.observed).toBeLessThan(1.0);
		expect(workers[0].output()).toMatch(new RegExp(`verified solver ${SOLVER_VERSION.replace(/\./g, '\\.')} in [\\d.]+ s: ${results.length} of ${results.length} cases pass`));

		const html = await (await viewer.get('/verification')).text();
		expect(html).toContain('Computed on');
		expect(html).toContain(`data-testid="verification-version">${SOLVER_VERSION}<`);
		for (const r of results) {
			expect(html).toContain(`data-testid="case-${r.id}"`);
			const m = new RegExp(`data-testid="error-${r.id}" data-value="([^"]+)"`).exec(html);
			expect(m, `error cell of ${r.id}`).not.toBeNull();
			expect(Number.isFinite(Number(m![1]))).toBe(true);
		}
		expect(new RegExp(`data-testid="order-faucet-transient">0\\.\\d+<`).test(html)).toBe(true);
		// a done row is not queued again by the next visit
		expect((await row(SOLVER_VERSION))!.queuedAt.getTime()).toBe(done.queuedAt.getTime());
	}, 180_000);

	it('computes the verification again when the solver version changes, and again after a failed attempt', async () => {
		const before = (await row(SOLVER_VERSION))!;
		app2 = await startApp({ env: { TWOFOLD_TEST_VERIFY_VERSION: NEXT } });
		const next = await startWorker(app2, { TWOFOLD_TEST: '1', TWOFOLD_TEST_VERIFY_VERSION: NEXT });
		workers.push(next);
		const viewer2 = await signedInClient(app2.baseUrl, team.members.viewer);
		expect((await status(viewer2))).toBeNull();

		expect((await viewer2.get('/verification')).status).toBe(200);
		await untilEnded(viewer2, 'the verification of the next version');
		const computed = (await row(NEXT))!;
		expect(computed.status, computed.errorMessage ?? '').toBe('done');
		// the worker of that version computed it: the first worker works only its own version's queue
		expect(computed.workerId).toBe(workerIdOf(next));
		expect((computed.results as VerificationResult[]).length).toBe(verificationCases.length);
		expect(await (await viewer2.get('/verification')).text()).toContain(`data-testid="verification-version">${NEXT}<`);
		// the first version's results are kept as they were
		const after = (await row(SOLVER_VERSION))!;
		expect(after.finishedAt?.getTime()).toBe(before.finishedAt?.getTime());
		expect(await (await viewer.get('/verification')).text()).toContain(`data-testid="verification-version">${SOLVER_VERSION}<`);

		// a failed attempt is shown with its message, and the next visit queues a new one
		await handle.db.update(verificationResults).set({ status: 'failed', errorMessage: 'simulated failure of the thread', results: null }).where(eq(verificationResults.solverVersion, NEXT));
		const failedStatus = await status(viewer2);
		expect(failedStatus?.status).toBe('failed');
		expect(failedStatus?.errorMessage).toBe('simulated failure of the thread');
		const again = await (await viewer2.get('/verification')).text();
		expect(again).toContain('The last attempt failed');
		await untilEnded(viewer2, 'the verification after the failure');
		const recomputed = (await row(NEXT))!;
		expect(recomputed.status).toBe('done');
		expect(recomputed.errorMessage).toBeNull();
		expect(recomputed.queuedAt.getTime()).toBeGreaterThan(computed.queuedAt.getTime());
	}, 240_000);

	it('shows the cached verification of the runs’ solver version on the printable report, and says plainly when a version has none', async () => {
		const section = await reportSectionOfVersions([SOLVER_VERSION, OLD], 'VER');
		expect(textOf(section)).toMatch(/^Verification of the solver /);
		expect(section).toContain('href="/verification"');

		// this version: every cached case, with the numbers of its stored row, formatted as on the verification page
		const cached = (await row(SOLVER_VERSION))!;
		expect(cached.status).toBe('done');
		const results = cached.results as VerificationResult[];
		const done = versionBlock(section, SOLVER_VERSION);
		expect(done).toContain('data-status="done"');
		const doneText = textOf(done);
		expect(doneText).toMatch(/Computed \d{1,2} \w{3} \d{4}, \d\d:\d\d UTC/);
		expect(doneText).toContain(`${results.length} of ${results.length} cases pass`);
		const rows = [...done.matchAll(/<tr[^>]*data-case="([^"]+)"[^>]*>([\s\S]*?)<\/tr>/g)].map((m) => ({ id: m[1], cells: cellsOf(m[2]) }));
		expect(rows.map((r) => r.id)).toEqual(results.map((r) => r.id));
		for (const r of results) {
			const cells = rows.find((x) => x.id === r.id)!.cells;
			expect(cells, r.id).toEqual([r.title, r.reference, verificationQuantity(r.error, r.errorUnit), `≤ ${verificationQuantity(r.tolerance, r.errorUnit)}`, r.passed ? 'pass' : 'fail', orderText(r.order?.observed)]);
			expect(cells[2], `${r.id}: a finite error with its unit`).toMatch(/^\d[\d.e−-]*( (%|mm))?$/);
		}
		const faucet = rows.find((x) => x.id === 'faucet-transient')!.cells;
		expect(Number(faucet[5])).toBeGreaterThan(0.4);
		// a relative error carries its per cent
		expect(rows.find((x) => x.id === 'column-at-rest')!.cells[2]).toMatch(/ %$/);
		// a case without a grid sequence shows no order
		expect(rows.find((x) => x.id === 'column-at-rest')!.cells[5]).toBe('—');

		// a version with nothing cached: said plainly, with the link, not left out
		const none = versionBlock(section, OLD);
		expect(none).toContain('data-status="none"');
		expect(none).not.toContain('data-case=');
		expect(textOf(none)).toContain(`Not yet computed for solver ${OLD} — open the verification page`);
		expect(none).toContain('href="/verification"');
		// the report never queues a verification itself
		expect(await row(OLD)).toBeNull();
	}, 60_000);
	it('says on the printable report when a version’s verification failed, is being computed or waits for a worker', async () => {
		const { pool } = handle;
		const tag = `VST-${Date.now().toString(36)}`;
		// versions no worker of this suite runs, with their rows in each unfinished state
		const states = [
			{ version: `failed-${tag}`, status: 'failed', progress: 0.4, error: 'the worker stopped: out of memory', finished: true },
			{ version: `computing-${tag}`, status: 'computing', progress: 0.62, error: null, finished: false },
			{ version: `queued-${tag}`, status: 'queued', progress: 0, error: null, finished: false }
		];
		for (const st of states) {
			await pool.query(
				`insert into verification_results (solver_version, status, progress, error_message, started_at, finished_at) values ($1, $2, $3, $4, now() - interval '1 minute', $5)`,
				[st.version, st.status, st.progress, st.error, st.finished ? new Date('2026-11-30T10:15:00Z') : null]
			);
		}
		const section = await reportSectionOfVersions(states.map((st) => st.version), 'VST');

		const failed = versionBlock(section, states[0].version);
		expect(failed).toContain('data-status="failed"');
		expect(failed).not.toContain('data-case=');
		expect(textOf(failed)).toContain(`Could not be computed for solver ${states[0].version} (30 Nov 2026, 10:15 UTC): the worker stopped: out of memory — open the verification page`);
		expect(textOf(failed)).toContain('to try again');

		const computing = versionBlock(section, states[1].version);
		expect(computing).toContain('data-status="computing"');
		// (textOf turns the version's closing tag into a space before the colon)
		expect(textOf(computing)).toMatch(new RegExp(`Not yet computed for solver ${states[1].version} ?: a worker is computing it \\(62 %\\) — open the verification page`));

		const queued = versionBlock(section, states[2].version);
		expect(queued).toContain('data-status="queued"');
		expect(textOf(queued)).toMatch(new RegExp(`Not yet computed for solver ${states[2].version} ?: queued for a worker — open the verification page`));
		for (const block of [failed, computing, queued]) expect(block).toContain('href="/verification"');

		// reading the report changes none of the rows
		for (const st of states) {
			const r = (await row(st.version))!;
			expect([r.status, r.progress, r.errorMessage]).toEqual([st.status, st.progress, st.error]);
		}
	}, 60_000);
});
