/**
 * The app process's one database pool (SvelteKit side). Reads DATABASE_URL from `process.env`
 * (adapter-node passes the environment through); the default is the local private cluster.
 */
import { createDb } from './index.js';

const handle = createDb({ applicationName: 'twofold-app' });

export const db = handle.db;
export const pool = handle.pool;

// an idle pool keeps the process alive after SIGTERM: end it on shutdown
process.on('sveltekit:shutdown', () => {
	void handle.close();
});
