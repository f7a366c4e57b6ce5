import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireMember } from '$lib/server/guard';
import { verificationStatus } from '$lib/server/verification';

/** The verification's state without its results, as JSON: the page polls it while a worker computes. */
export const GET: RequestHandler = async (event) => {
	await requireMember(event, 'viewer');
	return json({ verification: await verificationStatus() }, { headers: { 'cache-control': 'no-store' } });
};
