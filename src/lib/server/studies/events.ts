/**
 * Server-sent events of a study: `members` (the member rows that changed since the last event,
 * all of them first) and `progress` (counts by status, time left). The stream listens on the run
 * hub for each member run and for the study itself (the study verbs notify its id), and re-reads
 * the members at most every 250 ms; a reconnect simply starts with the full member list again.
 */
import type { Db } from '../db/index.js';
import type { RunHub } from '../runs/hub.js';
import { studyProgress } from '../../studies/results.js';
import { listMembers, type StudyMember } from './reads.js';

const MIN_INTERVAL_MS = 250;
const FALLBACK_INTERVAL_MS = 3000;

function signature(m: StudyMember): string {
	return `${m.id}|${m.status}|${m.steps}|${m.attempts}|${m.design ? 1 : 0}`;
}

export function createStudyEventStream(o: { db: Db; hub: RunHub; teamId: string; studyId: string; slots?: number; signal?: AbortSignal }): ReadableStream<Uint8Array> {
	const encoder = new TextEncoder();
	const sent = new Map<number, string>();
	const subscriptions = new Map<string, () => void>();
	let done = false;
	let timer: NodeJS.Timeout | null = null;
	let fallback: NodeJS.Timeout | null = null;
	let lastRead = 0;
	let reading = false;
	let seq = 0;

	const stop = () => {
		if (done) return;
		done = true;
		for (const unsub of subscriptions.values()) unsub();
		subscriptions.clear();
		if (timer) clearTimeout(timer);
		if (fallback) clearInterval(fallback);
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
			const subscribe = (key: string) => {
				if (!subscriptions.has(key)) subscriptions.set(key, o.hub.subscribe(key, () => schedule()));
			};
			const read = async () => {
				if (reading || done) return;
				reading = true;
				lastRead = Date.now();
				try {
					const members = await listMembers({ db: o.db, teamId: o.teamId, studyId: o.studyId });
					for (const m of members) subscribe(m.id);
					const changed = members.filter((m) => sent.get(m.index) !== signature(m));
					if (changed.length || seq === 0) {
						for (const m of changed) sent.set(m.index, signature(m));
						seq++;
						send(`id: ${seq}\nevent: members\ndata: ${JSON.stringify({ members: changed })}\n\n`);
						send(`event: progress\ndata: ${JSON.stringify(studyProgress(members, o.slots))}\n\n`);
					}
				} catch (e) {
					send(`: read failed: ${(e as Error).message.replace(/\n/g, ' ')}\n\n`);
				} finally {
					reading = false;
				}
			};
			const schedule = () => {
				if (done || timer) return;
				const wait = Math.max(0, MIN_INTERVAL_MS - (Date.now() - lastRead));
				timer = setTimeout(() => {
					timer = null;
					void read().then(() => undefined);
				}, wait);
			};
			send('retry: 1000\n\n');
			subscribe(o.studyId);
			// notifications can be missed across a hub reconnect: a slow re-read covers that, and keeps proxies from closing the stream
			fallback = setInterval(() => schedule(), FALLBACK_INTERVAL_MS);
			o.signal?.addEventListener('abort', () => {
				stop();
				try {
					controller.close();
				} catch {
					/* already closed */
				}
			});
			void read();
		},
		cancel() {
			stop();
		}
	});
}
