/**
 * Small helpers for plain HTML form actions validated with zod: on error an action returns
 * `fail(400, { values, errors })` and the page shows each message beside its field.
 */
import { error, fail, type Handle } from '@sveltejs/kit';
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

/**
 * Handle (`hooks.server.ts`): a form body that cannot be parsed (a broken multipart upload) is the
 * sender's mistake, so every form action that reads it answers 400, not 500.
 */
export const readableForms: Handle = async ({ event, resolve }) => {
	const request = event.request;
	const read = request.formData.bind(request);
	request.formData = () =>
		read().catch((e: unknown) => {
			// a body read twice is a fault of ours, not of the sender: left as it is
			if (e instanceof TypeError && !/unusable|consumed|already/i.test(e.message)) error(400, 'The form data could not be read. Send the form again.');
			throw e;
		});
	return resolve(event);
};
