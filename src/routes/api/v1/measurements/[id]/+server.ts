/**
 * GET /api/v1/measurements/[id] — one measurement with its points (SI).
 * DELETE /api/v1/measurements/[id] — delete it (audited, as on the page); analysts and up.
 */
import { requireMember, isUuid } from '$lib/server/guard';
import { deleteMeasurement, getMeasurement } from '$lib/server/measurements';
import { notFound, ok } from '$lib/server/api/http';
import { measurementDetailView } from '$lib/server/api/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const m = await getMeasurement({ teamId: team.id, id: event.params.id });
	if (!m) return notFound('Measurement');
	return ok(measurementDetailView(m));
};

export const DELETE: RequestHandler = async (event) => {
	const { team, user } = await requireMember(event, 'analyst');
	if (!isUuid(event.params.id) || !(await deleteMeasurement({ teamId: team.id, userId: user.id, id: event.params.id }))) return notFound('Measurement');
	return new Response(null, { status: 204 });
};
