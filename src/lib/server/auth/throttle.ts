/**
 * Slows down password guessing per e-mail address: after MAX_FAILURES wrong passwords within
 * WINDOW_MS the address is locked for LOCK_MS, during which even the right password is refused.
 * Kept in PostgreSQL so every app process sees the same count.
 */
import { eq, sql } from 'drizzle-orm';
import type { Db } from '../db/index.js';
import { signInThrottle } from '../db/schema.js';

export const MAX_FAILURES = 5;
export const WINDOW_MS = 15 * 60_000;
export const LOCK_MS = 5 * 60_000;

function keyFor(email: string) {
	return `email:${email.trim().toLowerCase()}`;
}

/** Milliseconds the address must still wait, or 0 when it may try. */
export async function lockedForMs(db: Db, email: string, now = new Date()): Promise<number> {
	const [row] = await db.select().from(signInThrottle).where(eq(signInThrottle.key, keyFor(email)));
	if (!row?.lockedUntil) return 0;
	return Math.max(0, row.lockedUntil.getTime() - now.getTime());
}

/** Counts one wrong password; locks the address when the count reaches MAX_FAILURES in the window. */
export async function recordFailure(db: Db, email: string, now = new Date()): Promise<void> {
	const key = keyFor(email);
	const windowStart = new Date(now.getTime() - WINDOW_MS);
	const lockUntil = new Date(now.getTime() + LOCK_MS);
	// one statement, so concurrent failures cannot both read the old count
	await db
		.insert(signInThrottle)
		.values({ key, failures: 1, windowStartedAt: now })
		.onConflictDoUpdate({
			target: signInThrottle.key,
			set: {
				failures: sql`case when ${signInThrottle.windowStartedAt} < ${windowStart} then 1 else ${signInThrottle.failures} + 1 end`,
				windowStartedAt: sql`case when ${signInThrottle.windowStartedAt} < ${windowStart} then ${now} else ${signInThrottle.windowStartedAt} end`
			}
		});
	await db
		.update(signInThrottle)
		.set({ lockedUntil: lockUntil, failures: 0, windowStartedAt: now })
		.where(sql`${signInThrottle.key} = ${key} and ${signInThrottle.failures} >= ${MAX_FAILURES}`);
}

export async function clearFailures(db: Db, email: string): Promise<void> {
	await db.delete(signInThrottle).where(eq(signInThrottle.key, keyFor(email)));
}
