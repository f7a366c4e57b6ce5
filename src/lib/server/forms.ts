/**
 * Small helpers for plain HTML form actions validated with zod: on error an action returns
 * `fail(400, { values, errors })` and the page shows each message beside its field.
 */
import { fail } from '@sveltejs/kit';
import type { z } from 'zod';

export type FieldErrors = Record<string, string>;

export function formValues(data: FormData): Record<string, string> {
	const values: Record<string, string> = {};
	for (const [k, v] of data.entries()) if (typeof v === 'string') values[k] = v;
	return values;
}

/** Parses form data with a zod schema; returns `{ data }` or a ready `fail(400, …)`. */
export function parseForm<S extends z.ZodType>(schema: S, data: FormData) {
	const values = formValues(data);
	const result = schema.safeParse(values);
	if (result.success) return { data: result.data as z.infer<S>, values, failure: null };
	const errors: FieldErrors = {};
	for (const issue of result.error.issues) {
		const key = String(issue.path[0] ?? 'form');
		errors[key] ??= issue.message;
	}
	return { data: null, values, failure: fail(400, { values, errors }) };
}
