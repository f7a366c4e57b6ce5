import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireMember } from '$lib/server/guard';
import { workersOverview } from '$lib/server/workers';

/** What the Workers page shows, as JSON: the page polls it every 2 s (admins only). */
export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'admin');
	return json(await workersOverview(team.id), { headers: { 'cache-control': 'no-store' } });
};
