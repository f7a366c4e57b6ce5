/**
 * Personal API tokens. Every member manages their own (in the team they work in); admins see and
 * revoke every token of the team. Managing tokens needs a signed-in session: a token cannot make or
 * revoke tokens (a read-only token could otherwise mint itself a stronger one).
 */
import { error, type RequestEvent } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { hasRole } from '$lib/server/roles';
import { parseForm } from '$lib/server/forms';
import { errorBody } from '$lib/server/json-body';
import { createToken, listTokens, revokeToken, tokenForm } from '$lib/server/api/tokens';

async function sessionMember(event: RequestEvent) {
	const member = await requireMember(event, 'viewer');
	if (event.locals.apiToken) error(403, errorBody('forbidden', 'API tokens are managed in the browser, signed in; a token cannot manage tokens.'));
	return member;
}

export const load: PageServerLoad = async (event) => {
	const { team, user, role } = await sessionMember(event);
	const isAdmin = hasRole(role, 'admin');
	return {
		teamName: team.name,
		role,
		isAdmin,
		myUserId: user.id,
		tokens: await listTokens({ teamId: team.id, userId: user.id, all: isAdmin })
	};
};

export const actions: Actions = {
	create: async (event) => {
		const { team, user } = await sessionMember(event);
		const { data, values, failure } = parseForm(tokenForm, await event.request.formData());
		if (!data) return failure;
		const { token, row } = await createToken({ teamId: team.id, userId: user.id, input: data });
		return { created: { id: row.id, token, name: row.name, scope: row.scope, expiresAt: row.expiresAt?.toISOString() ?? null }, values: { ...values, name: '' } };
	},
	revoke: async (event) => {
		const { team, user, role } = await sessionMember(event);
		const id = String((await event.request.formData()).get('tokenId') ?? '');
		const revoked = await revokeToken({ teamId: team.id, actorId: user.id, isAdmin: hasRole(role, 'admin'), id });
		if (!revoked) error(404, errorBody('not_found', 'Token not found.'));
		return { revoked: { id: revoked.id, name: revoked.name } };
	}
};
