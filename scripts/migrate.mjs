#!/usr/bin/env node
// @ts-nocheck -- plain JavaScript run before any install; svelte-check would demand JSDoc types
/**
 * Applies the committed SQL migrations in `drizzle/` to DATABASE_URL with drizzle-orm's runtime
 * migrator. An advisory lock makes concurrent starts (app, worker, tests) take turns.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
// any constant shared by every Twofold process; 0x7477 = "tw"
const MIGRATION_LOCK_KEY = 0x7477_0001;

export async function migrateDatabase({ url }) {
	const client = new pg.Client({ connectionString: url, application_name: 'twofold-migrate' });
	await client.connect();
	try {
		// the NOTICEs of "create schema if not exists" are noise here
		client.on('notice', () => {});
		await client.query('select pg_advisory_lock($1)', [MIGRATION_LOCK_KEY]);
		await migrate(drizzle(client), { migrationsFolder: path.join(root, 'drizzle') });
	} finally {
		await client.query('select pg_advisory_unlock($1)', [MIGRATION_LOCK_KEY]).catch(() => {});
		await client.end();
	}
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
	const url = process.env.DATABASE_URL;
	if (!url) {
		console.error('[migrate] DATABASE_URL is not set');
		process.exit(1);
	}
	const t0 = Date.now();
	migrateDatabase({ url }).then(
		() => console.error(`[migrate] up to date in ${((Date.now() - t0) / 1000).toFixed(1)} s`),
		(e) => {
			console.error(`[migrate] failed: ${e.message}`);
			process.exit(1);
		}
	);
}
