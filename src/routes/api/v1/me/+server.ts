/** GET /api/v1/me — who the request acts for: member, team, role and the token used. */
import { requireMember } from '$lib/server/guard';
import { ok } from '$lib/server/api/http';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { user, team, role } = await requireMember(event, 'viewer');
	const t = event.locals.apiToken;
	return ok({
		user: { id: user.id, email: user.email, name: user.name },
		team: { id: team.id, name: team.name, slug: team.slug },
		role,
		token: t ? { id: t.id, name: t.name, prefix: t.prefix, scope: t.scope } : null
	});
};
