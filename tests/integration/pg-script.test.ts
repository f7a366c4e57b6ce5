/** scripts/pg.mjs against the running private cluster: a second start is a no-op, odd names are refused. */
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { prepareTestDatabase, testDatabaseUrl } from '../helpers/env.js';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const port = new URL(testDatabaseUrl()).port;

function pg(...args: string[]) {
	return spawnSync(process.execPath, ['scripts/pg.mjs', ...args], {
		cwd: root,
		encoding: 'utf8',
		env: { ...process.env, TWOFOLD_PG_PORT: port }
	});
}

beforeAll(async () => {
	await prepareTestDatabase();
});

describe('scripts/pg.mjs', () => {
	it('reports the running cluster with its port', () => {
		const r = pg('status');
		expect(r.status).toBe(0);
		const s = JSON.parse(r.stdout);
		expect(s.running).toBe(true);
		expect(String(s.port)).toBe(port);
	});

	it('does nothing on a second start: no new cluster, no restart, database already there', () => {
		const r = pg('start', '--database', new URL(testDatabaseUrl()).pathname.slice(1));
		expect(r.status).toBe(0);
		expect(r.stderr).toMatch(/ready in/);
		expect(r.stderr).not.toMatch(/creating cluster|starting on|created database/);
	});

	it('refuses a database name that is not a plain identifier', () => {
		const r = pg('start', '--database', 'x;drop database twofold');
		expect(r.status).toBe(1);
		expect(r.stderr).toContain('not a plain database name');
	});
});
