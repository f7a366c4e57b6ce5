/**
 * Sign-in from our own form actions. Auth.js's `signIn` reads the provider and fields from the
 * request body and answers with a redirect; failures redirect to `/signin?error=…&code=…`, which
 * we turn into a `fail()` so the form can say what went wrong beside the fields.
 */
import { fail, isRedirect, redirect, type RequestEvent } from '@sveltejs/kit';
import { CredentialsSignin, AuthError } from '@auth/sveltekit';
import { signIn } from './index.js';

/** Only same-site paths: never redirect a signed-in user to another site. */
export function safeRedirectTarget(value: unknown): string {
	if (typeof value !== 'string' || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return '/';
	return value;
}

async function callAuthSignIn(event: RequestEvent, fields: Record<string, string>) {
	const body = new FormData();
	for (const [k, v] of Object.entries(fields)) body.set(k, v);
	const headers = new Headers(event.request.headers);
	headers.delete('content-type');
	headers.delete('content-length');
	const request = new Request(event.request.url, { method: 'POST', headers, body });
	try {
		await signIn({ ...event, request } as RequestEvent);
	} catch (e) {
		if (isRedirect(e)) return e.location;
		// called from the server, Auth.js throws its errors instead of redirecting to the error page
		if (e instanceof CredentialsSignin) return `/signin?error=CredentialsSignin&code=${encodeURIComponent(e.code)}`;
		if (e instanceof AuthError) return `/signin?error=${encodeURIComponent(e.type)}`;
		throw e;
	}
	return '/';
}

export const WRONG_CREDENTIALS = 'E-mail or password is not right.';
export const THROTTLED = 'Too many failed attempts for this address. Wait five minutes, then try again.';

export async function signInWithPassword(event: RequestEvent, options: { email: string; password: string; redirectTo?: string }) {
	const target = safeRedirectTarget(options.redirectTo);
	const location = await callAuthSignIn(event, {
		providerId: 'credentials',
		email: options.email,
		password: options.password,
		redirectTo: target
	});
	const url = new URL(location, event.url);
	if (url.searchParams.has('error')) {
		const throttled = url.searchParams.get('code') === 'throttled';
		return fail(throttled ? 429 : 400, {
			email: options.email,
			message: throttled ? THROTTLED : WRONG_CREDENTIALS
		});
	}
	redirect(303, target);
}

export async function sendSignInLink(event: RequestEvent, options: { email: string; redirectTo?: string }) {
	const location = await callAuthSignIn(event, {
		providerId: 'email',
		email: options.email,
		redirectTo: safeRedirectTarget(options.redirectTo)
	});
	const url = new URL(location, event.url);
	if (url.searchParams.has('error')) {
		return fail(400, { email: options.email, message: 'We could not send a link to that address. Check it and try again.' });
	}
	redirect(303, '/signin/check-mail');
}
