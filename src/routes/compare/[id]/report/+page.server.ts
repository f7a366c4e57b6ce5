import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { isUuid, requireMember } from '$lib/server/guard';
import { loadComparisonReport } from '$lib/server/report';

export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	if (!isUuid(event.params.id)) error(404, 'Comparison not found.');
	const report = await loadComparisonReport({ teamId: team.id, comparisonId: event.params.id });
	if (!report) error(404, 'Comparison not found.');
	return { report, generatedAt: new Date() };
};
