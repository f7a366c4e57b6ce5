import type { Handle, HandleServerError } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building, dev } from '$app/environment';
import { authHandle } from '$lib/server/auth/index.js';

// missing configuration fails loudly at start-up, not at the first sign-in
if (!building && !dev && !process.env.AUTH_SECRET) {
	throw new Error('AUTH_SECRET is not set: start the app with `npm start`, which generates one.');
}

/** `locals.user` / `locals.member` are filled lazily by the guard (`$lib/server/guard`). */
const prepareLocals: Handle = async ({ event, resolve }) => {
	event.locals.user = undefined;
	event.locals.member = undefined;
	return resolve(event);
};

const securityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	response.headers.set('x-frame-options', 'DENY');
	response.headers.set('x-content-type-options', 'nosniff');
	response.headers.set('referrer-policy', 'same-origin');
	return response;
};

export const handle = sequence(prepareLocals, authHandle, securityHeaders);

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	// expected errors (404s and the like) carry their own message; everything else stays generic
	if (status >= 500) console.error(`[app] ${event.request.method} ${event.url.pathname}:`, error);
	return { message: status >= 500 ? 'Something went wrong on our side. Try again in a moment.' : message };
};
