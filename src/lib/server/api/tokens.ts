/**
 * Personal API tokens: each member creates, names, lists and revokes their own; admins see and
 * revoke every token of their team. A token acts for exactly one membership (team + member) and
 * never with more than the member's current role: scope `read` caps it at viewer, scope `role`
 * is the member's role as it is at the time of each request (a demoted member's tokens are demoted
 * with them; a removed member's tokens stop working).
 *
 * Format: `tf_` + 32 random bytes in base64url (43 characters). Only the SHA-256 of the token is
 * stored: the token is a high-entropy random secret, so a fast digest is as safe as a slow password
 * hash (nothing to guess), and the digest is what a request is looked up by — one indexed equality,
 * no per-row comparison. The first characters (`prefix`) stay readable to tell tokens apart.
 */
import { createHash, randomBytes } from 'node:crypto';
import { and, desc, eq, isNull } from 'drizzle-orm';
import { z } from 'zod';
import { db } from '../db/app.js';
import { apiTokens, memberships, teams, users } from '../db/schema.js';
import { audit } from '../audit.js';
import type { Member } from '../guard.js';

export const TOKEN_PREFIX = 'tf_';
/** how many leading characters of a token are kept readable */
export const PREFIX_LENGTH = 10;
const TOKEN_SHAPE = /^tf_[A-Za-z0-9_-]{43}$/;
/** `last_used_at` is written at most this often per token */
const LAST_USED_EVERY_MS = 60_000;

export type TokenScope = (typeof apiTokens.scope.enumValues)[number];
export type ApiToken = typeof apiTokens.$inferSelect;

/** What a request authenticated by a token knows about it (`event.locals.apiToken`). */
export interface ApiTokenInfo {
	id: string;
	name: string;
	prefix: string;
	scope: TokenScope;
}

export function generateToken(): string {
	return TOKEN_PREFIX + randomBytes(32).toString('base64url');
}

/** SHA-256, hex: the stored form and the lookup key (see the header for why no slow hash). */
export function tokenDigest(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

/** The first day a token may expire on: tomorrow (UTC). */
function tomorrowUtc(now = new Date()): string {
	const d = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate() + 1));
	return d.toISOString().slice(0, 10);
}

/**
 * The new-token form. `expiresOn` is an optional date (YYYY-MM-DD, after today): the token stops
 * working at the start of that day, UTC.
 */
export const tokenForm = z.object({
	name: z
		.string({ error: 'Give the token a name.' })
		.trim()
		.min(1, { error: 'Give the token a name, e.g. "pilot notebook".' })
		.max(80, { error: 'Keep the name to 80 characters.' }),
	scope: z.enum(['read', 'role'], { error: 'Choose read-only or your role.' }),
	expiresOn: z
		.string()
		.trim()
		.default('')
		.refine((s) => s === '' || (/^\d{4}-\d{2}-\d{2}$/.test(s) && !Number.isNaN(Date.parse(`${s}T00:00:00Z`))), { error: 'Enter a date (YYYY-MM-DD) or leave it empty.' })
		.refine((s) => s === '' || s >= tomorrowUtc(), { error: 'The expiry must be a date after today.' })
		.transform((s) => (s === '' ? null : new Date(`${s}T00:00:00Z`)))
});
export type TokenInput = z.output<typeof tokenForm>;

/** Creates a token for the member in their current team; the plain token is returned only here. */
export async function createToken(o: { teamId: string; userId: string; input: TokenInput }): Promise<{ token: string; row: ApiToken }> {
	const token = generateToken();
	const [row] = await db
		.insert(apiTokens)
		.values({
			teamId: o.teamId,
			userId: o.userId,
			name: o.input.name,
			prefix: token.slice(0, PREFIX_LENGTH),
			tokenHash: tokenDigest(token),
			scope: o.input.scope,
			expiresAt: o.input.expiresOn
		})
		.returning();
	await audit(db, {
		teamId: o.teamId,
		userId: o.userId,
		action: 'apiToken.create',
		subject: row.id,
		detail: { name: row.name, prefix: row.prefix, scope: row.scope, expiresAt: row.expiresAt?.toISOString() ?? null }
	});
	return { token, row };
}

export type TokenState = 'active' | 'expired' | 'revoked';

export function tokenState(t: Pick<ApiToken, 'revokedAt' | 'expiresAt'>, now = new Date()): TokenState {
	if (t.revokedAt) return 'revoked';
	if (t.expiresAt && t.expiresAt <= now) return 'expired';
	return 'active';
}

