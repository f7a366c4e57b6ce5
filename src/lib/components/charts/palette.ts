/**
 * Chart colours from the product palette: teal for liquid, amber for gas, slate for structure.
 * No rainbow maps: extra series are told apart by dash patterns and shades of the same three hues.
 */
export const colours = {
	liquid: '#1f7470',
	liquidLight: '#44aea6',
	gas: '#dd6a02',
	gasLight: '#ffb320',
	structure: '#334155',
	structureLight: '#94a3b8',
	band: 'rgba(100, 116, 139, 0.18)',
	/** correlation reference lines: near-black, dashed, never a run's colour */
	reference: '#0f172a'
};

export interface Stroke {
	stroke: string;
	dash?: number[];
}

/** Colour and dash for a residual or field name: the phase it belongs to decides the hue. */
export function strokeFor(name: string, index = 0): Stroke {
	const n = name.toLowerCase();
	if (n.startsWith('gasmass') || n.startsWith('gas')) return { stroke: colours.gas };
	if (n.startsWith('liquidmass')) return { stroke: colours.liquid };
	if (n.startsWith('liquid')) return { stroke: colours.liquid, dash: [6, 3] };
	if (n.startsWith('holdupchange')) return { stroke: colours.structure };
	if (n.startsWith('overall')) return { stroke: colours.structureLight, dash: [4, 3] };
	if (n.startsWith('momentum')) return { stroke: colours.liquidLight, dash: [2, 3] };
	return seriesStroke(index);
}

const cycle: Stroke[] = [
	{ stroke: colours.liquid },
	{ stroke: colours.gas },
	{ stroke: colours.structure },
	{ stroke: colours.liquidLight, dash: [6, 3] },
	{ stroke: colours.gasLight, dash: [6, 3] },
	{ stroke: colours.structureLight, dash: [2, 3] }
];

/** The i-th run of a comparison (up to six, matching the 2–6 run limit). */
export function seriesStroke(index: number): Stroke {
	return cycle[index % cycle.length];
}

/** Readable name for a stable residual id, e.g. `gasMassImbalance` → `gas mass imbalance`. */
export function humanise(id: string): string {
	return id.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
}
