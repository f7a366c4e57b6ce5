/** GET / POST /api/v1/comparisons/[id]/signoffs — a comparison's sign-offs; a lead records a verdict. */
import { getComparison } from '$lib/server/comparisons';
import { signOffEndpoints } from '$lib/server/api/signoff-endpoints';

const endpoints = signOffEndpoints({ subjectType: 'comparison', path: '/compare', what: 'Comparison', load: (teamId, id) => getComparison({ teamId, id }) });

export const GET = endpoints.GET;
export const POST = endpoints.POST;
