import type { LayoutServerLoad } from './$types';
import { currentMember, currentUser } from '$lib/server/guard';

/** Who is signed in, for the top navigation. Pages guard themselves with `requireMember`. */
export const load: LayoutServerLoad = async (event) => {
	const user = await currentUser(event);
	const member = user ? await currentMember(event) : null;
	return {
		user: user ? { email: user.email, name: user.name } : null,
		team: member ? { name: member.team.name } : null,
		role: member?.role ?? null
	};
};
