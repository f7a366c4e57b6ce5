import { describe, expect, it } from 'vitest';
import { defaultCase, SCHEMA_VERSION } from '../../solver/case.js';
import { caseFromJson, caseToJson } from '../../src/lib/measurements/case-json.js';

describe('case JSON export and import', () => {
	it('round-trips a default and an edited case unchanged', () => {
		for (const c of [defaultCase('height-profile'), defaultCase('cross-section')]) {
			const back = caseFromJson(caseToJson(c));
			expect(back).toEqual({ ok: true, value: c });
		}
		const edited = defaultCase();
		edited.name = 'C-201 pilot, 5 cm/s';
		edited.sparging.superficialGasVelocityMS = 0.0512345678901234;
		edited.closures.drag = 'tomiyama-contaminated';
		edited.numerics.cells = 400;
		const text = caseToJson(edited);
		expect(text.startsWith(`{\n\t"schemaVersion": ${SCHEMA_VERSION},`)).toBe(true);
		expect(caseFromJson(text)).toEqual({ ok: true, value: edited });
	});

	it('refuses a newer schemaVersion with a clear message', () => {
		const doc = { ...defaultCase(), schemaVersion: SCHEMA_VERSION + 1 };
		const r = caseFromJson(JSON.stringify(doc));
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.issues[0]).toEqual({ path: 'schemaVersion', message: `This document has schemaVersion ${SCHEMA_VERSION + 1}, newer than this Twofold understands (${SCHEMA_VERSION})` });
	});

	it('refuses an unknown or missing schemaVersion and text that is not a case', () => {
		const { schemaVersion: _v, ...noVersion } = defaultCase();
		expect(caseFromJson(JSON.stringify(noVersion))).toEqual({
			ok: false,
			issues: [{ path: 'schemaVersion', message: 'The document has no schemaVersion, so it is not a Twofold case document' }]
		});
		expect(caseFromJson(JSON.stringify({ ...defaultCase(), schemaVersion: '1' }))).toEqual({
			ok: false,
			issues: [{ path: 'schemaVersion', message: `The document has an unknown schemaVersion ("1"); this Twofold reads version ${SCHEMA_VERSION}` }]
		});
		expect(caseFromJson(JSON.stringify({ ...defaultCase(), schemaVersion: 0 })).ok).toBe(false);
		const bad = caseFromJson('{"schemaVersion": 1,');
		expect(bad.ok === false && bad.issues[0].message).toMatch(/^The file is not valid JSON: /);
		expect(caseFromJson('[1,2]')).toEqual({ ok: false, issues: [{ path: '', message: 'The file does not hold a case document (a JSON object)' }] });
	});

	it('refuses a case whose fields break the schema, naming the field', () => {
		const c = defaultCase();
		const doc = JSON.parse(caseToJson(c));
		doc.geometry.heightM = -1;
		const r = caseFromJson(JSON.stringify(doc));
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.issues).toContainEqual({ path: 'geometry.heightM', message: 'Column height must be at least 0.1 m' });
	});
});
