import { error, fail } from '@sveltejs/kit';
import { and, eq, gt, isNull } from 'drizzle-orm';
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
		let passwordHash: string | null = null;
		if (existing?.passwordHash) {
			// an account already exists: joining needs its password, not a new one
			if (!(await verifyPassword(existing.passwordHash, password))) {
				return fail(400, { name, errors: { password: 'That is not the password of this account.' } });
			}
		} else {
			const errors: Record<string, string> = {};
			if (!name) errors.name = 'Enter your name as your team should see it.';
			const problem = passwordProblem(password);
			if (problem) errors.password = problem;
			if (password !== String(data.get('confirm') ?? '')) errors.confirm ??= 'The two passwords differ.';
			if (Object.keys(errors).length) return fail(400, { name, errors });
			passwordHash = await hashPassword(password);
		}
		// the token works once: taking the invitation, the account and the membership are one
		// transaction, so of two requests at the same moment only one finds the invitation still open
		const userId = await db.transaction(async (tx) => {
			const [taken] = await tx
				.update(invitations)
				.set({ acceptedAt: new Date() })
				.where(and(eq(invitations.id, invitation.id), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())))
				.returning({ id: invitations.id });
			if (!taken) return null;
			let id: string;
			if (existing && !passwordHash) id = existing.id;
			else if (existing) {
				await tx.update(users).set({ name, passwordHash, emailVerified: new Date() }).where(eq(users.id, existing.id));
				id = existing.id;
			} else {
				const [u] = await tx
					.insert(users)
					.values({ email: invitation.email, name, passwordHash, emailVerified: new Date() })
					.returning({ id: users.id });
				id = u.id;
			}
			await tx.insert(memberships).values({ teamId: invitation.teamId, userId: id, role: invitation.role }).onConflictDoNothing();
			return id;
		});
		if (!userId) error(404, GONE);
		// someone who is already in another team lands in the team they just joined
		chooseTeam(event, invitation.teamId);
		await audit(db, { teamId: invitation.teamId, userId, action: 'invitation.accept', subject: invitation.id, detail: { role: invitation.role } });
		return signInWithPassword(event, { email: invitation.email, password, redirectTo: '/' });
	}
};
