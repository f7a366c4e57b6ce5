/**
 * The one role guard. Every load, form action and `+server.ts` that touches team data calls
 * `requireMember(event, role)` first; hiding a button is never the protection.
 *
 * - anonymous: a page request (GET asking for HTML) is redirected to /signin; anything else gets 401
 * - signed in but below `role`: 403
 * - a row of another team (or a malformed id): 404 through `requireTeamRow`, never a leak
 *
 * A request may instead carry a personal API token (`Authorization: Bearer tf_…`): `tokenHandle`
 * (in `hooks.server.ts`) resolves it before anything else, and the same checks then apply to the
 * token's member — its team, and its role capped by the token's scope. An unknown, revoked or
 * expired token is 401 at once; the session cookie is not consulted when a token is sent.
 * Every refusal carries the uniform error body (`errorBody` in `json-body.ts`).
 */
import { error, redirect, type Handle, type RequestEvent } from '@sveltejs/kit';
import { and, asc, eq } from 'drizzle-orm';
import type { AnyPgColumn, PgTable } from 'drizzle-orm/pg-core';
import { db } from './db/app.js';
import { memberships, teams, users, type Role } from './db/schema.js';
import { hasRole } from './roles.js';
import { errorBody, errorResponse } from './json-body.js';
import { authenticateToken, bearerToken } from './api/tokens.js';
import { apiRateLimiter } from './api/rate-limit.js';

export interface SignedInUser {
	id: string;
	email: string;
	name: string | null;
}

export interface Member {
	user: SignedInUser;
	team: typeof teams.$inferSelect;
	role: Role;
}

/** Cookie naming the team a member of several teams works in. */
export const TEAM_COOKIE = 'twofold_team';

/** The JSON API: never redirected, every answer JSON. */
export function isApiPath(pathname: string): boolean {
	return pathname === '/api/v1' || pathname.startsWith('/api/v1/');
}

function wantsPage(event: RequestEvent): boolean {
	if (event.request.method !== 'GET' && event.request.method !== 'HEAD') return false;
	if (isApiPath(event.url.pathname) || event.locals.apiToken) return false;
	if (event.isDataRequest) return true;
	const accept = event.request.headers.get('accept') ?? '';
	return accept.includes('text/html');
}

/** Throws the anonymous answer: redirect to sign-in for pages, 401 otherwise. */
export function rejectAnonymous(event: RequestEvent): never {
	if (wantsPage(event)) {
		const back = event.url.pathname + event.url.search;
		redirect(303, `/signin?redirectTo=${encodeURIComponent(back)}`);
	}
	const message = isApiPath(event.url.pathname) ? 'Send an API token (Authorization: Bearer tf_…) or sign in first.' : 'Sign in first.';
	error(401, errorBody('unauthorized', message));
}

/**
 * Resolves an `Authorization: Bearer …` token into the request's user and member, and applies the
 * per-token rate limit. Requests without the header pass untouched (cookie sessions as before).
 * Token requests need no Origin header: a third-party page cannot add an Authorization header to
 * a form post, and the API takes JSON (or CSV), which SvelteKit's cross-site form check leaves
 * alone. A form content type is still refused by that check (403, before any hook), token or not.
 */
export const tokenHandle: Handle = async ({ event, resolve }) => {
	const token = bearerToken(event.request.headers.get('authorization'));
	if (token === null) return resolve(event);
	const challenge = { 'www-authenticate': 'Bearer realm="twofold"' };
	if (token === false) return errorResponse(401, 'unauthorized', 'The Authorization header must be "Bearer <token>".', [], challenge);
	const auth = await authenticateToken(token);
	if (!auth.ok) return errorResponse(401, 'unauthorized', auth.message, [], challenge);
	const limit = apiRateLimiter().take(auth.token.id);
	if (!limit.ok) {
		const s = limit.retryAfterS;
		return errorResponse(429, 'rate_limited', `Too many requests with this token; try again in ${s} ${s === 1 ? 'second' : 'seconds'}.`, [], { 'retry-after': String(s) });
	}
	event.locals.apiToken = auth.token;
	event.locals.user = auth.member.user;
	event.locals.member = auth.member;
	return resolve(event);
};

