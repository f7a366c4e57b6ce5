/** GET /api/v1/openapi.json — the OpenAPI 3.1 document of this API (generated from its zod schemas). */
import { requireMember } from '$lib/server/guard';
import { ok } from '$lib/server/api/http';
import { openApiDocument } from '$lib/server/api/openapi';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	await requireMember(event, 'viewer');
	return ok(openApiDocument(), { headers: { 'cache-control': 'private, no-cache' } });
};
