import type { PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { db } from '$lib/server/db/app';
import { listAuditLog } from '$lib/server/audit';

/** The team's audit log: role changes, invitations, sign-offs, deletions and API tokens. Admins only. */
export const load: PageServerLoad = async (event) => {
	const { team } = await requireMember(event, 'admin');
	return { entries: await listAuditLog(db, { teamId: team.id, limit: 1000 }) };
};
