import { error, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { chooseTeam, currentUser, listMyTeams, rejectAnonymous } from '$lib/server/guard';

export const load: PageServerLoad = async () => redirect(303, '/');

export const actions: Actions = {
	/** Switches the team a member of several teams works in. */
	default: async (event) => {
		const user = await currentUser(event);
		if (!user) rejectAnonymous(event);
		const teamId = String((await event.request.formData()).get('teamId') ?? '');
		const mine = await listMyTeams(user.id);
		// a team the user is not in answers like any other unknown id
		if (!mine.some((m) => m.team.id === teamId)) error(404, 'Team not found.');
		chooseTeam(event, teamId);
		redirect(303, '/');
	}
};
