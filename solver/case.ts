/**
 * The case schema: the single source of truth for a Twofold case, used by the app's forms,
 * the JSON API, the worker and the solver. SI units everywhere; every numeric field carries
 * its unit in `.meta({ unit })` and a range whose violation message names the field and the limit.
 */
import { z } from 'zod';

/**
 * Version 2 added the bubble classes (`bubbles.classes` and the large-bubble fields). A version-1 document
 * is upgraded on reading to the one-class model it was written for, so stored cases keep their results.
 * Version 3 gave the cross-section model the bubble classes: a version-2 cross-section was computed with one
 * bubble size whatever its `bubbles.classes` said, so it is upgraded to `single` and keeps its results.
 * Version 3 also added the size classes (`classes: 'size-classes'` and the `sizeClass…` fields): one more enum
 * value and fields with defaults, which a stored document needs no upgrade for.
 */
export const SCHEMA_VERSION = 3 as const;

export interface FieldMeta {
	label: string;
	unit: string;
	/** what the field means, one line */
	help?: string;
}

/** A bounded number with a default; the messages name the field and the limit with its unit. */
function quantity(meta: FieldMeta, min: number, max: number, def: number, opts: { int?: boolean; exclusiveMin?: boolean } = {}) {
	const u = meta.unit && meta.unit !== '1' ? ` ${meta.unit}` : '';
	let s = z.number({ error: `${meta.label} must be a number` });
	if (opts.int) s = s.int({ error: `${meta.label} must be a whole number` });
	s = opts.exclusiveMin
		? s.gt(min, { error: `${meta.label} must be greater than ${min}${u}` })
		: s.min(min, { error: `${meta.label} must be at least ${min}${u}` });
	s = s.max(max, { error: `${meta.label} must be at most ${max}${u}` });
	return s.default(def).meta({ ...meta, min, max, default: def });
}

export const caseKinds = ['height-profile', 'cross-section'] as const;
export type CaseKind = (typeof caseKinds)[number];

export const dragLaws = [
	'stokes',
	'schiller-naumann',
	'ishii-zuber',
	'tomiyama-pure',
	'tomiyama-slightly-contaminated',
	'tomiyama-contaminated'
] as const;
export type DragLaw = (typeof dragLaws)[number];

export const swarmCorrections = ['none', 'richardson-zaki', 'wallis'] as const;
export const virtualMassModels = ['none', 'constant', 'zuber'] as const;
export const liftModels = ['none', 'tomiyama', 'constant'] as const;
export const wallLubricationModels = ['none', 'antal', 'tomiyama', 'hosokawa', 'frank'] as const;
export const turbulentDispersionModels = ['none', 'lopez-de-bertodano', 'burns'] as const;
export const bubbleInducedTurbulenceModels = ['none', 'sato'] as const;
export const wallFrictionModels = ['none', 'blasius'] as const;
export const convectionSchemes = ['donor-cell', 'van-leer', 'minmod'] as const;
export const gasVelocityBases = ['sparger', 'normal'] as const;
export const bubbleSizings = ['fixed', 'akita-yoshida'] as const;
/**
 * one bubble size; small and large bubbles above the regime transition; or a bubble size distribution on a
 * geometric grid of size classes with coalescence and breakup
 */
export const bubbleClassModels = ['single', 'small-large', 'size-classes'] as const;
export type BubbleClassModel = (typeof bubbleClassModels)[number];
export const transitionCorrelations = ['reilly', 'fixed'] as const;
export const largeBubbleSizings = ['krishna', 'fixed'] as const;
export const largeBubbleDrags = ['krishna-swarm', 'spherical-cap'] as const;
/** none, a batch liquid from a chosen concentration, a liquid fed through the column, or its steady state */
export const transferModes = ['none', 'batch', 'continuous', 'steady'] as const;
export type TransferMode = (typeof transferModes)[number];
export const transferSolutes = ['oxygen', 'carbon-dioxide'] as const;
export const liquidDispersionModels = ['deckwer', 'baird-rice', 'fixed'] as const;
/** liquid-side coefficient k_L: mobile (Higbie penetration) or rigid, contaminated interface (Frössling) */
export const massTransferCoefficientModels = ['higbie', 'frossling'] as const;
/** gas saturated with water vapour (partial pressure y (p − p_w)), or dry (y p) */
export const gasHumidities = ['saturated', 'dry'] as const;

export const geometrySchema = z
	.object({
		heightM: quantity({ label: 'Column height', unit: 'm', help: 'sparger to top outlet' }, 0.1, 50, 2),
		diameterM: quantity({ label: 'Inner diameter', unit: 'm' }, 0.02, 10, 0.2),
		clearLiquidLevelM: quantity({ label: 'Clear-liquid level', unit: 'm', help: 'ungassed liquid height above the sparger' }, 0.05, 50, 1.5)
	})
	.prefault({});

