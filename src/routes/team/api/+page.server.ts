/** The API reference, drawn from the OpenAPI document itself (no copy to drift). Any member. */
import type { PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { openApiDocument } from '$lib/server/api/openapi';

export const load: PageServerLoad = async (event) => {
	await requireMember(event, 'viewer');
	return { doc: openApiDocument() };
};
