import { describe, expect, it } from 'vitest';
import { fields, isShown } from '../../src/lib/components/case-editor/fields';
import { defaultCase } from '../../solver/case';

describe('case editor fields read from the case schema', () => {
	it('lists every numeric field with its SI unit and range from the schema', () => {
		const h = fields.find((f) => f.path === 'geometry.heightM');
		expect(h).toMatchObject({ kind: 'number', unit: 'm', min: 0.1, max: 50, label: 'Column height' });
		const rho = fields.find((f) => f.path === 'fluids.liquid.densityKgM3');
		expect(rho).toMatchObject({ unit: 'kg/m³', section: 'fluids' });
		expect(fields.find((f) => f.path === 'numerics.cells')?.integer).toBe(true);
	});

	it('offers every drag law of the schema', () => {
		const drag = fields.find((f) => f.path === 'closures.drag');
		expect(drag?.options).toContain('schiller-naumann');
		expect(drag?.options).toContain('tomiyama-contaminated');
	});

	it('shows the column height only for height profiles and lift only for cross-sections', () => {
		const h = fields.find((f) => f.path === 'geometry.heightM')!;
		const lift = fields.find((f) => f.path === 'closures.lift')!;
		expect(isShown(h, defaultCase('height-profile'))).toBe(true);
		expect(isShown(h, defaultCase('cross-section'))).toBe(false);
		expect(isShown(lift, defaultCase('height-profile'))).toBe(false);
		expect(isShown(lift, defaultCase('cross-section'))).toBe(true);
	});

	it('places every field in one of the six sections', () => {
		const ids = new Set(fields.map((f) => f.section));
		expect([...ids].sort()).toEqual(['bubbles', 'closures', 'fluids', 'geometry', 'numerics', 'sparging']);
	});
});
