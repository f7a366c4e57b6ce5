import type { Handle, HandleServerError } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building, dev } from '$app/environment';
import { authHandle } from '$lib/server/auth/index.js';
import { readableForms } from '$lib/server/forms.js';
import { isApiPath, tokenHandle } from '$lib/server/guard.js';
import { codeForStatus, errorBody, errorResponse } from '$lib/server/json-body.js';
import { refuseCrossSite, securityHeaders } from '$lib/server/security.js';

// missing configuration fails loudly at start-up, not at the first sign-in
if (!building && !dev && !process.env.AUTH_SECRET) {
	throw new Error('AUTH_SECRET is not set: start the app with `npm start`, which generates one.');
}

/** `locals.user` / `locals.member` are filled lazily by the guard (`$lib/server/guard`). */
const prepareLocals: Handle = async ({ event, resolve }) => {
	event.locals.user = undefined;
	event.locals.member = undefined;
	event.locals.apiToken = undefined;
	return resolve(event);
};

const plainMessages: Record<number, string> = {
	400: 'The request is not valid.',
	401: 'Send an API token (Authorization: Bearer tf_…) or sign in first.',
	403: 'Your role does not allow this.',
	404: 'Not found.',
	405: 'This method is not allowed here.',
	413: 'The request body is too large.'
};

/**
 * The JSON API answers every refusal with the uniform error body, also those SvelteKit writes itself
 * (an unknown path, a method the route does not have, an error page for a client that asked for HTML).
 */
const apiResponses: Handle = async ({ event, resolve }) => {
	if (!isApiPath(event.url.pathname)) return resolve(event);
	const response = await resolve(event);
	if (response.status >= 400 && !(response.headers.get('content-type') ?? '').includes('json')) {
		const allow = response.headers.get('allow');
		let message = plainMessages[response.status] ?? (response.status >= 500 ? 'Something went wrong on our side. Try again in a moment.' : 'The request was refused.');
		if (response.status === 405 && allow) message = `${event.request.method} is not allowed here; use ${allow.split(/,\s*/).join(' or ')}.`;
		return errorResponse(response.status, codeForStatus(response.status), message, [], allow ? { allow } : undefined);
	}
	if (!response.headers.has('cache-control')) response.headers.set('cache-control', 'no-store');
	return response;
};

// security headers outermost, so that every answer gets them (also the refusals of the handles
// after it); the cross-site check after the token handle, which marks token requests
export const handle = sequence(securityHeaders, prepareLocals, readableForms, tokenHandle, refuseCrossSite, authHandle, apiResponses);

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	// expected errors (404s and the like) carry their own message; everything else stays generic
	if (status >= 500) console.error(`[app] ${event.request.method} ${event.url.pathname}:`, error);
	return errorBody(codeForStatus(status), status >= 500 ? 'Something went wrong on our side. Try again in a moment.' : message);
};
