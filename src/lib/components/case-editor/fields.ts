/**
 * The editor's field list, read from the solver's zod case schema so the form can never drift
 * from what the solver validates: labels, units, ranges, defaults and help come from `.meta()`,
 * options from the enums.
 */
import { caseSchema, type CaseDocument, type CaseKind } from '../../../../solver/case.js';

export type SectionId = 'geometry' | 'fluids' | 'sparging' | 'bubbles' | 'closures' | 'transfer' | 'numerics';

export const sections: { id: SectionId; title: string }[] = [
	{ id: 'geometry', title: 'Geometry' },
	{ id: 'fluids', title: 'Fluids' },
	{ id: 'sparging', title: 'Sparging' },
	{ id: 'bubbles', title: 'Bubble classes' },
	{ id: 'closures', title: 'Closures' },
	{ id: 'transfer', title: 'Transfer' },
	{ id: 'numerics', title: 'Numerics' }
];

export interface FieldSpec {
	/** dotted path in the case document, e.g. `fluids.liquid.densityKgM3` */
	path: string;
	section: SectionId;
	kind: 'number' | 'enum' | 'text';
	label: string;
	/** SI unit ('1' = dimensionless) */
	unit: string;
	help?: string;
	min?: number;
	max?: number;
	integer?: boolean;
	options?: readonly string[];
}

interface ZodLike {
	def: { type: string; innerType?: ZodLike; shape?: Record<string, ZodLike>; entries?: Record<string, string>; checks?: { _zod: { def: { check: string; format?: string } } }[] };
	shape?: Record<string, ZodLike>;
	options?: readonly string[];
	meta(): Record<string, unknown> | undefined;
}

function unwrap(s: ZodLike): ZodLike {
	let cur = s;
	while (cur.def.innerType && ['default', 'prefault', 'optional', 'nullable'].includes(cur.def.type)) cur = cur.def.innerType;
	return cur;
}

/** Enum field labels where the schema has none (the enums carry no metadata). */
const enumLabels: Record<string, { label: string; help?: string }> = {
	'sparging.gasVelocityBasis': { label: 'Gas velocity given at', help: 'sparger conditions, or normal conditions (0 °C, 1 atm)' },
	'bubbles.classes': { label: 'Gas as', help: 'one bubble size, small and large bubbles above the regime transition, or size classes with coalescence and breakup' },
	'bubbles.sizing': { label: 'Bubble size from', help: 'a fixed diameter, or the Akita–Yoshida (1974) correlation (the small bubbles, with two classes)' },
	'bubbles.transition': { label: 'Regime transition from', help: 'where the gas starts to rise as large bubbles' },
	'bubbles.largeSizing': { label: 'Large-bubble size from' },
	'bubbles.largeDrag': { label: 'Large-bubble drag' },
	'closures.drag': { label: 'Drag' },
	'closures.swarm': { label: 'Swarm correction' },
	'closures.virtualMass': { label: 'Virtual mass' },
	'closures.wallFriction': { label: 'Wall friction' },
	'closures.lift': { label: 'Lift' },
	'closures.wallLubrication': { label: 'Wall lubrication' },
	'closures.turbulentDispersion': { label: 'Turbulent dispersion' },
	'closures.bubbleInducedTurbulence': { label: 'Bubble-induced turbulence' },
	'numerics.scheme': { label: 'Holdup convection scheme' },
	'fluids.liquid.name': { label: 'Liquid' },
	'fluids.gas.name': { label: 'Gas' },
	'fluids.solute': { label: 'Dissolving component' },
	'transfer.mode': { label: 'Operating mode', help: 'what the liquid does while the solute transfers' },
	'transfer.solute': { label: 'Solute (solubility)', help: 'whose Henry constant gives the saturation concentration at the local pressure' },
	'transfer.gasHumidity': { label: 'Gas fed', help: 'saturated with water vapour, or dry' },
	'transfer.dispersion': { label: 'Liquid axial dispersion' },
	'transfer.massTransferCoefficient': { label: 'Liquid-side k_L' }
};

/** Option texts of enums that are not closures (closures take theirs from the catalogue). */
export const optionLabels: Record<string, Record<string, string>> = {
	'transfer.mode': {
		none: 'None (hydrodynamics only)',
		batch: 'Batch liquid (re-aeration test)',
		continuous: 'Continuous liquid feed',
		steady: 'Steady absorption or stripping'
	},
	'transfer.gasHumidity': { saturated: 'Saturated with water vapour', dry: 'Dry' }
};

function collect(section: SectionId, prefix: string, schema: ZodLike, out: FieldSpec[]) {
	const obj = unwrap(schema);
	const shape = obj.shape ?? obj.def.shape ?? {};
	for (const [key, field] of Object.entries(shape)) {
		const path = `${prefix}.${key}`;
		if (path === 'fluids.preset') continue; // chosen through the preset picker
		const inner = unwrap(field);
		const t = inner.def.type;
		if (t === 'object') {
			collect(section, path, field, out);
			continue;
		}
		const meta = (field.meta?.() ?? {}) as { label?: string; unit?: string; help?: string; min?: number; max?: number };
		const named = enumLabels[path];
		if (t === 'number') {
			const integer = (inner.def.checks ?? []).some((c) => c._zod.def.format === 'safeint' || c._zod.def.check === 'number_format');
			out.push({ path, section, kind: 'number', label: meta.label ?? key, unit: meta.unit ?? '1', help: meta.help, min: meta.min, max: meta.max, integer });
		} else if (t === 'enum') {
			out.push({ path, section, kind: 'enum', label: named?.label ?? key, unit: '', help: named?.help, options: inner.options ?? Object.values(inner.def.entries ?? {}) });
		} else if (t === 'string') {
			out.push({ path, section, kind: 'text', label: named?.label ?? key, unit: '', help: named?.help });
		}
	}
}

