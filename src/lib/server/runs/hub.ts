/**
 * The app process's single LISTEN connection on the run channel, fanned out in process to every
 * server-sent-event stream of the run named in the payload. A NOTIFY is only a wake-up: the
 * streams read what is new from the tables, so a lost or merged notification loses nothing.
 */
import pg from 'pg';
import { RUN_CHANNEL } from './jobs.js';

/** Called with the run's wake number, which grows with every NOTIFY of that run (and reconnect). */
export type RunListener = (wake: number) => void;

export interface RunHub {
	/** Call `listener` whenever the run may have news; returns the unsubscribe function. */
	subscribe(runId: string, listener: RunListener): () => void;
	/** resolves once the LISTEN is in place (streams opened before then catch up on connect) */
	ready(): Promise<void>;
	close(): Promise<void>;
}

export function createRunHub(options: { url: string; reconnectDelayMs?: number; log?: (msg: string) => void }): RunHub {
	const listeners = new Map<string, Set<RunListener>>();
	const wakes = new Map<string, number>();
	const wakeRun = (runId: string) => {
		const set = listeners.get(runId);
		if (!set) return;
		const n = (wakes.get(runId) ?? 0) + 1;
		wakes.set(runId, n);
		for (const l of set) l(n);
	};
	const log = options.log ?? ((msg: string) => console.error(`[runs-hub] ${msg}`));
	let client: pg.Client | null = null;
	let connecting: Promise<void> | null = null;
	let closed = false;

	const wakeAll = () => {
		for (const runId of listeners.keys()) wakeRun(runId);
	};

	const connect = (): Promise<void> => {
		if (connecting) return connecting;
		connecting = (async () => {
			const c = new pg.Client({ connectionString: options.url, application_name: 'twofold-app-listen' });
			c.on('notification', (msg) => {
				if (msg.channel !== RUN_CHANNEL || !msg.payload) return;
				wakeRun(msg.payload);
			});
			c.on('error', (e) => {
				log(`LISTEN connection lost: ${e.message}`);
				dropAndRetry(c);
			});
			c.on('end', () => dropAndRetry(c));
			try {
				await c.connect();
				await c.query(`LISTEN ${RUN_CHANNEL}`);
			} catch (e) {
				await c.end().catch(() => {});
				connecting = null;
				throw e;
			}
			client = c;
			// a stream may have missed news while there was no connection: let every stream re-read
			wakeAll();
		})();
		return connecting;
	};

	let retryTimer: NodeJS.Timeout | null = null;
	const scheduleReconnect = () => {
		if (closed || retryTimer || client || connecting || listeners.size === 0) return;
		retryTimer = setTimeout(() => {
			retryTimer = null;
			connect().catch((e) => {
				log(`reconnect failed: ${e.message}`);
				scheduleReconnect();
			});
		}, options.reconnectDelayMs ?? 1000);
		retryTimer.unref();
	};

	const dropAndRetry = (c: pg.Client) => {
		if (client !== c) return;
		client = null;
		connecting = null;
		c.end().catch(() => {});
		scheduleReconnect();
	};

	return {
		subscribe(runId, listener) {
			if (closed) throw new Error('The run hub is closed');
			let set = listeners.get(runId);
			if (!set) listeners.set(runId, (set = new Set()));
			set.add(listener);
			if (!client && !connecting) {
				connect().catch((e) => {
					log(`connect failed: ${e.message}`);
					scheduleReconnect();
				});
			}
			return () => {
				set.delete(listener);
				if (set.size === 0) {
					listeners.delete(runId);
					wakes.delete(runId);
				}
			};
		},
		async ready() {
			if (client) return;
			await connect();
		},
		async close() {
			closed = true;
			listeners.clear();
			if (retryTimer) clearTimeout(retryTimer);
			const c = client;
			client = null;
			if (c) await c.end().catch(() => {});
		}
	};
}
