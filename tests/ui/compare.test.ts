import { describe, expect, it } from 'vitest';
import { closureTable, designTable, interpolate, spreadBand, type CompareRun } from '../../src/lib/compare';

const run = (id: string, drag: string, holdup: number): CompareRun => ({
	id,
	label: id,
	caseDocument: { closures: { drag, lift: 'none' } },
	design: { overallHoldup: { value: holdup, unit: '1', label: 'Overall gas holdup' } }
});

describe('comparison helpers', () => {
	it('flags the closure settings that differ between runs and only those', () => {
		const rows = closureTable([run('a', 'schiller-naumann', 0.2), run('b', 'tomiyama-pure', 0.18)]);
		expect(rows.find((r) => r.key === 'closures.drag')).toMatchObject({ differs: true, values: ['schiller-naumann', 'tomiyama-pure'] });
		expect(rows.find((r) => r.key === 'closures.lift')?.differs).toBe(false);
	});

	it('compares the choices it is given by path, beyond the closures', () => {
		const a = { ...run('a', 'schiller-naumann', 0.2), caseDocument: { closures: { drag: 'schiller-naumann' }, transfer: { mode: 'batch', massTransferCoefficient: 'higbie' } } };
		const b = { ...run('b', 'schiller-naumann', 0.2), caseDocument: { closures: { drag: 'schiller-naumann' }, transfer: { mode: 'batch', massTransferCoefficient: 'frossling' } } };
		const rows = closureTable([a, b], ['closures.drag', 'transfer.mode', 'transfer.massTransferCoefficient']);
		expect(rows.map((r) => [r.key, r.differs])).toEqual([
			['closures.drag', false],
			['transfer.mode', false],
			['transfer.massTransferCoefficient', true]
		]);
	});

	it('gives each run its delta against the baseline and none for the baseline itself', () => {
		const [row] = designTable({ runs: [run('a', 'x', 0.2), run('b', 'y', 0.15)], baselineId: 'a' });
		expect(row.deltas[0]).toBeNull();
		expect(row.deltas[1]).toBeCloseTo(-0.05, 12);
		expect(row.relativeDeltas[1]).toBeCloseTo(-0.25, 12);
	});

	it('shows a categorical number by its category, with no arithmetic on the 0/1 codes', () => {
		const peak = (id: string, where: string, v: number): CompareRun => ({ ...run(id, 'x', 0.2), design: { peakLocationSmall: { value: v, unit: '1', label: `Holdup peak of the small bubbles: ${where}` } } });
		const [row] = designTable({ runs: [peak('a', 'wall-peaked', 1), peak('b', 'core-peaked', 0)], baselineId: 'a' });
		expect(row.label).toBe('Holdup peak of the small bubbles');
		expect(row.categories).toEqual(['wall-peaked', 'core-peaked']);
		expect(row.deltas).toEqual([null, null]);
		expect(row.relativeDeltas).toEqual([null, null]);
	});

	// a linear function is reproduced exactly by linear interpolation
	it('interpolates a straight line exactly and clamps outside the range', () => {
		const x = [0, 1, 2, 4];
		const y = x.map((v) => 3 * v + 1);
		expect(interpolate(x, y, 2.5)).toBeCloseTo(8.5, 12);
		expect(interpolate(x, y, 0.25)).toBeCloseTo(1.75, 12);
		expect(interpolate(x, y, -1)).toBe(1);
		expect(interpolate(x, y, 9)).toBe(13);
	});

	it('draws the spread band as the pointwise minimum and maximum of profiles on different grids', () => {
		const a = { x: [0, 1, 2], y: [0.1, 0.2, 0.3] };
		const b = { x: [0, 0.5, 1, 1.5, 2], y: [0.3, 0.25, 0.2, 0.15, 0.1] };
		const band = spreadBand({ x: a.x, profiles: [a, b] });
		expect(Array.from(band.lower)).toEqual([0.1, 0.2, 0.1]);
		expect(Array.from(band.upper)).toEqual([0.3, 0.2, 0.3]);
	});
});
