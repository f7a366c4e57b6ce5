/** The password throttle's counting window and lock, against the real table, with a controlled clock. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomBytes } from 'node:crypto';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { LOCK_MS, MAX_FAILURES, WINDOW_MS, clearFailures, lockedForMs, recordFailure } from '../../src/lib/server/auth/throttle.js';
import { openTestDb } from '../helpers/db.js';

let handle: DbHandle;
const t0 = new Date('2026-03-01T08:00:00Z');
const at = (ms: number) => new Date(t0.getTime() + ms);
const email = () => `throttle-${randomBytes(4).toString('hex')}@test.invalid`;

beforeAll(async () => {
	handle = await openTestDb();
});

afterAll(async () => {
	await handle?.close();
});

describe('password throttle', () => {
	it(`locks for ${LOCK_MS / 60_000} minutes at the ${MAX_FAILURES}th failure within the window, then lets the address try again`, async () => {
		const e = email();
		for (let i = 0; i < MAX_FAILURES - 1; i++) await recordFailure(handle.db, e, at(i * 1000));
		expect(await lockedForMs(handle.db, e, at(10_000))).toBe(0);
		await recordFailure(handle.db, e, at(10_000));
		expect(await lockedForMs(handle.db, e, at(10_000))).toBe(LOCK_MS);
		expect(await lockedForMs(handle.db, e, at(10_000 + LOCK_MS - 1))).toBe(1);
		expect(await lockedForMs(handle.db, e, at(10_000 + LOCK_MS))).toBe(0);
	});

	it('forgets failures older than the window', async () => {
		const e = email();
		for (let i = 0; i < MAX_FAILURES - 1; i++) await recordFailure(handle.db, e, at(i));
		// the next failure comes after the window closed: the count starts again at one
		await recordFailure(handle.db, e, at(WINDOW_MS + 1000));
		expect(await lockedForMs(handle.db, e, at(WINDOW_MS + 1000))).toBe(0);
		for (let i = 0; i < MAX_FAILURES - 2; i++) await recordFailure(handle.db, e, at(WINDOW_MS + 2000 + i));
		expect(await lockedForMs(handle.db, e, at(WINDOW_MS + 5000))).toBe(0);
		await recordFailure(handle.db, e, at(WINDOW_MS + 6000));
		expect(await lockedForMs(handle.db, e, at(WINDOW_MS + 6000))).toBe(LOCK_MS);
	});

	it('counts concurrent failures without losing any', async () => {
		const e = email();
		await Promise.all(Array.from({ length: MAX_FAILURES }, () => recordFailure(handle.db, e, at(0))));
		expect(await lockedForMs(handle.db, e, at(0))).toBe(LOCK_MS);
	});

	it('treats the address case-insensitively and clears on success', async () => {
		const e = email();
		for (let i = 0; i < MAX_FAILURES; i++) await recordFailure(handle.db, i % 2 ? e.toUpperCase() : e, at(i));
		// the lock runs from the last failure, at (MAX_FAILURES - 1) ms
		const lockEndsMs = MAX_FAILURES - 1 + LOCK_MS;
		expect(await lockedForMs(handle.db, e, at(100))).toBe(lockEndsMs - 100);
		await clearFailures(handle.db, e.toUpperCase());
		expect(await lockedForMs(handle.db, e, at(100))).toBe(0);
	});
});
