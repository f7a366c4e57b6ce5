/**
 * Benchmark of studies on several workers (figures, not assertions), against the database of
 * DATABASE_URL (`npm run bench` sets it up):
 *
 * - a 24-member sweep of the reference case (superficial gas velocity 0.01–0.12 m/s) on 2 worker
 *   processes with 1 slot each: study wall time (first queued → last finished, PostgreSQL's clock)
 *   against the ideal (sum of the members' own wall times) / 2. Aim: at most 1.15. The members'
 *   wall times are measured by the workers while both run, so the ratio is the overhead of the
 *   fan-out (claims, writes, idle gaps), not of a loaded machine;
 * - with 200 members queued (a 20 × 10 sweep of the small case): each member's queue-to-start
 *   (mostly waiting its turn), the dispatch gap (a slot's previous member ended → the next started
 *   on the same worker), and the queue-to-start of one single run queued behind the 200.
 *
 * Everything it creates lives in a throw-away team that is deleted at the end.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { eq } from 'drizzle-orm';
import { createDb, DEFAULT_DATABASE_URL, type DbHandle } from '../src/lib/server/db/index.js';
import { cases, columns, runs, teams, users } from '../src/lib/server/db/schema.js';
import * as commands from '../src/lib/server/runs/commands.js';
import { createStudy } from '../src/lib/server/studies/commands.js';
import { createBoss, ensureQueue } from '../src/lib/server/runs/jobs.js';
import { defaultCase, type CaseDocument } from '../solver/index.js';

import { round, stats } from './stats.js';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');


function startWorker(url: string, host: string): Promise<ChildProcess> {
	const child = spawn(process.execPath, ['--import', 'tsx', 'worker/index.ts'], {
		cwd: ROOT,
		env: { ...process.env, DATABASE_URL: url, TWOFOLD_WORKER_SLOTS: '1', TWOFOLD_WORKER_HOST: host, SMTP_PORT: process.env.SMTP_PORT ?? '1' },
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let log = '';
	child.stdout?.on('data', (d) => (log += d));
	child.stderr?.on('data', (d) => (log += d));
	return new Promise((resolve, reject) => {
		const t0 = Date.now();
		const tick = setInterval(() => {
			if (log.includes('working solve-run')) {
				clearInterval(tick);
				resolve(child);
			} else if (child.exitCode !== null || Date.now() - t0 > 60_000) {
				clearInterval(tick);
				reject(new Error(`bench worker did not start:\n${log}`));
			}
		}, 50);
	});
}

async function waitStudy(handle: DbHandle, studyId: string) {
	for (;;) {
		const rows = await handle.db.select().from(runs).where(eq(runs.studyId, studyId));
		if (rows.every((r) => !['queued', 'running'].includes(r.status))) return rows;
		await new Promise((r) => setTimeout(r, 100));
	}
}

export async function benchStudy(options: { url?: string } = {}): Promise<Record<string, unknown>> {
	const url = options.url ?? process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL;
	const handle = createDb({ url, max: 6, applicationName: 'twofold-bench' });
	const boss = createBoss({ url, role: 'app' });
	boss.on('error', () => {});
	await boss.start();
	await ensureQueue(boss);
	const suffix = randomBytes(4).toString('hex');
	const [team] = await handle.db.insert(teams).values({ name: `Bench ${suffix}`, slug: `bench-${suffix}`, maxActiveRuns: 100, maxStudyRuns: 300 }).returning();
	const [user] = await handle.db.insert(users).values({ email: `bench-${suffix}@bench.invalid`, name: 'bench' }).returning();
	const [column] = await handle.db.insert(columns).values({ teamId: team.id, tag: 'B-2', diameterM: 0.2, heightM: 2 }).returning();
	const storeCase = async (doc: CaseDocument) =>
		(await handle.db.insert(cases).values({ teamId: team.id, columnId: column.id, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc }).returning())[0].id;
	const workers: ChildProcess[] = [];
	try {
		workers.push(...(await Promise.all([startWorker(url, 'bench-a'), startWorker(url, 'bench-b')])));

		// ---------------------------------------------------------------- 24-member sweep, 2 × 1 slot
		const reference = defaultCase('height-profile');
		reference.name = 'bench reference';
		const refId = await storeCase(reference);
		const sweep = await createStudy({
			handle,
			boss,
			teamId: team.id,
			userId: user.id,
			input: { caseId: refId, name: 'bench sweep', spec: { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'linear', from: 0.01, to: 0.12, count: 24 }] } }
		});
		const members = await waitStudy(handle, sweep.study.id);
		const first = Math.min(...members.map((m) => m.queuedAt.getTime()));
		const last = Math.max(...members.map((m) => m.finishedAt?.getTime() ?? 0));
		const wallS = (last - first) / 1000;
		const sumS = members.reduce((s, m) => s + m.wallTimeS, 0);
		const perHost = new Map<string, number>();
		for (const m of members) perHost.set((m.workerId ?? '?').split(':')[0], (perHost.get((m.workerId ?? '?').split(':')[0]) ?? 0) + 1);

		// ---------------------------------------------------------------- 200 members queued
		const small = defaultCase('height-profile');
		small.name = 'bench small';
		small.geometry.heightM = 1;
		small.geometry.clearLiquidLevelM = 0.7;
		small.numerics.cells = 40;
		const smallId = await storeCase(small);
		const big = await createStudy({
			handle,
			boss,
			teamId: team.id,
			userId: user.id,
			input: {
				caseId: smallId,
				name: 'bench 200',
				spec: {
					kind: 'sweep',
					axes: [
						{ input: 'superficialGasVelocityMS', spacing: 'linear', from: 0.01, to: 0.1, count: 20 },
						{ input: 'bubbleDiameterM', spacing: 'list', values: [0.003, 0.0035, 0.004, 0.0045, 0.005, 0.0055, 0.006, 0.0065, 0.007, 0.0075] }
					]
				}
			}
		});
		await new Promise((r) => setTimeout(r, 500));
		const single = await commands.queue({ handle, boss, teamId: team.id, caseId: smallId, userId: user.id });
		const bigMembers = await waitStudy(handle, big.study.id);
		const [singleRow] = await handle.db.select().from(runs).where(eq(runs.id, single.id));
		const queueToStart = bigMembers.filter((m) => m.startedAt).map((m) => m.startedAt!.getTime() - m.queuedAt.getTime());
		const gaps: number[] = [];
		const byWorker = new Map<string, typeof bigMembers>();
		for (const m of bigMembers) if (m.workerId && m.startedAt && m.finishedAt) byWorker.set(m.workerId, [...(byWorker.get(m.workerId) ?? []), m]);
		for (const list of byWorker.values()) {
			list.sort((a, b) => a.startedAt!.getTime() - b.startedAt!.getTime());
			for (let i = 1; i < list.length; i++) gaps.push(list[i].startedAt!.getTime() - list[i - 1].finishedAt!.getTime());
		}
		return {
			sweep24: {
				members: members.length,
				converged: members.filter((m) => m.status === 'converged').length,
				perHost: Object.fromEntries(perHost),
				wallTimeS: round(wallS, 2),
				sumOfMemberWallTimesS: round(sumS, 2),
				idealS: round(sumS / 2, 2),
				ratio: round(wallS / (sumS / 2), 3),
				aim: 1.15
			},
			queued200: {
				members: bigMembers.length,
				memberQueueToStartMs: stats(queueToStart),
				dispatchGapMs: stats(gaps),
				singleRunBehind200QueueToStartMs: singleRow.startedAt ? singleRow.startedAt.getTime() - singleRow.queuedAt.getTime() : null
			}
		};
	} finally {
		await Promise.all(
			workers.map(
				(w) =>
					new Promise((r) => {
						w.once('exit', r);
						w.kill('SIGTERM');
					})
			)
		);
		await handle.db.delete(teams).where(eq(teams.id, team.id));
		await handle.db.delete(users).where(eq(users.id, user.id));
		await boss.stop({ graceful: false, wait: false }).catch(() => {});
		await handle.close();
	}
}
