/**
 * Where the tests find their database. `npm test` sets DATABASE_URL to a freshly created
 * `twofold_test`; a direct `npx vitest run …` falls back to the same database on the private cluster.
 */
import * as pg from '../../scripts/pg.mjs';
import { migrateDatabase } from '../../scripts/migrate.mjs';

export function testDatabaseUrl(): string {
	return process.env.DATABASE_URL ?? (pg.databaseUrl('twofold_test') as string);
}

let prepared: Promise<void> | null = null;

/**
 * Makes sure the cluster runs and the test database exists and is migrated. Cheap when it already
 * is (about half a second), so every integration test file may call it in `beforeAll`.
 */
export function prepareTestDatabase(): Promise<void> {
	prepared ??= (async () => {
		if (!process.env.DATABASE_URL) await pg.start({ databases: ['twofold_test'] });
		await migrateDatabase({ url: testDatabaseUrl() });
	})();
	return prepared;
}
