import type { LayoutServerLoad } from './$types';
import { currentMember, currentUser, listMyTeams } from '$lib/server/guard';

/** Who is signed in, for the top navigation. Pages guard themselves with `requireMember`. */
export const load: LayoutServerLoad = async (event) => {
	const user = await currentUser(event);
	const member = user ? await currentMember(event) : null;
	const teams = user ? await listMyTeams(user.id) : [];
	return {
		user: user ? { email: user.email, name: user.name } : null,
		team: member ? { id: member.team.id, name: member.team.name } : null,
		role: member?.role ?? null,
		/** only when there is a choice to make */
		otherTeams: teams.length > 1 ? teams.map((t) => ({ id: t.team.id, name: t.team.name, role: t.role })) : []
	};
};
