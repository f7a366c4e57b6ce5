/**
 * Server-sent events of one run: residual points, progress, the latest snapshot's id and status
 * changes, each stream reading what is new from the tables whenever the hub wakes it.
 *
 * Event ids are a cursor `<step>.<snapshotId>.<statusKey>`: the last residual step sent, the id of
 * the last snapshot announced, and the status position (see `statusKey`). Every part only grows,
 * so the ids are monotonic per run, and a client that reconnects with `Last-Event-ID` (or opens
 * `?after=<cursor>` after loading the history) receives exactly what it has not seen.
 */
import { and, asc, desc, eq, gt, sql } from 'drizzle-orm';
import type { Db } from '../db/index.js';
import { residuals, runs, snapshots } from '../db/schema.js';
import type { RunHub } from './hub.js';
import type { ResidualPoint } from './history.js';

export interface EventCursor {
	step: number;
	snapshotId: number;
	statusKey: number;
}

export const START_CURSOR: EventCursor = { step: 0, snapshotId: 0, statusKey: 0 };

export function formatCursor(c: EventCursor): string {
	return `${c.step}.${c.snapshotId}.${c.statusKey}`;
}

/** A malformed cursor means "from the start": the client then gets everything once. */
export function parseCursor(value: string | null | undefined): EventCursor {
	const m = /^(\d+)\.(\d+)\.(\d+)$/.exec(value?.trim() ?? '');
	if (!m) return { ...START_CURSOR };
	const [step, snapshotId, statusKey] = [m[1], m[2], m[3]].map(Number);
	// no cursor this app wrote exceeds these (a step beyond PostgreSQL's integer would make every read fail)
	if (step > 2_147_483_647 || !Number.isSafeInteger(snapshotId) || !Number.isSafeInteger(statusKey)) return { ...START_CURSOR };
	return { step, snapshotId, statusKey };
}

/**
 * Position of a status in the run's life, growing with every change: a run goes queued → running
 * (attempt a) → queued again after a crash → running (attempt a+1) … → ended. `attempts` counts
 * claims, so queued = 3a+1, running = 3a, ended = 3a+2 (shifted by one so that 0 means "nothing seen").
 */
export function statusKey(run: { status: string; attempts: number }): number {
	if (run.status === 'queued') return 3 * run.attempts + 1;
	if (run.status === 'running') return 3 * run.attempts;
	return 3 * run.attempts + 2;
}

export interface RunEvent {
	event: 'residuals' | 'progress' | 'snapshot' | 'status';
	id: string;
	data: unknown;
}

const RESIDUAL_PAGE = 2000;

/**
 * Everything that happened after `cursor`, in order, and the new cursor. Residuals come before
 * the status, so a client that sees the final status has every residual point already.
 */
export async function readEvents(o: { db: Db; runId: string; cursor: EventCursor }): Promise<{ events: RunEvent[]; cursor: EventCursor }> {
	const cursor = { ...o.cursor };
	const events: RunEvent[] = [];
	// read the run first: whatever it says was committed no later than the rows read after it
	const [run] = await o.db
		.select({
			status: runs.status,
			attempts: runs.attempts,
			steps: runs.steps,
			simulatedTimeS: runs.simulatedTimeS,
			wallTimeS: runs.wallTimeS,
			errorMessage: runs.errorMessage,
			summary: runs.summary,
			endTimeS: sql<number>`(${runs.caseDocument}->'numerics'->>'endTimeS')::float8`,
			startedAt: runs.startedAt,
			finishedAt: runs.finishedAt
		})
		.from(runs)
		.where(eq(runs.id, o.runId));
	if (!run) return { events, cursor };

	let sentResiduals = false;
	for (;;) {
		const page: ResidualPoint[] = await o.db
			.select({ step: residuals.step, timeS: residuals.simulatedTimeS, values: residuals.values })
			.from(residuals)
			.where(and(eq(residuals.runId, o.runId), gt(residuals.step, cursor.step)))
			.orderBy(asc(residuals.step))
			.limit(RESIDUAL_PAGE);
		if (page.length === 0) break;
		cursor.step = page[page.length - 1].step;
		events.push({ event: 'residuals', id: formatCursor(cursor), data: { points: page } });
		sentResiduals = true;
		if (page.length < RESIDUAL_PAGE) break;
	}
	if (sentResiduals) {
		const endTimeS = Number(run.endTimeS);
		events.push({
			event: 'progress',
			id: formatCursor(cursor),
			data: {
				step: Math.max(run.steps, cursor.step),
				simulatedTimeS: run.simulatedTimeS,
				endTimeS,
				fraction: Math.min(1, run.simulatedTimeS / endTimeS),
				wallTimeS: run.wallTimeS
			}
		});
	}

	const [latest] = await o.db
		.select({ id: snapshots.id, step: snapshots.step, timeS: snapshots.simulatedTimeS, isFinal: snapshots.isFinal })
		.from(snapshots)
		.where(and(eq(snapshots.runId, o.runId), gt(snapshots.id, cursor.snapshotId)))
		.orderBy(desc(snapshots.id))
		.limit(1);
	if (latest) {
		cursor.snapshotId = latest.id;
		events.push({ event: 'snapshot', id: formatCursor(cursor), data: latest });
	}

	const key = statusKey(run);
	if (key > cursor.statusKey) {
		cursor.statusKey = key;
		events.push({
			event: 'status',
			id: formatCursor(cursor),
			data: {
				status: run.status,
				attempts: run.attempts,
				errorMessage: run.errorMessage,
				summary: run.summary,
				startedAt: run.startedAt,
				finishedAt: run.finishedAt
			}
		});
	}
	return { events, cursor };
}

