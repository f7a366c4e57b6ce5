/** GET /api/v1/comparisons/[id] — one comparison with the design numbers of its runs. */
import { requireMember } from '$lib/server/guard';
import * as comparisons from '$lib/server/comparisons';
import { notFound, ok } from '$lib/server/api/http';
import { comparisonDetail } from '$lib/server/api/comparison-views';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	const c = await comparisons.getComparison({ teamId: team.id, id: event.params.id });
	if (!c) return notFound('Comparison');
	return ok(await comparisonDetail(team.id, c));
};
