import type { PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { workersOverview } from '$lib/server/workers';

/** The worker processes sharing this database's run queue, and the queue's depth (admins only). */
export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'admin');
	return { overview: await workersOverview(team.id) };
};
