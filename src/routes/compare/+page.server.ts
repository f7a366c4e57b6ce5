import type { PageServerLoad } from './$types';
import { eq } from 'drizzle-orm';
import { requireMember } from '$lib/server/guard';
import { hasRole } from '$lib/server/roles';
import { db } from '$lib/server/db/app';
import { columns } from '$lib/server/db/schema';
import * as comparisons from '$lib/server/comparisons';

/** Every comparison of the team, and (for leads) where to start a new one. */
export const load: PageServerLoad = async (event) => {
	const { team, role } = await requireMember(event, 'viewer');
	const cols = await db.select({ id: columns.id, tag: columns.tag }).from(columns).where(eq(columns.teamId, team.id)).orderBy(columns.tag);
	const list = await comparisons.listComparisons({ teamId: team.id });
	const tagOf = new Map(cols.map((c) => [c.id, c.tag]));
	return {
		comparisons: list.map((c) => ({ ...c, columnTag: tagOf.get(c.columnId) ?? '?' })),
		columns: cols,
		canBuild: hasRole(role, 'lead')
	};
};
