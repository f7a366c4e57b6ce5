import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { isUuid, requireMember } from '$lib/server/guard';
import { loadComparisonReport } from '$lib/server/report';
import { verificationVersion, verificationViews } from '$lib/server/verification';

export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'viewer');
	if (!isUuid(event.params.id)) error(404, 'Comparison not found.');
	const report = await loadComparisonReport({ teamId: team.id, comparisonId: event.params.id });
	if (!report) error(404, 'Comparison not found.');
	// the verification of the solver versions that produced the runs, as cached (never queued from here)
	const verification = await verificationViews(
		report.runs.map((r) => r.solverVersion),
		{ charts: false }
	);
	return { report, generatedAt: new Date(), verification, appSolverVersion: verificationVersion() };
};
