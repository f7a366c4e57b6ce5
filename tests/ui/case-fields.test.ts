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

	it('places every field in one of the seven sections', () => {
		const ids = new Set(fields.map((f) => f.section));
		expect([...ids].sort()).toEqual(['bubbles', 'closures', 'fluids', 'geometry', 'numerics', 'sparging', 'transfer']);
	});

	it('shows the transfer fields of the chosen operating mode, on height profiles only', () => {
		const shown = (doc: ReturnType<typeof defaultCase>) => fields.filter((f) => f.section === 'transfer' && isShown(f, doc)).map((f) => f.path);
		const none = defaultCase('height-profile');
		expect(shown(none)).toEqual(['transfer.mode']);
		expect(shown(defaultCase('cross-section'))).toEqual([]);
		const batch = { ...none, transfer: { ...none.transfer, mode: 'batch' as const } };
		expect(shown(batch)).toContain('transfer.initialConcentrationKgM3');
		expect(shown(batch)).not.toContain('transfer.inletConcentrationKgM3');
		expect(shown(batch)).not.toContain('transfer.dispersionM2S');
		const fed = { ...batch, transfer: { ...batch.transfer, mode: 'continuous' as const, dispersion: 'fixed' as const }, sparging: { ...none.sparging, superficialLiquidVelocityMS: -0.01 } };
		expect(shown(fed)).toContain('transfer.inletConcentrationKgM3');
		expect(shown(fed)).toContain('transfer.dispersionM2S');
		// every transfer field carries a unit or a set of options
		for (const f of fields.filter((x) => x.section === 'transfer')) expect(f.kind === 'enum' ? f.options?.length : f.unit).toBeTruthy();
	});

	it('shows the size-class fields only when the gas is divided into size classes', () => {
		const shown = (doc: ReturnType<typeof defaultCase>) => fields.filter((f) => f.section === 'bubbles' && isShown(f, doc)).map((f) => f.path);
		const two = defaultCase('height-profile');
		expect(shown(two)).not.toContain('bubbles.sizeClassCount');
		const sized = { ...two, bubbles: { ...two.bubbles, classes: 'size-classes' as const } };
		expect(shown(sized)).toEqual(expect.arrayContaining(['bubbles.sizeClassCount', 'bubbles.sizeClassMinDiameterM', 'bubbles.sizeClassMaxDiameterM', 'bubbles.diameterM']));
		expect(shown(sized)).not.toContain('bubbles.largeDrag');
		expect(fields.find((f) => f.path === 'bubbles.sizeClassCount')).toMatchObject({ integer: true, min: 6, max: 16 });
		expect(fields.find((f) => f.path === 'bubbles.classes')?.options).toContain('size-classes');
		expect(shown({ ...sized, kind: 'cross-section' })).not.toContain('bubbles.sizeClassCount');
	});
});
