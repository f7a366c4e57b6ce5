import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { currentUser } from '$lib/server/guard';
import { safeRedirectTarget, sendSignInLink, signInWithPassword } from '$lib/server/auth/actions';

export const load: PageServerLoad = async (event) => {
	const redirectTo = safeRedirectTarget(event.url.searchParams.get('redirectTo') ?? event.url.searchParams.get('callbackUrl'));
	if (await currentUser(event)) redirect(303, redirectTo);
	// Auth.js lands here with ?error= when an e-mail link is expired or already used
	const error = event.url.searchParams.get('error');
	return {
		redirectTo,
		linkError: error === 'Verification' ? 'That sign-in link is expired or already used. Ask for a new one.' : error ? 'Sign-in did not work. Try again.' : null
	};
};

function field(data: FormData, name: string): string {
	const v = data.get(name);
	return typeof v === 'string' ? v : '';
}

export const actions: Actions = {
	password: async (event) => {
		const data = await event.request.formData();
		const email = field(data, 'email').trim();
		const password = field(data, 'password');
		if (!email || !password) {
			return fail(400, { email, message: 'Enter your e-mail address and password.' });
		}
		return signInWithPassword(event, { email, password, redirectTo: field(data, 'redirectTo') });
	},
	link: async (event) => {
		const data = await event.request.formData();
		const email = field(data, 'email').trim();
		if (!/^[^@\s]+@[^@\s]+$/.test(email)) return fail(400, { email, message: 'Enter a valid e-mail address.', link: true });
		return sendSignInLink(event, { email, redirectTo: field(data, 'redirectTo') });
	}
};
