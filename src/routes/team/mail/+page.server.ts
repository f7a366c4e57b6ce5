import type { PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { listTeamMail } from '$lib/server/team';

export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'admin');
	return { messages: await listTeamMail(team.id) };
};
