/**
 * Response headers and the cross-site check that every request passes through (`hooks.server.ts`).
 *
 * - Pages get their Content-Security-Policy from SvelteKit (`kit.csp` in `svelte.config.js`: nonces
 *   for server-rendered pages, hashes for prerendered ones). Every other answer — JSON, CSV, the
 *   live streams, redirects — gets `default-src 'none'`: none of them is ever a document that
 *   should load anything.
 * - `strict-transport-security` only when the app is served over HTTPS (`ORIGIN` starts with
 *   https, so `event.url` does): over plain HTTP the header means nothing, and sending it from a
 *   local install would pin `127.0.0.1` to HTTPS in the browser.
 * - Cross-site requests: SvelteKit refuses a POST/PUT/PATCH/DELETE *form* submission (url-encoded,
 *   multipart, text/plain) whose Origin is not the app's. `refuseCrossSite` applies the same rule
 *   to every other body (JSON, CSV …) sent with the session cookie: a state-changing request that
 *   carries an Origin header naming another site is refused with 403. A request without an Origin
 *   header (scripts, `curl`) and a request authenticated by an API token (which carries no cookie a
 *   third-party page could borrow) are not affected.
 */
import type { Handle, RequestEvent } from '@sveltejs/kit';
import { errorResponse } from './json-body.js';

/** One year, the usual HSTS lifetime. */
export const HSTS_MAX_AGE_S = 365 * 24 * 3600;

/** The policy of every answer that is not a page rendered by SvelteKit. */
export const NON_PAGE_CSP = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** Is this request state-changing and sent from another site's page? */
export function isCrossSiteWrite(event: Pick<RequestEvent, 'request' | 'url'>): boolean {
	if (!STATE_CHANGING.has(event.request.method)) return false;
	const origin = event.request.headers.get('origin');
	// no Origin header: not sent by a browser on behalf of another site
	if (origin === null) return false;
	return origin !== event.url.origin;
}

export const refuseCrossSite: Handle = async ({ event, resolve }) => {
	if (isCrossSiteWrite(event) && !event.locals.apiToken) {
		return errorResponse(403, 'forbidden', 'Cross-site requests are refused: send this request from the app itself.');
	}
	return resolve(event);
};

export const securityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	const headers = response.headers;
	headers.set('x-frame-options', 'DENY');
	headers.set('x-content-type-options', 'nosniff');
	headers.set('referrer-policy', 'same-origin');
	if (!headers.has('content-security-policy')) headers.set('content-security-policy', NON_PAGE_CSP);
	if (event.url.protocol === 'https:') headers.set('strict-transport-security', `max-age=${HSTS_MAX_AGE_S}; includeSubDomains`);
	return response;
};
