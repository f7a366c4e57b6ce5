/**
 * Runs in fault tests: the cases used, the uninterrupted reference (the solver library driven in
 * the test process), what the tables must then hold, and a live-stream client that reconnects by
 * itself with `Last-Event-ID`, as a browser's EventSource does.
 */
import { asc, eq } from 'drizzle-orm';
import type { Db } from '../../src/lib/server/db/index.js';
import { residuals, runs, snapshots } from '../../src/lib/server/db/schema.js';
import { storesResidualStep } from '../../worker/jobs/solve-protocol.js';
import { createSimulation, defaultCase, type CaseDocument } from '../../solver/index.js';
import type { Residuals, Results } from '../../solver/types.js';
import { waitFor } from './workers.js';

/** 1 m column, 40 cells: converges in a few hundred steps (well under a second unpaced). */
export function smallCase(name = 'small'): CaseDocument {
	const c = defaultCase('height-profile');
	c.name = name;
	c.geometry.heightM = 1;
	c.geometry.clearLiquidLevelM = 0.7;
	c.numerics.cells = 40;
	c.numerics.endTimeS = 60;
	c.numerics.snapshotIntervalS = 1;
	return c;
}

/** The default column (about 800 steps, a snapshot every 2 s of simulated time); paced by the worker to last seconds. */
export function referenceCase(name = 'reference'): CaseDocument {
	const c = defaultCase('height-profile');
	c.name = name;
	c.numerics.snapshotIntervalS = 2;
	return c;
}

/** What an uninterrupted run computes: the solver driven here, with the residuals of the stored steps. */
export function solveHere(caseDoc: CaseDocument): { results: Results; residualsByStep: Map<number, Residuals> } {
	const sim = createSimulation(caseDoc);
	const residualsByStep = new Map<number, Residuals>();
	for (;;) {
		const s = sim.step();
		const ended = s.status !== 'running';
		if (ended || storesResidualStep(sim.state.step)) residualsByStep.set(sim.state.step, { ...sim.residuals() });
		if (ended) break;
	}
	return { results: sim.results(), residualsByStep };
}

/** The residual steps a run that ended at `lastStep` stores. */
export function expectedSteps(lastStep: number): number[] {
	const steps: number[] = [];
	for (let s = 1; s <= lastStep; s++) if (s === lastStep || storesResidualStep(s)) steps.push(s);
	return steps;
}

export async function storedSteps(db: Db, runId: string): Promise<number[]> {
	const rows = await db.select({ step: residuals.step }).from(residuals).where(eq(residuals.runId, runId)).orderBy(asc(residuals.step));
	return rows.map((r) => r.step);
}

export async function storedSnapshots(db: Db, runId: string) {
	return db.select().from(snapshots).where(eq(snapshots.runId, runId)).orderBy(asc(snapshots.step));
}

export async function getRunRow(db: Db, runId: string) {
	const [row] = await db.select().from(runs).where(eq(runs.id, runId));
	return row;
}

export const ENDED = ['converged', 'finished', 'failed', 'cancelled'];

export async function waitForStatus(db: Db, runId: string, statuses: string[], timeoutMs = 60_000) {
	return waitFor(
		async () => {
			const r = await getRunRow(db, runId).catch(() => null);
			return r && statuses.includes(r.status) ? r : null;
		},
		{ timeoutMs, what: `run ${runId} to reach ${statuses.join('/')}`, everyMs: 100 }
	);
}

export interface SseEvent {
	id: string;
	event: string;
	data: any; // eslint-disable-line @typescript-eslint/no-explicit-any
	/** `Date.now()` when the chunk that completed this event arrived */
	receivedAtMs: number;
}

/**
 * Reads server-sent events from a response body as the app writes them: blocks ended by a blank
 * line, each with `id: `, `event: ` and one `data: ` line of JSON; blocks without an event (comments)
 * are skipped. Calls `onEvent` with each event until it returns true, then returns true; returns
 * false when the stream ends first. A failed read (an aborted request too) is thrown.
 */
export async function readSseEvents(body: ReadableStream<Uint8Array>, onEvent: (e: SseEvent) => boolean): Promise<boolean> {
	const decoder = new TextDecoder();
	let buffer = '';
	for await (const chunk of body as unknown as AsyncIterable<Uint8Array>) {
		const receivedAtMs = Date.now();
		buffer += decoder.decode(chunk, { stream: true });
		let cut: number;
		while ((cut = buffer.indexOf('\n\n')) >= 0) {
			const block = buffer.slice(0, cut);
			buffer = buffer.slice(cut + 2);
			const e: Partial<SseEvent> = { receivedAtMs };
			for (const line of block.split('\n')) {
				if (line.startsWith('id: ')) e.id = line.slice(4);
				else if (line.startsWith('event: ')) e.event = line.slice(7);
				else if (line.startsWith('data: ')) e.data = JSON.parse(line.slice(6));
			}
			if (!e.event) continue;
			if (onEvent(e as SseEvent)) return true;
		}
	}
	return false;
}

/**
 * Follows a run's live stream like EventSource: on a dropped or refused connection it waits and
 * reconnects, sending the last id it saw as `Last-Event-ID`, until it has seen the final status.
 */
export class SseFollower {
	readonly events: SseEvent[] = [];
	/** connections opened (the first one included) */
	connections = 0;
	/** refused or failed connection attempts */
	failures = 0;
	private controller: AbortController | null = null;
	private stopped = false;
	readonly done: Promise<void>;

	constructor(
		private readonly o: { baseUrl: string; path: string; cookie: string; retryMs?: number; timeoutMs?: number }
	) {
		this.done = this.follow();
		this.done.catch(() => {});
	}

	get lastId(): string | undefined {
		return this.events[this.events.length - 1]?.id;
	}

	get ended(): boolean {
		for (let i = this.events.length - 1; i >= 0; i--) {
			if (this.events[i].event === 'status') return ENDED.includes(this.events[i].data.status);
		}
		return false;
	}

	/** residual steps streamed, in order */
	steps(): number[] {
		return this.events.filter((e) => e.event === 'residuals').flatMap((e) => e.data.points.map((p: { step: number }) => p.step));
	}

	/** drops the current connection (the follower reconnects after `retryMs`) */
	drop(): void {
		this.controller?.abort();
	}

	stop(): void {
		this.stopped = true;
		this.controller?.abort();
	}

	private async follow(): Promise<void> {
		const deadline = Date.now() + (this.o.timeoutMs ?? 120_000);
		while (!this.stopped && !this.ended) {
			if (Date.now() > deadline) throw new Error(`stream ${this.o.path} did not end within the time limit (${this.events.length} events)`);
			await this.connectOnce().catch(() => {
				this.failures++;
			});
			if (!this.stopped && !this.ended) await new Promise((r) => setTimeout(r, this.o.retryMs ?? 250));
		}
	}

	private async connectOnce(): Promise<void> {
		const controller = new AbortController();
		this.controller = controller;
		const headers: Record<string, string> = { accept: 'text/event-stream', cookie: this.o.cookie };
		if (this.lastId) headers['last-event-id'] = this.lastId;
		const res = await fetch(new URL(this.o.path, this.o.baseUrl), { headers, signal: controller.signal });
		if (res.status !== 200 || !res.body) {
			await res.body?.cancel().catch(() => {});
			throw new Error(`HTTP ${res.status}`);
		}
		this.connections++;
		try {
			const ended = await readSseEvents(res.body, (e) => {
				this.events.push(e);
				return this.ended;
			});
			if (ended) controller.abort();
		} catch (err) {
			if (!controller.signal.aborted) throw err;
		}
	}
}
