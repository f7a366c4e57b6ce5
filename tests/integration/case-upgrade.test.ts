import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { eq } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { cases, columns } from '../../src/lib/server/db/schema.js';
import { oneClassCase, validateCase, type CaseDocument } from '../../solver/case.js';
import { runToEnd } from '../../solver/index.js';
import { openTestDb } from '../helpers/db.js';
import { createTestTeam, type TestTeam } from '../helpers/team.js';

let handle: DbHandle;
let t: TestTeam;
let columnId: string;

beforeAll(async () => {
	handle = await openTestDb();
	t = await createTestTeam({ db: handle.db });
	const [c] = await handle.db.insert(columns).values({ teamId: t.team.id, tag: 'C-880', diameterM: 0.2, heightM: 2 }).returning();
	columnId = c.id;
});

afterAll(async () => {
	await handle?.close();
});

/** A stored version-1 document as the first release wrote it: complete, without the bubble-class fields. */
function versionOneDocument(): Record<string, unknown> {
	const d = JSON.parse(JSON.stringify(oneClassCase())) as Record<string, unknown> & { bubbles: Record<string, unknown> };
	d.schemaVersion = 1;
	d.bubbles = { sizing: 'fixed', diameterM: 0.004 };
	return d;
}

describe('migration 0003: stored version-1 cases', () => {
	it('become version 2 with one bubble class and keep their results', async () => {
		const v1 = versionOneDocument();
		const [row] = await handle.db
			.insert(cases)
			.values({ teamId: t.team.id, columnId, name: 'C-880 one size', kind: 'height-profile', schemaVersion: 1, document: v1 as unknown as CaseDocument })
			.returning();
		const before = runToEnd(v1);
		// the migration's statement, run again on this row (the test database applied it while empty)
		await handle.pool.query(readFileSync('drizzle/0003_upgrade-cases-bubble-classes.sql', 'utf8'));
		const [after] = await handle.db.select().from(cases).where(eq(cases.id, row.id));
		expect(after.schemaVersion).toBe(2);
		const doc = after.document as unknown as Record<string, unknown> & { bubbles: Record<string, unknown> };
		expect(doc.schemaVersion).toBe(2);
		expect(doc.bubbles).toEqual({ sizing: 'fixed', diameterM: 0.004, classes: 'single' });
		const v = validateCase(doc);
		expect(v.ok).toBe(true);
		const r = runToEnd(doc);
		expect(r.design.overallHoldup.value).toBe(before.design.overallHoldup.value);
		expect(r.step).toBe(before.step);
	});
});
