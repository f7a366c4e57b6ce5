import { error, fail } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { hasRole, isRole } from '$lib/server/roles';
import {
	MailNotSent,
	inviteForm,
	inviteMember,
	listMembers,
	listOpenInvitations,
	removeMember,
	revokeInvitation,
	setMaxStudyRuns,
	setRole,
	studyRunsForm
} from '$lib/server/team';
import { parseForm } from '$lib/server/forms';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db/app';
import { isUuid } from '$lib/server/guard';

/** Every member sees who is in the team; only admins see invitations and change anything. */
export const load: PageServerLoad = async (event) => {
	const { team, role, user } = await requireMember(event, 'viewer');
	const isAdmin = hasRole(role, 'admin');
	return {
		teamName: team.name,
		members: await listMembers(team.id),
		invitations: isAdmin ? await listOpenInvitations(team.id) : [],
		isAdmin,
		myUserId: user.id,
		maxStudyRuns: team.maxStudyRuns
	};
};

function str(data: FormData, name: string) {
	const v = data.get(name);
	return typeof v === 'string' ? v : '';
}

export const actions: Actions = {
	invite: async (event) => {
		const { team, user } = await requireMember(event, 'admin');
		const { data, values, failure } = parseForm(inviteForm, await event.request.formData());
		if (!data) return failure;
		try {
			await inviteMember({ teamId: team.id, teamName: team.name, invitedBy: user, email: data.email, role: data.role, origin: event.url.origin });
		} catch (e) {
			if (!(e instanceof MailNotSent)) throw e;
			console.error('[team] invitation mail not sent:', e.message);
			return fail(502, { values, errors: { email: 'The invitation e-mail could not be sent, so no invitation was made. Try again later.' } });
		}
		await audit(db, { teamId: team.id, userId: user.id, action: 'invitation.create', detail: { email: data.email, role: data.role } });
		return { invited: data.email, values: { ...values, email: '' } };
	},
	setRole: async (event) => {
		const { team, user } = await requireMember(event, 'admin');
		const data = await event.request.formData();
		const userId = str(data, 'userId');
		const role = str(data, 'role');
		if (!isRole(role)) return fail(400, { memberError: 'Choose a role.' });
		const problem = await setRole({ teamId: team.id, userId, role });
		if (problem === 'No such member.') error(404, problem);
		if (problem) return fail(400, { memberError: problem });
		await audit(db, { teamId: team.id, userId: user.id, action: 'member.role', subject: userId, detail: { role } });
		return { saved: true };
	},
	remove: async (event) => {
		const { team, user } = await requireMember(event, 'admin');
		const userId = str(await event.request.formData(), 'userId');
		const problem = await removeMember({ teamId: team.id, userId });
		if (problem === 'No such member.') error(404, problem);
		if (problem) return fail(400, { memberError: problem });
		await audit(db, { teamId: team.id, userId: user.id, action: 'member.remove', subject: userId });
		return { removed: true };
	},
	studyRuns: async (event) => {
		const { team, user } = await requireMember(event, 'admin');
		const { data, failure } = parseForm(studyRunsForm, await event.request.formData());
		if (!data) return failure;
		await setMaxStudyRuns({ teamId: team.id, maxStudyRuns: data.maxStudyRuns });
		await audit(db, {
			teamId: team.id,
			userId: user.id,
			action: 'team.maxStudyRuns',
			subject: team.id,
			detail: { from: team.maxStudyRuns, to: data.maxStudyRuns }
		});
		return { studyRunsSaved: data.maxStudyRuns };
	},
	revoke: async (event) => {
		const { team, user } = await requireMember(event, 'admin');
		const id = str(await event.request.formData(), 'invitationId');
		if (!isUuid(id)) error(404, 'Invitation not found.');
		// another team's invitation answers like an unknown one
		if (!(await revokeInvitation({ teamId: team.id, id }))) error(404, 'Invitation not found.');
		await audit(db, { teamId: team.id, userId: user.id, action: 'invitation.revoke', subject: id });
		return { revoked: true };
	}
};
