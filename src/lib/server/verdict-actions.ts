/**
 * The sign-off and comment form actions shared by the pages of the two things a lead can sign off
 * (a case and a comparison): the same roles, form checks and e-mail, only the subject differs.
 */
import { fail, type RequestEvent } from '@sveltejs/kit';
import { requireMember } from './guard.js';
import { formValues } from './forms.js';
import * as signoffs from './signoffs.js';

export function verdictActions<E extends RequestEvent>(options: {
	subjectType: signoffs.SubjectType;
	/** URL path of the subject's page without its id, e.g. `/cases` */
	path: string;
	/** the subject of this team, or throws 404 */
	load: (event: E, teamId: string) => Promise<{ id: string; name: string }>;
}) {
	const { subjectType, path, load } = options;
	return {
		signOff: async (event: E) => {
			const member = await requireMember(event, 'lead');
			const subject = await load(event, member.team.id);
			const values = formValues(await event.request.formData());
			const parsed = signoffs.signOffForm.safeParse(values);
			if (!parsed.success) {
				return fail(400, { signOff: { values, errors: Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.') || 'verdict', i.message])) } });
			}
			const r = await signoffs.signOff({
				teamId: member.team.id,
				subjectType,
				subjectId: subject.id,
				subjectName: subject.name,
				subjectUrl: `${event.url.origin}${path}/${subject.id}`,
				userId: member.user.id,
				signerEmail: member.user.email,
				...parsed.data
			});
			return { signedOff: true, mailedTo: r.mailedTo, mailError: r.mailError };
		},
		comment: async (event: E) => {
			const member = await requireMember(event, 'viewer');
			const subject = await load(event, member.team.id);
			const values = formValues(await event.request.formData());
			const parsed = signoffs.commentForm.safeParse(values);
			if (!parsed.success) return fail(400, { comment: { values, errors: { body: parsed.error.issues[0].message } } });
			await signoffs.addComment({ teamId: member.team.id, subjectType, subjectId: subject.id, userId: member.user.id, body: parsed.data.body });
			return { commented: true };
		}
	};
}
