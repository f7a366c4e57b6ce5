/**
 * Fresh teams for tests: a team with one member per role, unique names, known passwords.
 * Every test file makes its own team, so files never see each other's data.
 */
import { randomBytes } from 'node:crypto';
import { hash } from '@node-rs/argon2';
import type { Db } from '../../src/lib/server/db/index.js';
import { memberships, teams, users, type Role } from '../../src/lib/server/db/schema.js';

export const TEST_PASSWORD = 'correct-horse-battery';
export const ALL_ROLES: Role[] = ['viewer', 'analyst', 'lead', 'admin'];

export interface TestUser {
	id: string;
	email: string;
	password: string;
	role: Role;
}

export interface TestTeam {
	team: typeof teams.$inferSelect;
	members: Record<Role, TestUser>;
}

let passwordHash: Promise<string> | null = null;

/** Creates a team with one user per role (emails like `analyst-<random>@test.invalid`). */
export async function createTestTeam(options: { db: Db; name?: string }): Promise<TestTeam> {
	const suffix = randomBytes(4).toString('hex');
	passwordHash ??= hash(TEST_PASSWORD);
	const pw = await passwordHash;
	const [team] = await options.db
		.insert(teams)
		.values({ name: options.name ?? `Test team ${suffix}`, slug: `test-${suffix}` })
		.returning();
	const members = {} as Record<Role, TestUser>;
	for (const role of ALL_ROLES) {
		const email = `${role}-${suffix}@test.invalid`;
		const [user] = await options.db.insert(users).values({ email, name: `${role} ${suffix}`, passwordHash: pw }).returning();
		await options.db.insert(memberships).values({ teamId: team.id, userId: user.id, role });
		members[role] = { id: user.id, email, password: TEST_PASSWORD, role };
	}
	return { team, members };
}
