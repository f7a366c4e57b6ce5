/**
 * `GET` and `POST /api/v1/<subjects>/{id}/signoffs` for the three things a lead signs off (case,
 * comparison, study): the same roles, form schema and e-mail as the pages' `signOff` action
 * (`verdict-actions.ts`), only the subject differs.
 */
import type { RequestEvent, RequestHandler } from '@sveltejs/kit';
import { requireMember } from '../guard.js';
import { readBody } from '../json-body.js';
import * as signoffs from '../signoffs.js';
import { notFound, ok } from './http.js';
import { signOffView } from './schemas.js';

type IdEvent = RequestEvent<{ id: string }>;

export function signOffEndpoints(o: {
	subjectType: signoffs.SubjectType;
	/** URL path of the subject's page without its id, e.g. `/cases` (for the e-mail's link) */
	path: string;
	/** what to call it in a 404 */
	what: string;
	/** the subject of this team, or null */
	load: (teamId: string, id: string) => Promise<{ id: string; name: string } | null>;
}): { GET: RequestHandler<{ id: string }>; POST: RequestHandler<{ id: string }> } {
	const GET = async (event: IdEvent) => {
		const member = await requireMember(event, 'viewer');
		const subject = await o.load(member.team.id, event.params.id);
		if (!subject) return notFound(o.what);
		const list = await signoffs.listSignOffs({ teamId: member.team.id, subjectType: o.subjectType, subjectId: subject.id });
		return ok({ items: list.map(signOffView) });
	};
	const POST = async (event: IdEvent) => {
		const member = await requireMember(event, 'lead');
		const subject = await o.load(member.team.id, event.params.id);
		if (!subject) return notFound(o.what);
		const body = await readBody(event.request, signoffs.signOffForm);
		if (!body.ok) return body.response;
		const r = await signoffs.signOff({
			teamId: member.team.id,
			subjectType: o.subjectType,
			subjectId: subject.id,
			subjectName: subject.name,
			subjectUrl: `${event.url.origin}${o.path}/${subject.id}`,
			userId: member.user.id,
			signerEmail: member.user.email,
			...body.data
		});
		const [newest] = await signoffs.listSignOffs({ teamId: member.team.id, subjectType: o.subjectType, subjectId: subject.id });
		return ok({ signOff: signOffView(newest), mailedTo: r.mailedTo, mailError: r.mailError }, { status: 201 });
	};
	return { GET, POST };
}
