/**
 * The catalogue of design numbers and residuals (solver/catalog/design.ts) against what the models
 * emit: every design id and residual id of a one-class and a two-class height profile and of a
 * cross-section run has an entry, with the unit the solver writes. A new design number or residual
 * without an entry fails here, so the explanations on the pages cannot drift from the solver.
 */
import { describe, expect, it } from 'vitest';
import { defaultCase, oneClassCase, type CaseDocument } from '../../solver/case.js';
import { createSimulation, heightResidualNames, crossSectionResidualNames } from '../../solver/index.js';
import { designCatalog, residualCatalog, residualEntry } from '../../solver/catalog/design.js';
import { closureCatalog } from '../../solver/closures/catalog.js';

/** A few steps (residual ids) and the results of a short run (design ids). */
function emitted(c: CaseDocument, steps = 400) {
	const sim = createSimulation(c);
	const residualIds = new Set<string>();
	for (let k = 0; k < steps && sim.state.status === 'running'; k++) {
		sim.step();
		for (const id of Object.keys(sim.residuals())) residualIds.add(id);
	}
	return { design: sim.results().design, residualIds: [...residualIds] };
}

const short = (c: CaseDocument) => {
	c.numerics.endTimeS = 3;
	return c;
};

describe('catalogue of design numbers and residuals', () => {
	const runs: { name: string; kind: 'height-profile' | 'cross-section'; doc: CaseDocument; ids: string[] }[] = [
		{ name: 'a one-class height profile', kind: 'height-profile', doc: short(oneClassCase()), ids: [...heightResidualNames] },
		{
			name: 'a two-class height profile above the transition',
			kind: 'height-profile',
			doc: short(
				(() => {
					const c = defaultCase();
					c.sparging.superficialGasVelocityMS = 0.1;
					c.geometry = { heightM: 4, diameterM: 0.3, clearLiquidLevelM: 2 };
					return c;
				})()
			),
			ids: [...heightResidualNames]
		},
		{
			name: 'a height profile with size classes',
			kind: 'height-profile',
			doc: short(
				(() => {
					const c = defaultCase();
					c.bubbles.classes = 'size-classes';
					c.bubbles.sizeClassCount = 16;
					return c;
				})()
			),
			ids: [...heightResidualNames]
		},
		{ name: 'a cross-section', kind: 'cross-section', doc: defaultCase('cross-section'), ids: [...crossSectionResidualNames] },
		{
			name: 'a height profile with oxygen transfer',
			kind: 'height-profile',
			doc: short(
				(() => {
					const c = defaultCase();
					c.sparging.superficialLiquidVelocityMS = -0.01;
					c.transfer.mode = 'continuous';
					return c;
				})()
			),
			ids: [...heightResidualNames, 'soluteChangeRate']
		}
	];

	for (const r of runs) {
		it(`describes every design number and residual of ${r.name}, with the solver's unit`, () => {
			const { design, residualIds } = emitted(r.doc);
			expect(Object.keys(design).length).toBeGreaterThan(4);
			for (const [id, d] of Object.entries(design)) {
				const entry = designCatalog[id];
				expect(entry, `design number ${id} has no catalogue entry`).toBeDefined();
				expect(entry.unit, `unit of ${id}`).toBe(d.unit);
				for (const k of ['label', 'formula', 'source'] as const) expect(entry[k].length, `${k} of ${id}`).toBeGreaterThan(1);
			}
			for (const id of new Set([...residualIds, ...r.ids])) {
				const entry = residualEntry(r.kind, id);
				expect(entry, `residual ${id} of the ${r.kind} model has no catalogue entry`).not.toBeNull();
				expect(entry!.formula.length).toBeGreaterThan(3);
			}
		});
	}

	it('keeps the two classes’ own numbers in the two-class run', () => {
		const { design } = emitted(runs[1].doc);
		for (const id of ['holdupSmall', 'holdupLarge', 'slipLargeMS', 'diameterLargeM', 'transitionVelocityMS', 'largeWallFactor']) expect(design[id], id).toBeDefined();
	});

	it('has an entry for every residual kind it lists, and a label, line and source for every closure option', () => {
		expect(Object.keys(residualCatalog).sort()).toEqual(['cross-section', 'height-profile']);
		for (const options of Object.values(closureCatalog)) {
			for (const e of Object.values(options) as { label: string; models: string; source: string }[]) {
				expect(e.label.length).toBeGreaterThan(0);
				expect(e.models.length).toBeGreaterThan(3);
				expect(e.source.length).toBeGreaterThan(0);
			}
		}
	});
});
