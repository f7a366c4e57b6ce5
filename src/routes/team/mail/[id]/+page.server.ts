import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { isUuid, requireMember } from '$lib/server/guard';
import { getTeamMail } from '$lib/server/team';

export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'admin');
	const message = isUuid(event.params.id) ? await getTeamMail(team.id, event.params.id) : null;
	if (!message) error(404, 'Message not found.');
	return { message: { ...message, raw: undefined } };
};
