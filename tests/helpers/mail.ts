import { and, desc, gte, ilike } from 'drizzle-orm';
import type { Db } from '../../src/lib/server/db/index.js';
import { outgoingMail } from '../../src/lib/server/db/schema.js';

/** Waits until the fake SMTP server has stored a message to `to` (received after `since`). */
export async function waitForMail(options: { db: Db; to: string; since?: Date; timeoutMs?: number }) {
	const deadline = Date.now() + (options.timeoutMs ?? 10_000);
	for (;;) {
		const [row] = await options.db
			.select()
			.from(outgoingMail)
			.where(and(ilike(outgoingMail.toAddresses, `%${options.to}%`), gte(outgoingMail.receivedAt, options.since ?? new Date(0))))
			.orderBy(desc(outgoingMail.receivedAt))
			.limit(1);
		if (row) return row;
		if (Date.now() > deadline) throw new Error(`no mail to ${options.to} within ${options.timeoutMs ?? 10_000} ms`);
		await new Promise((r) => setTimeout(r, 100));
	}
}

/** The first http(s) link in a text. */
export function firstLink(text: string | null): string {
	const m = /https?:\/\/\S+/.exec(text ?? '');
	if (!m) throw new Error('no link in the message');
	return m[0];
}
