/**
 * Explanations of the numbers on the run, comparison and case pages, read from the solver's own
 * catalogues (solver/catalog/design.ts, solver/closures/catalog.ts), so the words cannot drift from
 * what the solver computes. Browser-safe.
 */
import { designCatalog, residualEntry } from '$solver/catalog/design';
import { closureCatalog, type CatalogEntry } from '$solver/closures/catalog';

/** What a number, residual or closure option says about itself: from the solver's catalogues. */
export interface Explanation {
	/** heading of the tooltip (defaults to none) */
	title?: string;
	/** how it is computed, or what the option models */
	formula?: string;
	/** SI unit as the solver writes it (`1` shows as "dimensionless") */
	unit?: string;
	source?: string;
	/** a further line (e.g. the option's scope) */
	note?: string;
	/** a list instead of one formula: every option of a choice, the chosen one marked */
	items?: { label: string; text: string; source?: string; current?: boolean }[];
}

/** A design number by its id (`overallHoldup`, …), or null for an id without an entry. */
export function designExplanation(id: string): Explanation | null {
	const e = designCatalog[id];
	return e ? { title: e.label, formula: e.formula, unit: e.unit, source: e.source } : null;
}

/** A residual of a model kind (`height-profile`, `cross-section`). */
export function residualExplanation(kind: string, id: string): Explanation | null {
	const e = residualEntry(kind, id);
	return e ? { title: e.label, formula: e.formula, unit: e.unit, source: e.source } : null;
}

/** A closure option by the case field it belongs to (`closures.drag`) and its value. */
export function closureExplanation(path: string, option: string): Explanation | null {
	const e = (closureCatalog as unknown as Record<string, Record<string, CatalogEntry>>)[path]?.[option];
	return e ? { title: e.label, formula: e.models, source: e.source } : null;
}

/** Every option of a closure choice, the chosen one marked: for the choice's own label in the case editor. */
export function closureChoiceExplanation(path: string, title: string, chosen?: string): Explanation | null {
	const options = (closureCatalog as unknown as Record<string, Record<string, CatalogEntry>>)[path];
	if (!options) return null;
	return {
		title,
		items: Object.entries(options).map(([id, e]) => ({ label: e.label, text: e.models, source: e.source, current: id === chosen }))
	};
}
