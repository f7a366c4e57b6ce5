/**
 * Demo seed: an invented team of an invented plant, one user per role, a few invented columns,
 * and with `work` the finished demo work of `demo-work.ts` (real runs, a comparison awaiting
 * sign-off, a sweep, invented uploads labelled as demo data). Runs once: the team is made only
 * when it does not exist, the work only when its pilot column has no cases. Local installs only.
 *
 * Standalone: `npx tsx src/lib/server/seed.ts [--with-work]` (reads DATABASE_URL); `npm start`
 * passes `--with-work`, `npm test` does not (tests that want the work ask for it).
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { eq } from 'drizzle-orm';
import { createDb, type Db } from './db/index.js';
import { columns, memberships, teams, users, type Role } from './db/schema.js';
import { seedDemoWork } from './demo-work.js';
import { hashPassword } from './auth/passwords.js';

export const DEMO_TEAM_SLUG = 'marrow-bay';
/** Local-only demo credentials; printed by `npm start` and listed in the README. */
export const DEMO_PASSWORD = 'bubbles-demo-1';
export const DEMO_USERS: { role: Role; email: string; name: string }[] = [
	{ role: 'viewer', email: 'viewer@marrowbay.test', name: 'Vera Lindqvist' },
	{ role: 'analyst', email: 'analyst@marrowbay.test', name: 'Amadou Keane' },
	{ role: 'lead', email: 'lead@marrowbay.test', name: 'Lena Okafor' },
	{ role: 'admin', email: 'admin@marrowbay.test', name: 'Ariel Brandt' }
];

const DEMO_COLUMNS = [
	{ tag: 'C-101', service: 'Pilot aeration column, air into tap water', diameterM: 0.15, heightM: 2.0, notes: 'Perspex pilot in the Marrow Bay test hall; fine-pore plate sparger.' },
	{ tag: 'R-201', service: 'Oxidation column, air into aqueous feed', diameterM: 1.2, heightM: 9.0, notes: 'Operates at 4 bar(g); ring sparger with 120 orifices.' },
	{ tag: 'C-305', service: 'CO2 stripper, process water', diameterM: 0.8, heightM: 6.0, notes: '' }
];

export async function seedDemo(db: Db, options: { work?: boolean } = {}): Promise<{ created: boolean; workRuns: number }> {
	const [existing] = await db.select({ id: teams.id }).from(teams).where(eq(teams.slug, DEMO_TEAM_SLUG));
	let teamId = existing?.id ?? null;
	if (!teamId) {
		const passwordHash = await hashPassword(DEMO_PASSWORD);
		teamId = await db.transaction(async (tx) => {
			const [team] = await tx.insert(teams).values({ name: 'Marrow Bay Process Group', slug: DEMO_TEAM_SLUG }).returning();
			let analystId: string | null = null;
			for (const u of DEMO_USERS) {
				const [user] = await tx
					.insert(users)
					.values({ email: u.email, name: u.name, passwordHash, emailVerified: new Date() })
					.returning();
				await tx.insert(memberships).values({ teamId: team.id, userId: user.id, role: u.role });
				if (u.role === 'analyst') analystId = user.id;
			}
			await tx.insert(columns).values(DEMO_COLUMNS.map((c) => ({ ...c, teamId: team.id, createdBy: analystId })));
			return team.id;
		});
	}
	let workRuns = 0;
	if (options.work) {
		const people = await db
			.select({ id: users.id, email: users.email })
			.from(users)
			.innerJoin(memberships, eq(memberships.userId, users.id))
			.where(eq(memberships.teamId, teamId));
		const idOf = (role: Role) => people.find((p) => p.email === DEMO_USERS.find((u) => u.role === role)?.email)?.id;
		const analystId = idOf('analyst');
		const leadId = idOf('lead');
		if (analystId && leadId) workRuns = (await seedDemoWork(db, { teamId, analystId, leadId }))?.runs ?? 0;
	}
	return { created: !existing, workRuns };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
	const handle = createDb({ max: 1, applicationName: 'twofold-seed' });
	seedDemo(handle.db, { work: process.argv.includes('--with-work') })
		.then((r) => {
			console.error(r.created ? '[seed] demo team created' : '[seed] demo team already there');
			if (r.workRuns) console.error(`[seed] demo work computed: ${r.workRuns} runs`);
		})
		.catch((e) => {
			console.error(`[seed] failed: ${e.message}`);
			process.exitCode = 1;
		})
		.finally(() => handle.close());
}
