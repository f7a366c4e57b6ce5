import { error, fail } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import type { Actions, PageServerLoad } from './$types';
import { db } from '$lib/server/db/app';
import { invitations, memberships, users } from '$lib/server/db/schema';
import { findOpenInvitation } from '$lib/server/team';
import { findUserByEmail } from '$lib/server/auth';
import { hashPassword, passwordProblem, verifyPassword } from '$lib/server/auth/passwords';
import { signInWithPassword } from '$lib/server/auth/actions';
import { audit } from '$lib/server/audit';
import { chooseTeam } from '$lib/server/guard';

const GONE = 'This invitation is unknown, already used or expired. Ask your team admin for a new one.';

export const load: PageServerLoad = async ({ params }) => {
	const found = await findOpenInvitation(params.token);
	if (!found) error(404, GONE);
	const existing = await findUserByEmail(found.invitation.email);
	return {
		email: found.invitation.email,
		role: found.invitation.role,
		teamName: found.team.name,
		hasAccount: !!existing?.passwordHash
	};
};

export const actions: Actions = {
	default: async (event) => {
		const found = await findOpenInvitation(event.params.token);
		if (!found) error(404, GONE);
		const { invitation } = found;
		const data = await event.request.formData();
		const password = String(data.get('password') ?? '');
		const name = String(data.get('name') ?? '').trim();
		const existing = await findUserByEmail(invitation.email);
		let userId: string;
		if (existing?.passwordHash) {
			// an account already exists: joining needs its password, not a new one
			if (!(await verifyPassword(existing.passwordHash, password))) {
				return fail(400, { name, errors: { password: 'That is not the password of this account.' } });
			}
			userId = existing.id;
		} else {
			const errors: Record<string, string> = {};
			if (!name) errors.name = 'Enter your name as your team should see it.';
			const problem = passwordProblem(password);
			if (problem) errors.password = problem;
			if (password !== String(data.get('confirm') ?? '')) errors.confirm ??= 'The two passwords differ.';
			if (Object.keys(errors).length) return fail(400, { name, errors });
			const passwordHash = await hashPassword(password);
			if (existing) {
				await db.update(users).set({ name, passwordHash, emailVerified: new Date() }).where(eq(users.id, existing.id));
				userId = existing.id;
			} else {
				const [u] = await db
					.insert(users)
					.values({ email: invitation.email, name, passwordHash, emailVerified: new Date() })
					.returning({ id: users.id });
				userId = u.id;
			}
		}
		await db.transaction(async (tx) => {
			await tx
				.insert(memberships)
				.values({ teamId: invitation.teamId, userId, role: invitation.role })
				.onConflictDoNothing();
			await tx.update(invitations).set({ acceptedAt: new Date() }).where(and(eq(invitations.id, invitation.id)));
		});
		// someone who is already in another team lands in the team they just joined
		chooseTeam(event, invitation.teamId);
		await audit(db, { teamId: invitation.teamId, userId, action: 'invitation.accept', subject: invitation.id, detail: { role: invitation.role } });
		return signInWithPassword(event, { email: invitation.email, password, redirectTo: '/' });
	}
};