export const liquidSchema = z
	.object({
		name: z.string().trim().min(1, { error: 'Liquid name must not be empty' }).max(80, { error: 'Liquid name must be at most 80 characters' }).default('water'),
		densityKgM3: quantity({ label: 'Liquid density', unit: 'kg/m³' }, 500, 2500, 998.2),
		viscosityPaS: quantity({ label: 'Liquid viscosity', unit: 'Pa·s' }, 1e-4, 10, 1.002e-3),
		surfaceTensionNM: quantity({ label: 'Surface tension', unit: 'N/m' }, 0.005, 0.2, 0.0727)
	})
	.prefault({});

export const gasSchema = z
	.object({
		name: z.string().trim().min(1, { error: 'Gas name must not be empty' }).max(80, { error: 'Gas name must be at most 80 characters' }).default('air'),
		molarMassKgMol: quantity({ label: 'Gas molar mass', unit: 'kg/mol' }, 0.002, 0.2, 0.02896),
		viscosityPaS: quantity({ label: 'Gas viscosity', unit: 'Pa·s' }, 1e-6, 1e-4, 1.81e-5)
	})
	.prefault({});

export const fluidsSchema = z
	.object({
		preset: z.string().max(80, { error: 'Fluid preset id must be at most 80 characters' }).nullable().default('air-water-20C'),
		liquid: liquidSchema,
		gas: gasSchema,
		temperatureK: quantity({ label: 'Temperature', unit: 'K' }, 250, 500, 293.15),
		topPressurePa: quantity({ label: 'Top pressure', unit: 'Pa', help: 'absolute pressure at the top outlet' }, 1e4, 1e7, 101325),
		solute: z.string().trim().min(1, { error: 'Solute name must not be empty' }).max(80, { error: 'Solute name must be at most 80 characters' }).default('oxygen'),
		soluteDiffusivityM2S: quantity({ label: 'Solute diffusivity in the liquid', unit: 'm²/s' }, 1e-11, 1e-7, 2.0e-9)
	})
	.prefault({});

export const spargingSchema = z
	.object({
		superficialGasVelocityMS: quantity({ label: 'Superficial gas velocity', unit: 'm/s' }, 0, 1, 0.05),
		gasVelocityBasis: z.enum(gasVelocityBases).default('sparger'),
		superficialLiquidVelocityMS: quantity(
			{ label: 'Superficial liquid velocity', unit: 'm/s', help: '0 = batch; positive = co-current (upward), negative = counter-current' },
			-0.5,
			0.5,
			0
		)
	})
	.prefault({});

export const bubblesSchema = z
	.object({
		/** new cases default to small + large bubbles; version-1 documents are upgraded to `single` */
		classes: z.enum(bubbleClassModels).default('small-large'),
		sizing: z.enum(bubbleSizings).default('fixed'),
		diameterM: quantity({ label: 'Bubble diameter', unit: 'm', help: 'volume-equivalent diameter of the (small) bubbles' }, 1e-5, 0.05, 0.005),
		transition: z.enum(transitionCorrelations).default('reilly'),
		transitionVelocityMS: quantity({ label: 'Transition gas velocity', unit: 'm/s', help: 'used when the transition is fixed' }, 0.001, 0.5, 0.04),
		transitionHoldup: quantity({ label: 'Transition holdup', unit: '1', help: 'used when the transition is fixed' }, 0.005, 0.6, 0.15),
		largeSizing: z.enum(largeBubbleSizings).default('krishna'),
		largeDiameterM: quantity({ label: 'Large-bubble diameter', unit: 'm', help: 'used when the large-bubble size is fixed' }, 0.005, 0.2, 0.04),
		largeDrag: z.enum(largeBubbleDrags).default('krishna-swarm'),
		sizeClassCount: quantity({ label: 'Number of size classes', unit: '1', help: 'bubble size classes on a geometric diameter grid' }, 6, 16, 10, { int: true }),
		sizeClassMinDiameterM: quantity({ label: 'Smallest class diameter', unit: 'm', help: 'volume-equivalent diameter of the smallest size class' }, 2e-4, 0.01, 0.001),
		sizeClassMaxDiameterM: quantity({ label: 'Largest class diameter', unit: 'm', help: 'volume-equivalent diameter of the largest size class' }, 0.005, 0.2, 0.06)
	})
	.prefault({});

