import { redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { signOut } from '$lib/server/auth';

export const load: PageServerLoad = async () => redirect(303, '/');

export const actions: Actions = {
	default: async (event) => {
		const body = new FormData();
		body.set('redirectTo', '/signin');
		const headers = new Headers(event.request.headers);
		headers.delete('content-type');
		headers.delete('content-length');
		await signOut({ ...event, request: new Request(event.request.url, { method: 'POST', headers, body }) });
	}
};
