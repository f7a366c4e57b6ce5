/**
 * Request rate limit per API token: a token bucket of `burst` requests refilled at `perMinute`
 * requests a minute (defaults 60 and 120). A request that finds the bucket empty is answered 429
 * with `Retry-After` (whole seconds until one request is available again).
 *
 * The buckets live in memory, per app process: with several app processes behind one address each
 * counts on its own, so the effective limit is that many times higher. A long event stream counts
 * as one request. `TWOFOLD_API_RATE_PER_MIN` and `TWOFOLD_API_BURST` change the limits (tests
 * use small ones).
 */

interface Bucket {
	tokens: number;
	at: number;
}

export interface RateLimitSettings {
	perMinute: number;
	burst: number;
}

function positive(value: string | undefined, fallback: number): number {
	const n = Number(value);
	return value !== undefined && value !== '' && Number.isFinite(n) && n > 0 ? n : fallback;
}

export function rateLimitSettings(env: Record<string, string | undefined> = process.env): RateLimitSettings {
	return { perMinute: positive(env.TWOFOLD_API_RATE_PER_MIN, 120), burst: positive(env.TWOFOLD_API_BURST, 60) };
}

export type RateDecision = { ok: true; remaining: number } | { ok: false; retryAfterS: number };

/** Forget buckets untouched for this long (they would be full again anyway). */
const IDLE_MS = 10 * 60_000;

export class RateLimiter {
	private readonly buckets = new Map<string, Bucket>();
	private lastSweep = 0;
	constructor(readonly settings: RateLimitSettings) {}

	/** Takes one request from `key`'s bucket. */
	take(key: string, now = Date.now()): RateDecision {
		const { perMinute, burst } = this.settings;
		const perMs = perMinute / 60_000;
		this.sweep(now);
		const b = this.buckets.get(key) ?? { tokens: burst, at: now };
		b.tokens = Math.min(burst, b.tokens + (now - b.at) * perMs);
		b.at = now;
		this.buckets.set(key, b);
		if (b.tokens >= 1) {
			b.tokens -= 1;
			return { ok: true, remaining: Math.floor(b.tokens) };
		}
		return { ok: false, retryAfterS: Math.max(1, Math.ceil((1 - b.tokens) / perMs / 1000)) };
	}

	private sweep(now: number) {
		if (now - this.lastSweep < IDLE_MS) return;
		this.lastSweep = now;
		for (const [k, b] of this.buckets) if (now - b.at > IDLE_MS) this.buckets.delete(k);
	}
}

let limiter: RateLimiter | null = null;

/** The app process's limiter (settings read once from the environment). */
export function apiRateLimiter(): RateLimiter {
	limiter ??= new RateLimiter(rateLimitSettings());
	return limiter;
}
