import { createDb, type DbHandle } from '../../src/lib/server/db/index.js';
import { testDatabaseUrl, prepareTestDatabase } from './env.js';

/** A database handle on the test database (migrated). Close it in `afterAll`. */
export async function openTestDb(): Promise<DbHandle> {
	await prepareTestDatabase();
	return createDb({ url: testDatabaseUrl(), max: 4, applicationName: 'twofold-tests' });
}
