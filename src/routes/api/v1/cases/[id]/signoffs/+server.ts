/** GET / POST /api/v1/cases/[id]/signoffs — a case's sign-offs; a lead records a verdict. */
import { getCase } from '$lib/server/cases';
import { signOffEndpoints } from '$lib/server/api/signoff-endpoints';

const endpoints = signOffEndpoints({ subjectType: 'case', path: '/cases', what: 'Case', load: (teamId, id) => getCase({ teamId, id }) });

export const GET = endpoints.GET;
export const POST = endpoints.POST;