/**
 * Streams of one run woken by the same NOTIFY usually stand at the same cursor (they all follow
 * live): they share one read instead of each querying the database. A read is shared only among
 * streams woken by the same wake (it started after that NOTIFY, so it sees what was committed);
 * a stream's first read is its own.
 */
const sharedReads = new Map<string, Promise<{ events: RunEvent[]; cursor: EventCursor; text: string }>>();

function readShared(o: { db: Db; runId: string; cursor: EventCursor; wake: number | null }) {
	const withText = (r: { events: RunEvent[]; cursor: EventCursor }) => ({ ...r, text: r.events.map(encodeEvent).join('') });
	if (o.wake === null) return readEvents(o).then(withText);
	const key = `${o.runId}|${o.wake}|${formatCursor(o.cursor)}`;
	let read = sharedReads.get(key);
	if (!read) {
		read = readEvents(o)
			.then(withText)
			.finally(() => sharedReads.delete(key));
		sharedReads.set(key, read);
	}
	return read;
}

function encodeEvent(e: RunEvent): string {
	return `id: ${e.id}\nevent: ${e.event}\ndata: ${JSON.stringify(e.data)}\n\n`;
}

/**
 * The SSE body of one run. It stays open after the run ends (the client closes it on the final
 * status); a comment line every 15 s keeps proxies from closing an idle stream.
 */
export function createEventStream(o: { db: Db; hub: RunHub; runId: string; cursor: EventCursor; signal?: AbortSignal }): ReadableStream<Uint8Array> {
	const encoder = new TextEncoder();
	let cursor = o.cursor;
	let reading = false;
	let again = false;
	let done = false;
	let unsubscribe: (() => void) | null = null;
	let keepAlive: NodeJS.Timeout | null = null;

	const stop = () => {
		if (done) return;
		done = true;
		unsubscribe?.();
		if (keepAlive) clearInterval(keepAlive);
	};

	return new ReadableStream<Uint8Array>({
		start(controller) {
			const send = (text: string) => {
				if (done) return;
				try {
					controller.enqueue(encoder.encode(text));
				} catch {
					stop();
				}
			};
			// one read at a time; wake-ups during a read merge into one more read
			let wake: number | null = null;
			const pump = async () => {
				if (reading) {
					again = true;
					return;
				}
				reading = true;
				try {
					do {
						again = false;
						const r = await readShared({ db: o.db, runId: o.runId, cursor, wake });
						cursor = r.cursor;
						if (r.text) send(r.text);
					} while (again && !done);
				} catch (e) {
					send(`: read failed: ${(e as Error).message.replace(/\n/g, ' ')}\n\n`);
				} finally {
					reading = false;
				}
			};
			send('retry: 1000\n\n');
			unsubscribe = o.hub.subscribe(o.runId, (n) => {
				wake = n;
				void pump();
			});
			keepAlive = setInterval(() => send(': keep-alive\n\n'), 15_000);
			o.signal?.addEventListener('abort', () => {
				stop();
				try {
					controller.close();
				} catch {
					/* already closed */
				}
			});
			void pump();
		},
		cancel() {
			stop();
		}
	});
}
