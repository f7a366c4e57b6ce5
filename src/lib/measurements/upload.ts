/**
 * The upload form's fields other than the file: what the measurement is, where it was taken, and
 * the units of its two columns. Checked the same way in the browser (errors beside the fields as
 * the analyst types) and on the server (which never trusts the preview).
 */
import { z } from 'zod';
import { findUnit, kindSpecs, measurementKinds, operatingPointUnits, toSi, type MeasurementKind, type OperatingPoint, type Unit } from './kinds.js';

/** Bounds of the operating point, as for a case (`solver/case.ts`). */
export const operatingPointBounds = {
	superficialGasVelocityMS: [0, 1],
	temperatureK: [250, 500],
	pressurePa: [1e4, 1e7]
} as const;

const numberish = z.union([z.number(), z.string()]);

export const uploadFormSchema = z.object({
	kind: z.enum(measurementKinds, { error: 'Choose what was measured' }),
	name: z.string().trim().min(1, { error: 'Give the measurement a name' }).max(120, { error: 'The name must be at most 120 characters' }),
	sourceNote: z.string().trim().max(2000, { error: 'The source note must be at most 2000 characters' }).default(''),
	xUnit: z.string(),
	yUnit: z.string(),
	superficialGasVelocity: numberish,
	superficialGasVelocityUnit: z.string().default('m/s'),
	temperature: numberish,
	temperatureUnit: z.string().default('C'),
	pressure: numberish,
	pressureUnit: z.string().default('kPa')
});
export type UploadForm = z.input<typeof uploadFormSchema>;

export interface UploadMeta {
	kind: MeasurementKind;
	name: string;
	sourceNote: string;
	units: { x: string; y: string };
	operatingPoint: OperatingPoint;
}

export type UploadMetaResult = { ok: true; meta: UploadMeta } | { ok: false; fieldErrors: Record<string, string> };

function readNumber(v: string | number): number | null {
	if (typeof v === 'number') return Number.isFinite(v) ? v : null;
	const t = v.trim();
	if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return null;
	return Number(t);
}

/** Check the form fields and convert the operating point to SI; errors are keyed by field name. */
export function validateUploadMeta(form: unknown): UploadMetaResult {
	const parsed = uploadFormSchema.safeParse(form);
	const fieldErrors: Record<string, string> = {};
	if (!parsed.success) {
		for (const issue of parsed.error.issues) {
			const key = String(issue.path[0] ?? 'form');
			fieldErrors[key] ??= issue.message;
		}
		return { ok: false, fieldErrors };
	}
	const f = parsed.data;
	const spec = kindSpecs[f.kind];
	if (!findUnit(spec.x.quantity, f.xUnit)) fieldErrors.xUnit = `Choose a unit for ${spec.x.label}`;
	if (!findUnit(spec.y.quantity, f.yUnit)) fieldErrors.yUnit = `Choose a unit for ${spec.y.label}`;

	const quantity = (
		field: 'superficialGasVelocity' | 'temperature' | 'pressure',
		units: readonly Unit[],
		unitId: string,
		bounds: readonly [number, number],
		label: string,
		siUnit: string
	): number => {
		const unit = units.find((u) => u.id === unitId);
		if (!unit) {
			fieldErrors[`${field}Unit`] = `Choose a unit for the ${label}`;
			return NaN;
		}
		const v = readNumber(f[field]);
		if (v === null) {
			fieldErrors[field] = `The ${label} must be a number`;
			return NaN;
		}
		const si = toSi(v, unit);
		if (si < bounds[0] || si > bounds[1]) fieldErrors[field] = `The ${label} must lie between ${bounds[0]} and ${bounds[1]} ${siUnit}`;
		return si;
	};
	const operatingPoint: OperatingPoint = {
		superficialGasVelocityMS: quantity('superficialGasVelocity', operatingPointUnits.superficialGasVelocity, f.superficialGasVelocityUnit, operatingPointBounds.superficialGasVelocityMS, 'superficial gas velocity', 'm/s'),
		temperatureK: quantity('temperature', operatingPointUnits.temperature, f.temperatureUnit, operatingPointBounds.temperatureK, 'temperature', 'K'),
		pressurePa: quantity('pressure', operatingPointUnits.pressure, f.pressureUnit, operatingPointBounds.pressurePa, 'pressure', 'Pa')
	};
	if (Object.keys(fieldErrors).length) return { ok: false, fieldErrors };
	return { ok: true, meta: { kind: f.kind, name: f.name, sourceNote: f.sourceNote, units: { x: f.xUnit, y: f.yUnit }, operatingPoint } };
}