/** The signed-in user, or null. Cached per request. */
export async function currentUser(event: RequestEvent): Promise<SignedInUser | null> {
	if (event.locals.user !== undefined) return event.locals.user;
	const session = await event.locals.auth();
	const id = session?.user?.id;
	let user: SignedInUser | null = null;
	if (id) {
		// the JWT may outlive the account: trust only a user that still exists
		const [row] = await db.select({ id: users.id, email: users.email, name: users.name }).from(users).where(eq(users.id, id));
		user = row ?? null;
	}
	event.locals.user = user;
	return user;
}

/** All teams the user belongs to, oldest membership first. */
export async function listMyTeams(userId: string) {
	return db
		.select({ team: teams, role: memberships.role })
		.from(memberships)
		.innerJoin(teams, eq(teams.id, memberships.teamId))
		.where(eq(memberships.userId, userId))
		.orderBy(asc(memberships.createdAt));
}

/** Remembers which team a member of several teams works in (only a team they belong to counts). */
export function chooseTeam(event: RequestEvent, teamId: string) {
	event.cookies.set(TEAM_COOKIE, teamId, { path: '/', httpOnly: true, sameSite: 'lax', maxAge: 365 * 24 * 3600 });
}

/** The caller's membership (team + role) without any role requirement, or null. Cached per request. */
export async function currentMember(event: RequestEvent): Promise<Member | null> {
	if (event.locals.member !== undefined) return event.locals.member;
	const user = await currentUser(event);
	let member: Member | null = null;
	if (user) {
		const rows = await listMyTeams(user.id);
		const chosen = event.cookies.get(TEAM_COOKIE);
		const row = rows.find((r) => r.team.id === chosen) ?? rows[0];
		if (row) member = { user, team: row.team, role: row.role };
	}
	event.locals.member = member;
	return member;
}

/**
 * Requires a signed-in member of a team with at least `role` (see `roles.ts` for the order).
 * A signed-in user without any team gets 403.
 */
export async function requireMember(event: RequestEvent, role: Role = 'viewer'): Promise<Member> {
	const user = await currentUser(event);
	if (!user) rejectAnonymous(event);
	const member = await currentMember(event);
	if (!member) error(403, errorBody('forbidden', 'You are not a member of any team yet. Ask an admin for an invitation.'));
	if (!hasRole(member.role, role)) {
		const readOnly = event.locals.apiToken?.scope === 'read' ? ' (this API token is read-only)' : '';
		error(403, errorBody('forbidden', `This needs the ${role} role; you are ${member.role}${readOnly}.`));
	}
	return member;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export function isUuid(value: string): boolean {
	return UUID.test(value);
}

type TeamOwnedTable = PgTable & { id: AnyPgColumn; teamId: AnyPgColumn };

/**
 * Loads one row of a team-owned table by id, or throws 404 when it does not exist, belongs to
 * another team, or the id is malformed: the answer never tells which.
 *
 *   const column = await requireTeamRow({ table: columns, id: params.id, teamId: member.team.id });
 */
export async function requireTeamRow<T extends TeamOwnedTable>(options: {
	table: T;
	id: string;
	teamId: string;
	what?: string;
}): Promise<T['$inferSelect']> {
	const { table, id, teamId } = options;
	const notFound = `${options.what ?? 'Item'} not found.`;
	if (!isUuid(id)) error(404, errorBody('not_found', notFound));
	const rows = (await db
		.select()
		.from(table as PgTable)
		.where(and(eq(table.id, id), eq(table.teamId, teamId)))
		.limit(1)) as T['$inferSelect'][];
	if (!rows[0]) error(404, errorBody('not_found', notFound));
	return rows[0];
}
