/**
 * A throw-away PostgreSQL cluster of its own (own port, own data folder under the system temp dir)
 * for tests that stop, restart or cut off the database: the shared cluster the other tests use is
 * never touched. Built with `scripts/pg.mjs` (same binaries, same settings), then driven with
 * `pg_ctl` on its own data folder only.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import * as pg from '../../scripts/pg.mjs';
import { freePort } from './app.js';

export interface PrivateCluster {
	port: number;
	dataDir: string;
	url(database: string, host?: string): string;
	/** fast shutdown: every session is ended, as in a restart of the server */
	stop(): void;
	start(): void;
	/** stops it for good and deletes its data folder */
	destroy(): void;
}

const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

function pgCtl(args: string[]): void {
	const bin = pg.status().binDir;
	if (!bin) throw new Error('PostgreSQL binaries not found');
	const exe = path.join(bin, 'pg_ctl');
	const [cmd, full] = isRoot ? ['runuser', ['-u', 'postgres', '--', exe, ...args]] : [exe, args];
	const r = spawnSync(cmd, full, { encoding: 'utf8', cwd: os.tmpdir() });
	if (r.status !== 0) throw new Error(`pg_ctl ${args.join(' ')} failed (${r.status}):\n${r.stdout}${r.stderr}`);
}

/**
 * Creates and starts the cluster with `databases`. `listen` adds addresses to 127.0.0.1 and
 * `hba` lines to pg_hba.conf (e.g. a test network's subnet).
 */
export async function startPrivateCluster(o: { databases: string[]; listen?: string[]; hba?: string[] }): Promise<PrivateCluster> {
	const port = await freePort();
	const dataDir = path.join(os.tmpdir(), `twofold-private-pg-${randomBytes(4).toString('hex')}`);
	const saved = { port: process.env.TWOFOLD_PG_PORT, data: process.env.TWOFOLD_PG_DATA };
	// pg.mjs reads where its cluster lives from these, at every call: set them around its calls only
	const withEnv = async <T>(fn: () => Promise<T> | T): Promise<T> => {
		process.env.TWOFOLD_PG_PORT = String(port);
		process.env.TWOFOLD_PG_DATA = dataDir;
		try {
			return await fn();
		} finally {
			if (saved.port === undefined) delete process.env.TWOFOLD_PG_PORT;
			else process.env.TWOFOLD_PG_PORT = saved.port;
			if (saved.data === undefined) delete process.env.TWOFOLD_PG_DATA;
			else process.env.TWOFOLD_PG_DATA = saved.data;
		}
	};
	await withEnv(() => pg.start({ databases: o.databases }));
	const stop = () => pgCtl(['-D', dataDir, '-m', 'fast', '-w', 'stop']);
	const start = () => pgCtl(['-D', dataDir, '-l', path.join(dataDir, 'server.log'), '-w', '-t', '60', '-o', `-p ${port}`, 'start']);
	if (o.listen?.length || o.hba?.length) {
		if (o.listen?.length) fs.appendFileSync(path.join(dataDir, 'postgresql.conf'), `\nlisten_addresses = '${['127.0.0.1', ...o.listen].join(',')}'\n`);
		if (o.hba?.length) fs.appendFileSync(path.join(dataDir, 'pg_hba.conf'), `\n${o.hba.join('\n')}\n`);
		stop();
		start();
	}
	let gone = false;
	return {
		port,
		dataDir,
		url: (database, host = '127.0.0.1') => `postgres://${pg.PG_USER}:${pg.PG_PASSWORD}@${host}:${port}/${database}`,
		stop,
		start,
		destroy() {
			if (gone) return;
			gone = true;
			try {
				stop();
			} catch {
				// already stopped
			}
			fs.rmSync(dataDir, { recursive: true, force: true });
			fs.rmSync(`${dataDir}.lock`, { force: true });
		}
	};
}