function buildFields(): FieldSpec[] {
	const shape = (caseSchema as unknown as ZodLike).shape ?? {};
	const out: FieldSpec[] = [];
	for (const s of sections) collect(s.id, s.id, shape[s.id], out);
	return out;
}

export const fields: FieldSpec[] = buildFields();

/**
 * Fields that only one kind of case uses. The cross-section model is axially fully developed (no
 * height, level or axial convection scheme); the radial forces only act in the cross-section model.
 */
const onlyFor: Record<string, CaseKind> = {
	'geometry.heightM': 'height-profile',
	'geometry.clearLiquidLevelM': 'height-profile',
	'closures.wallFriction': 'height-profile',
	'closures.interfacialPressureCoefficient': 'height-profile',
	'numerics.scheme': 'height-profile',
	'closures.lift': 'cross-section',
	'closures.liftCoefficient': 'cross-section',
	'closures.wallLubrication': 'cross-section',
	'closures.turbulentDispersion': 'cross-section',
	'closures.turbulentDispersionCoefficient': 'cross-section',
	'closures.bubbleInducedTurbulence': 'cross-section',
	// the size classes are computed by the height-profile model only
	'bubbles.sizeClassCount': 'height-profile',
	'bubbles.sizeClassMinDiameterM': 'height-profile',
	'bubbles.sizeClassMaxDiameterM': 'height-profile',
	// mass transfer is computed by the height-profile model only
	'transfer.mode': 'height-profile',
	'transfer.solute': 'height-profile',
	'transfer.initialConcentrationKgM3': 'height-profile',
	'transfer.inletConcentrationKgM3': 'height-profile',
	'transfer.inletGasMoleFraction': 'height-profile',
	'transfer.gasHumidity': 'height-profile',
	'transfer.dispersion': 'height-profile',
	'transfer.dispersionM2S': 'height-profile',
	'transfer.massTransferCoefficient': 'height-profile',
	'transfer.liquidHeatCapacityJKgK': 'height-profile',
	'transfer.liquidThermalConductivityWMK': 'height-profile'
};

/** Fields that only matter for one choice of another field. */
const dependsOn: Record<string, (c: CaseDocument) => boolean> = {
	'closures.virtualMassCoefficient': (c) => c.closures.virtualMass === 'constant',
	'closures.liftCoefficient': (c) => c.closures.lift === 'constant',
	'closures.turbulentDispersionCoefficient': (c) => c.closures.turbulentDispersion !== 'none',
	'bubbles.diameterM': (c) => c.bubbles.sizing === 'fixed',
	'bubbles.transition': (c) => c.bubbles.classes === 'small-large',
	'bubbles.transitionVelocityMS': (c) => c.bubbles.classes === 'small-large' && c.bubbles.transition === 'fixed',
	'bubbles.transitionHoldup': (c) => c.bubbles.classes === 'small-large' && c.bubbles.transition === 'fixed',
	'bubbles.largeSizing': (c) => c.bubbles.classes === 'small-large',
	'bubbles.largeDiameterM': (c) => c.bubbles.classes === 'small-large' && c.bubbles.largeSizing === 'fixed',
	'bubbles.largeDrag': (c) => c.bubbles.classes === 'small-large',
	'bubbles.sizeClassCount': (c) => c.bubbles.classes === 'size-classes',
	'bubbles.sizeClassMinDiameterM': (c) => c.bubbles.classes === 'size-classes',
	'bubbles.sizeClassMaxDiameterM': (c) => c.bubbles.classes === 'size-classes',
	'transfer.solute': (c) => c.transfer.mode !== 'none',
	// every mode starts the liquid from it (a steady run forgets it on the way)
	'transfer.initialConcentrationKgM3': (c) => c.transfer.mode !== 'none',
	'transfer.inletConcentrationKgM3': (c) => (c.transfer.mode === 'continuous' || c.transfer.mode === 'steady') && c.sparging.superficialLiquidVelocityMS !== 0,
	'transfer.inletGasMoleFraction': (c) => c.transfer.mode !== 'none',
	'transfer.gasHumidity': (c) => c.transfer.mode !== 'none',
	'transfer.dispersion': (c) => c.transfer.mode !== 'none',
	'transfer.dispersionM2S': (c) => c.transfer.mode !== 'none' && c.transfer.dispersion === 'fixed',
	'transfer.massTransferCoefficient': (c) => c.transfer.mode !== 'none',
	'transfer.liquidHeatCapacityJKgK': (c) => c.transfer.mode !== 'none',
	'transfer.liquidThermalConductivityWMK': (c) => c.transfer.mode !== 'none'
};

export function isShown(field: FieldSpec, doc: CaseDocument): boolean {
	const k = onlyFor[field.path];
	if (k && k !== doc.kind) return false;
	const d = dependsOn[field.path];
	return d ? d(doc) : true;
}

export function getPath(doc: unknown, path: string): unknown {
	return path.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), doc);
}

export function setPath(doc: Record<string, unknown>, path: string, value: unknown): void {
	const keys = path.split('.');
	let o: Record<string, unknown> = doc;
	for (const k of keys.slice(0, -1)) o = o[k] as Record<string, unknown>;
	o[keys[keys.length - 1]] = value;
}
