import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { eq } from 'drizzle-orm';
import type { DbHandle } from '../../src/lib/server/db/index.js';
import { cases, columns } from '../../src/lib/server/db/schema.js';
import { defaultCase, oneClassCase, validateCase, type CaseDocument } from '../../solver/case.js';
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

describe('migration 0007: stored version-2 cross-sections', () => {
	it('become version 3 with one bubble class, as version 2 computed them; height profiles only take the number', async () => {
		const cross = { ...defaultCase('cross-section'), schemaVersion: 2, name: 'C-880 section' };
		cross.numerics.endTimeS = 2;
		const height = { ...defaultCase('height-profile'), schemaVersion: 2, name: 'C-880 profile' };
		const insert = async (doc: Record<string, unknown> & { kind: CaseDocument['kind'] }) =>
			(
				await handle.db
					.insert(cases)
					.values({ teamId: t.team.id, columnId, name: String(doc.name), kind: doc.kind, schemaVersion: 2, document: doc as unknown as CaseDocument })
					.returning()
			)[0];
		const [rc, rh] = [await insert(cross), await insert(height)];
		// the one bubble size version 2 computed the section with
		const single = { ...cross, schemaVersion: 3, bubbles: { ...cross.bubbles, classes: 'single' as const } };
		const before = runToEnd(single);
		await handle.pool.query(readFileSync('drizzle/0007_upgrade-cross-section-classes.sql', 'utf8'));
		const [ac] = await handle.db.select().from(cases).where(eq(cases.id, rc.id));
		const [ah] = await handle.db.select().from(cases).where(eq(cases.id, rh.id));
		expect([ac.schemaVersion, ah.schemaVersion]).toEqual([3, 3]);
		const dc = ac.document as unknown as CaseDocument;
		const dh = ah.document as unknown as CaseDocument;
		expect(dc.schemaVersion).toBe(3);
		expect(dc.bubbles).toEqual({ ...cross.bubbles, classes: 'single' });
		expect(dh).toEqual({ ...height, schemaVersion: 3 });
		expect(validateCase(dc).ok).toBe(true);
		const after = runToEnd(dc);
		expect(after.step).toBe(before.step);
		expect(after.design.centrelineLiquidVelocityMS.value).toBe(before.design.centrelineLiquidVelocityMS.value);
		expect(after.profiles.fields.holdupLarge).toBeUndefined();
	});
});