export const closuresSchema = z
	.object({
		drag: z.enum(dragLaws).default('schiller-naumann'),
		swarm: z.enum(swarmCorrections).default('none'),
		virtualMass: z.enum(virtualMassModels).default('constant'),
		virtualMassCoefficient: quantity({ label: 'Virtual-mass coefficient', unit: '1' }, 0, 2, 0.5),
		interfacialPressureCoefficient: quantity({ label: 'Interfacial-pressure coefficient', unit: '1' }, 0, 2, 0.25),
		wallFriction: z.enum(wallFrictionModels).default('none'),
		lift: z.enum(liftModels).default('tomiyama'),
		liftCoefficient: quantity({ label: 'Constant lift coefficient', unit: '1' }, -1, 1, 0.1),
		wallLubrication: z.enum(wallLubricationModels).default('antal'),
		turbulentDispersion: z.enum(turbulentDispersionModels).default('burns'),
		turbulentDispersionCoefficient: quantity({ label: 'Turbulent-dispersion coefficient', unit: '1' }, 0, 5, 1),
		bubbleInducedTurbulence: z.enum(bubbleInducedTurbulenceModels).default('sato')
	})
	.prefault({});

export const numericsSchema = z
	.object({
		cells: quantity({ label: 'Cells', unit: '1' }, 10, 5000, 100, { int: true }),
		cflNumber: quantity({ label: 'CFL number', unit: '1' }, 0.01, 1, 0.5),
		endTimeS: quantity({ label: 'End time', unit: 's' }, 0.01, 36000, 120),
		steadyTolerance: quantity({ label: 'Steady tolerance', unit: '1' }, 1e-12, 1e-2, 1e-5),
		snapshotIntervalS: quantity({ label: 'Snapshot interval', unit: 's' }, 0.01, 3600, 1),
		scheme: z.enum(convectionSchemes).default('donor-cell'),
		wallTimeLimitS: quantity({ label: 'Wall-time limit', unit: 's' }, 1, 86400, 600)
	})
	.prefault({});

/**
 * Mass and heat transfer along the column (height profile only). The default `none` leaves every result of the
 * hydrodynamics as it was; a document without this section reads as `none`.
 */
export const transferSchema = z
	.object({
		mode: z.enum(transferModes).default('none'),
		solute: z.enum(transferSolutes).default('oxygen'),
		initialConcentrationKgM3: quantity(
			{ label: 'Initial dissolved concentration', unit: 'kg/m³', help: 'in the liquid at the start (0 for a deoxygenated re-aeration test; 1 mg/L = 0.001 kg/m³)' },
			0,
			10,
			0
		),
		inletConcentrationKgM3: quantity({ label: 'Dissolved concentration of the liquid fed', unit: 'kg/m³', help: 'continuous and steady modes with a liquid flow' }, 0, 10, 0),
		inletGasMoleFraction: quantity({ label: 'Solute mole fraction in the gas fed', unit: '1', help: '0.2095 for oxygen in air, 0 for stripping into clean gas' }, 0, 1, 0.2095),
		gasHumidity: z.enum(gasHumidities).default('saturated'),
		dispersion: z.enum(liquidDispersionModels).default('deckwer'),
		dispersionM2S: quantity({ label: 'Liquid axial dispersion coefficient', unit: 'm²/s', help: 'used when the dispersion is entered' }, 0, 10, 0.01),
		massTransferCoefficient: z.enum(massTransferCoefficientModels).default('higbie'),
		liquidHeatCapacityJKgK: quantity({ label: 'Liquid heat capacity', unit: 'J/(kg·K)', help: 'for the wall heat-transfer coefficient (water at 20 °C: 4182)' }, 500, 10000, 4182),
		liquidThermalConductivityWMK: quantity(
			{ label: 'Liquid thermal conductivity', unit: 'W/(m·K)', help: 'for the wall heat-transfer coefficient (water at 20 °C: 0.598)' },
			0.01,
			5,
			0.598
		)
	})
	.prefault({});

