/**
 * The app process's side of runs: its pg-boss sender (started on first use, no maintenance) and
 * its one LISTEN hub, both closed on SvelteKit's shutdown. Module singletons kept on `globalThis`
 * so that dev-server reloads do not open a second LISTEN connection.
 */
import type PgBoss from 'pg-boss';
import { db, pool } from '../db/app.js';
import { DEFAULT_DATABASE_URL, type DbHandle } from '../db/index.js';
import { createBoss, ensureQueue } from './jobs.js';
import { createRunHub, type RunHub } from './hub.js';

interface AppRuns {
	boss: Promise<PgBoss> | null;
	hub: RunHub | null;
}

const key = Symbol.for('twofold.runs.app');
const state: AppRuns = ((globalThis as Record<symbol, AppRuns>)[key] ??= { boss: null, hub: null });

const url = () => process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL;

/** The app's database handle (the one pool of `db/app.ts`). */
export const appHandle: DbHandle = { db, pool, close: async () => {} };

export function appBoss(): Promise<PgBoss> {
	state.boss ??= (async () => {
		const boss = createBoss({ url: url(), role: 'app' });
		boss.on('error', (e) => console.error('[runs] pg-boss:', e.message));
		await boss.start();
		await ensureQueue(boss);
		return boss;
	})().catch((e) => {
		state.boss = null;
		throw e;
	});
	return state.boss;
}

export function appHub(): RunHub {
	state.hub ??= createRunHub({ url: url() });
	return state.hub;
}

process.on('sveltekit:shutdown', () => {
	const { boss, hub } = state;
	state.boss = null;
	state.hub = null;
	void hub?.close();
	void boss?.then((b) => b.stop({ graceful: false, wait: false })).catch(() => {});
});
