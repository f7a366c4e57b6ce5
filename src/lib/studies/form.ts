/**
 * The new-study form: display units of the sweepable inputs, and the form fields → the study input
 * the server validates (SI). Pure, so the page shows the member count as the user types and the
 * form action reads the same fields the same way.
 *
 * Field names are the dotted paths of the spec, so a server issue at `spec.axes.0.from` shows
 * beside the field `axes.0.from`.
 */
import { sweepInputs, type StudyKind, type SweepInput } from './spec.js';

/** The unit an input is typed in, and the factor to SI. */
export const sweepDisplayUnits: Record<SweepInput, { unit: string; toSi: number }> = {
	superficialGasVelocityMS: { unit: 'm/s', toSi: 1 },
	bubbleDiameterM: { unit: 'mm', toSi: 1e-3 },
	columnDiameterM: { unit: 'm', toSi: 1 },
	clearLiquidLevelM: { unit: 'm', toSi: 1 },
	topPressurePa: { unit: 'kPa', toSi: 1e3 },
	temperatureK: { unit: 'K', toSi: 1 },
	liquidViscosityPaS: { unit: 'mPa·s', toSi: 1e-3 }
};

export type FormFields = Record<string, string | string[]>;

function text(f: FormFields, k: string): string {
	const v = f[k];
	return (Array.isArray(v) ? (v[0] ?? '') : (v ?? '')).trim();
}

/** A number typed by a person: '' → undefined, '1,5' is not accepted (the list separator is the comma). */
function num(raw: string, scale = 1): number | undefined {
	if (raw === '') return undefined;
	const v = Number(raw);
	return Number.isFinite(v) ? v * scale : Number.NaN;
}

/** The form fields of a FormData (repeated keys → arrays). */
export function formFields(fd: FormData): FormFields {
	const out: FormFields = {};
	for (const [k, v] of fd.entries()) {
		if (typeof v !== 'string') continue;
		const prev = out[k];
		out[k] = prev === undefined ? v : Array.isArray(prev) ? [...prev, v] : [prev, v];
	}
	return out;
}

/** The study input (caseId, name, spec, measurementId) the form fields describe, in SI. */
export function studyInputFromForm(f: FormFields): Record<string, unknown> {
	const kind = text(f, 'kind') as StudyKind;
	let spec: Record<string, unknown>;
	if (kind === 'sweep') {
		const axes = [0, 1]
			.map((i) => {
				const input = text(f, `axes.${i}.input`) as SweepInput;
				if (!input) return null;
				const scale = sweepDisplayUnits[input]?.toSi ?? 1;
				const spacing = text(f, `axes.${i}.spacing`) || 'list';
				const count = num(text(f, `axes.${i}.count`));
				return {
					input,
					spacing,
					values:
						spacing === 'list'
							? text(f, `axes.${i}.values`)
									.split(/[\s,;]+/)
									.filter(Boolean)
									.map((v) => num(v, scale))
							: undefined,
					from: spacing === 'list' ? undefined : num(text(f, `axes.${i}.from`), scale),
					to: spacing === 'list' ? undefined : num(text(f, `axes.${i}.to`), scale),
					count: spacing === 'list' ? undefined : count
				};
			})
			.filter((a) => a !== null);
		spec = { kind, axes };
	} else if (kind === 'closure-matrix') {
		const options: Record<string, string[]> = {};
		for (const [k, v] of Object.entries(f)) {
			if (!k.startsWith('options.')) continue;
			options[k.slice('options.'.length)] = Array.isArray(v) ? v : [v];
		}
		spec = { kind, options };
	} else {
		spec = {
			kind,
			cells: text(f, 'cells')
				.split(/[\s,;]+/)
				.filter(Boolean)
				.map((v) => num(v))
		};
	}
	const measurementId = text(f, 'measurementId');
	return { caseId: text(f, 'caseId'), name: text(f, 'name'), spec, measurementId: measurementId || null };
}

/** Server issue paths → form field names (`spec.axes.0.from` → `axes.0.from`); the first message per field. */
export function issuesToFieldErrors(issues: ReadonlyArray<{ path: string; message: string }>): Record<string, string> {
	const out: Record<string, string> = {};
	for (const i of issues) {
		let key = i.path.replace(/^spec\./, '');
		// a list's element (axes.0.values.3, cells.2) shows at the list's field
		key = key.replace(/^(axes\.\d\.values)\.\d+$/, '$1').replace(/^cells\.\d+$/, 'cells');
		if (key.startsWith('members.')) key = 'spec';
		out[key] ??= i.message;
	}
	return out;
}

export const inputLabel = (id: SweepInput) => `${sweepInputs[id].label} (${sweepDisplayUnits[id].unit})`;