export const caseSchema = z
	.object({
		schemaVersion: z.literal(SCHEMA_VERSION, { error: `schemaVersion must be ${SCHEMA_VERSION}` }),
		kind: z.enum(caseKinds).default('height-profile'),
		name: z.string().trim().min(1, { error: 'Case name must not be empty' }).max(120, { error: 'Case name must be at most 120 characters' }).default('New case'),
		geometry: geometrySchema,
		fluids: fluidsSchema,
		sparging: spargingSchema,
		bubbles: bubblesSchema,
		closures: closuresSchema,
		numerics: numericsSchema,
		transfer: transferSchema
	})
	.superRefine((c, ctx) => {
		if (c.kind === 'height-profile' && c.geometry.clearLiquidLevelM >= c.geometry.heightM) {
			ctx.addIssue({
				code: 'custom',
				path: ['geometry', 'clearLiquidLevelM'],
				message: `Clear-liquid level must be below the column height (${c.geometry.heightM} m)`
			});
		}
		const mode = c.transfer.mode;
		const jl = c.sparging.superficialLiquidVelocityMS;
		const transferIssue = (message: string) => ctx.addIssue({ code: 'custom', path: ['transfer', 'mode'], message });
		if (mode !== 'none' && c.kind === 'cross-section') transferIssue('Mass transfer is computed by the height-profile model only');
		else if (mode === 'batch' && jl !== 0) transferIssue(`A batch liquid needs a superficial liquid velocity of 0 (the case has ${jl} m/s)`);
		else if (mode === 'continuous' && jl === 0) transferIssue('A continuous liquid needs a superficial liquid velocity other than 0 (positive co-current, negative counter-current)');
		const b = c.bubbles;
		if (b.classes === 'size-classes' && c.kind === 'cross-section') {
			ctx.addIssue({ code: 'custom', path: ['bubbles', 'classes'], message: 'Size classes are computed by the height-profile model only (use one size or small and large bubbles)' });
		} else if (b.classes === 'size-classes' && !(b.sizeClassMaxDiameterM >= 2 * b.sizeClassMinDiameterM)) {
			ctx.addIssue({
				code: 'custom',
				path: ['bubbles', 'sizeClassMaxDiameterM'],
				message: `Largest class diameter must be at least twice the smallest (${b.sizeClassMinDiameterM} m)`
			});
		}
		if (c.numerics.snapshotIntervalS > c.numerics.endTimeS) {
			ctx.addIssue({
				code: 'custom',
				path: ['numerics', 'snapshotIntervalS'],
				message: `Snapshot interval must not exceed the end time (${c.numerics.endTimeS} s)`
			});
		}
	});

/** A validated case, all defaults applied. */
export type CaseDocument = z.output<typeof caseSchema>;
/** What a caller may send: sections and fields may be omitted and take their defaults. */
export type CaseInput = z.input<typeof caseSchema>;

export interface CaseIssue {
	/** dotted path, e.g. `geometry.heightM` */
	path: string;
	message: string;
}

export type ValidationResult = { ok: true; value: CaseDocument } | { ok: false; issues: CaseIssue[] };

/**
 * Upgrade an older case document to the current schema version (a copy; the input is not changed).
 * Version 1 → 2: the gas was one bubble size, so `bubbles.classes` becomes `single`, and a missing
 * `bubbles.diameterM` keeps version 1's default of 4 mm.
 * Version 2 → 3: a cross-section's `bubbles.classes` becomes `single` (version 2 computed cross-sections with one
 * bubble size); a height profile is unchanged.
 * Anything that is not an object of version 1 or 2 is returned as it is, for the schema to judge.
 */
export function upgradeCaseDocument(doc: unknown): unknown {
	if (!doc || typeof doc !== 'object' || Array.isArray(doc)) return doc;
	let d = doc as Record<string, unknown>;
	const bubblesOf = (x: Record<string, unknown>) => (x.bubbles && typeof x.bubbles === 'object' && !Array.isArray(x.bubbles) ? (x.bubbles as Record<string, unknown>) : {});
	if (d.schemaVersion === 1) {
		// version 1's default diameter was 4 mm (version 2's is 5 mm, for the small bubbles)
		d = { ...d, schemaVersion: 2, bubbles: { diameterM: 0.004, ...bubblesOf(d), classes: 'single' } };
	}
	if (d.schemaVersion === 2) {
		d = d.kind === 'cross-section' ? { ...d, schemaVersion: 3, bubbles: { ...bubblesOf(d), classes: 'single' } } : { ...d, schemaVersion: 3 };
	}
	return d;
}

/** Validate an unknown document against the case schema, upgrading older versions first; never throws. */
export function validateCase(input: unknown): ValidationResult {
	if (input && typeof input === 'object' && 'schemaVersion' in input) {
		const v = (input as { schemaVersion: unknown }).schemaVersion;
		if (typeof v === 'number' && v > SCHEMA_VERSION) {
			return {
				ok: false,
				issues: [{ path: 'schemaVersion', message: `This document has schemaVersion ${v}, newer than this Twofold understands (${SCHEMA_VERSION})` }]
			};
		}
	}
	const doc = upgradeCaseDocument(input);
	const r = caseSchema.safeParse(doc);
	if (r.success) return { ok: true, value: r.data };
	return { ok: false, issues: r.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })) };
}

/** A complete default case of the given kind. */
export function defaultCase(kind: CaseKind = 'height-profile'): CaseDocument {
	const c = caseSchema.parse({ schemaVersion: SCHEMA_VERSION, kind });
	if (kind === 'cross-section') c.numerics.cells = 60;
	return c;
}

/**
 * The one-class reference case: the default case with the gas as one bubble size of 4 mm, as every case was
 * before the bubble classes (schema version 1). The verification tests of the one-class model use it.
 */
export function oneClassCase(kind: CaseKind = 'height-profile'): CaseDocument {
	const c = defaultCase(kind);
	c.bubbles.classes = 'single';
	c.bubbles.diameterM = 0.004;
	return c;
}
