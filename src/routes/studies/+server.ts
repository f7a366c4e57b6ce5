/**
 * POST /studies — create and queue a study: JSON `{ caseId, name, spec, measurementId? }` with the
 * spec in SI (src/lib/studies/spec.ts), e.g.
 *   { "caseId": "…", "name": "U_g sweep", "spec": { "kind": "sweep", "axes": [{ "input": "superficialGasVelocityMS", "spacing": "list", "values": [0.02, 0.05, 0.1] }] } }
 * → 201 `{ study: { id, name, kind, memberCount }, members: [{ id, index, label }] }`.
 * Refusals (400/404/429) use the uniform error body naming the fields. Analysts and up.
 */
import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { codeForStatus, errorResponse, readBody } from '$lib/server/json-body';
import * as studyServer from '$lib/server/studies';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => {
	const member = await requireMember(event, 'analyst');
	const body = await readBody(event.request, studyServer.studyInputSchema);
	if (!body.ok) return body.response;
	try {
		const { study, members } = await studyServer.create({ teamId: member.team.id, userId: member.user.id, input: body.data });
		return json(
			{
				study: { id: study.id, name: study.name, kind: study.kind, memberCount: study.memberCount, columnId: study.columnId, caseId: study.caseId },
				members: members.map((m) => ({ id: m.id, index: m.studyIndex, label: m.studyPoint?.label ?? '' }))
			},
			{ status: 201 }
		);
	} catch (e) {
		if (e instanceof studyServer.StudyRequestError) return errorResponse(e.status, codeForStatus(e.status), e.message, e.issues);
		throw e;
	}
};