export interface TokenListItem {
	id: string;
	name: string;
	prefix: string;
	scope: TokenScope;
	state: TokenState;
	createdAt: Date;
	expiresAt: Date | null;
	lastUsedAt: Date | null;
	revokedAt: Date | null;
	owner: { id: string; email: string; name: string | null };
}

/** The member's own tokens, or (`all`, admins) every token of the team; newest first. */
export async function listTokens(o: { teamId: string; userId: string; all: boolean }): Promise<TokenListItem[]> {
	const rows = await db
		.select({ token: apiTokens, owner: { id: users.id, email: users.email, name: users.name } })
		.from(apiTokens)
		.innerJoin(users, eq(users.id, apiTokens.userId))
		.where(and(eq(apiTokens.teamId, o.teamId), o.all ? undefined : eq(apiTokens.userId, o.userId)))
		.orderBy(desc(apiTokens.createdAt));
	const now = new Date();
	return rows.map(({ token: t, owner }) => ({
		id: t.id,
		name: t.name,
		prefix: t.prefix,
		scope: t.scope,
		state: tokenState(t, now),
		createdAt: t.createdAt,
		expiresAt: t.expiresAt,
		lastUsedAt: t.lastUsedAt,
		revokedAt: t.revokedAt,
		owner
	}));
}

/**
 * Revokes a token: the member's own, or any of the team's for an admin. Null when there is no such
 * token for this caller (another member's token, another team's, or a malformed id), so the page
 * answers 404 without telling which. Revoking a revoked token changes nothing.
 */
export async function revokeToken(o: { teamId: string; actorId: string; isAdmin: boolean; id: string }): Promise<ApiToken | null> {
	if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(o.id)) return null;
	const [t] = await db
		.select()
		.from(apiTokens)
		.where(and(eq(apiTokens.id, o.id), eq(apiTokens.teamId, o.teamId), o.isAdmin ? undefined : eq(apiTokens.userId, o.actorId)));
	if (!t) return null;
	if (t.revokedAt) return t;
	const [row] = await db
		.update(apiTokens)
		.set({ revokedAt: new Date() })
		.where(and(eq(apiTokens.id, t.id), isNull(apiTokens.revokedAt)))
		.returning();
	await audit(db, {
		teamId: o.teamId,
		userId: o.actorId,
		action: 'apiToken.revoke',
		subject: t.id,
		detail: { name: t.name, prefix: t.prefix, ownerId: t.userId }
	});
	return row ?? t;
}

export type TokenAuthentication = { ok: true; member: Member; token: ApiTokenInfo } | { ok: false; message: string };

/**
 * The member a presented token acts for, or why it does not count (unknown, revoked, expired,
 * or its member left the team). Scope `read` acts as a viewer whatever the member's role.
 */
export async function authenticateToken(token: string, now = new Date()): Promise<TokenAuthentication> {
	if (!TOKEN_SHAPE.test(token)) return { ok: false, message: 'This API token is not valid.' };
	const [row] = await db
		.select({
			token: apiTokens,
			user: { id: users.id, email: users.email, name: users.name },
			team: teams,
			role: memberships.role
		})
		.from(apiTokens)
		.innerJoin(users, eq(users.id, apiTokens.userId))
		.innerJoin(teams, eq(teams.id, apiTokens.teamId))
		.leftJoin(memberships, and(eq(memberships.teamId, apiTokens.teamId), eq(memberships.userId, apiTokens.userId)))
		.where(eq(apiTokens.tokenHash, tokenDigest(token)))
		.limit(1);
	if (!row) return { ok: false, message: 'This API token is not valid.' };
	const t = row.token;
	if (t.revokedAt) return { ok: false, message: 'This API token was revoked.' };
	if (t.expiresAt && t.expiresAt <= now) return { ok: false, message: `This API token expired on ${t.expiresAt.toISOString().slice(0, 10)}.` };
	if (!row.role) return { ok: false, message: 'The member of this API token is no longer in its team.' };
	if (!t.lastUsedAt || now.getTime() - t.lastUsedAt.getTime() >= LAST_USED_EVERY_MS) {
		await db.update(apiTokens).set({ lastUsedAt: now }).where(eq(apiTokens.id, t.id));
	}
	return {
		ok: true,
		member: { user: row.user, team: row.team, role: t.scope === 'read' ? 'viewer' : row.role },
		token: { id: t.id, name: t.name, prefix: t.prefix, scope: t.scope }
	};
}

/** The token of an `Authorization: Bearer …` header; null without the header; `false` for another scheme. */
export function bearerToken(header: string | null): string | null | false {
	if (header === null) return null;
	const m = /^Bearer[ ]+(\S+)\s*$/i.exec(header.trim());
	return m ? m[1] : false;
}
