/**
 * Roles, ordered: each role can do everything the roles before it can.
 * viewer reads and comments; analyst edits columns, cases, measurements and runs;
 * lead builds comparisons and signs off; admin manages the team (members, roles, invitations, mail box).
 */
import type { Role } from './db/schema.js';

export type { Role };
export const ROLES: readonly Role[] = ['viewer', 'analyst', 'lead', 'admin'];

export function roleRank(role: Role): number {
	return ROLES.indexOf(role);
}

export function hasRole(actual: Role, needed: Role): boolean {
	return roleRank(actual) >= roleRank(needed);
}

export function isRole(value: unknown): value is Role {
	return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

export const ROLE_LABELS: Record<Role, string> = {
	viewer: 'Viewer',
	analyst: 'Analyst',
	lead: 'Lead',
	admin: 'Admin'
};
