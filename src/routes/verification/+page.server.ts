import type { PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { openVerification } from '$lib/server/verification';

/**
 * The solver's verification (every signed-in member). Opening the page queues the computation for a
 * worker when this solver version has no results yet or its last attempt failed.
 */
export const load: PageServerLoad = async (event) => {
	await requireMember(event, 'viewer');
	return { verification: await openVerification() };
};
