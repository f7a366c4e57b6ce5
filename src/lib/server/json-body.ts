/**
 * Reading the small command bodies of `+server.ts` endpoints (`POST /runs { caseId }` and the like):
 * JSON or a plain form, size-capped, checked with a zod schema. Every refusal has one shape,
 *
 *   { message, error: { code, message, issues: [{ path, message }] } }
 *
 * (`message` at the top level too, for callers that read only that), and nothing is stored
 * before the body passed:
 *
 *   const body = await readBody(event.request, z.object({ caseId: z.uuid({ error: '…' }) }));
 *   if (!body.ok) return body.response;
 *   body.data.caseId;
 */
import { json } from '@sveltejs/kit';
import type { z } from 'zod';
import { formValues } from './forms.js';

/** Command bodies are a few ids and numbers: 64 KiB is far more than any of them needs. */
export const MAX_COMMAND_BODY_BYTES = 64 * 1024;

export type InputErrorCode =
	| 'invalid_input'
	| 'invalid_json'
	| 'invalid_form'
	| 'body_too_large'
	| 'unsupported_media_type'
	| 'not_found'
	| 'conflict'
	| 'too_many_runs'
	| 'unauthorized'
	| 'forbidden'
	| 'method_not_allowed'
	| 'not_acceptable'
	| 'rate_limited'
	| 'internal_error';

export interface InputIssue {
	/** dotted path of the field, e.g. `caseId`; empty for the body as a whole */
	path: string;
	message: string;
}

/** The uniform error body (also what the guard's `error(…)` carries, see `App.Error`). */
export function errorBody(code: InputErrorCode, message: string, issues: InputIssue[] = []) {
	return { message, error: { code, message, issues } };
}

/** The uniform error response. */
export function errorResponse(status: number, code: InputErrorCode, message: string, issues: InputIssue[] = [], headers?: HeadersInit): Response {
	return json(errorBody(code, message, issues), { status, headers });
}

/** The error code a refusal of a given status gets when nothing more specific applies. */
export function codeForStatus(status: number): InputErrorCode {
	if (status === 401) return 'unauthorized';
	if (status === 403) return 'forbidden';
	if (status === 404) return 'not_found';
	if (status === 405) return 'method_not_allowed';
	if (status === 406) return 'not_acceptable';
	if (status === 413) return 'body_too_large';
	if (status === 415) return 'unsupported_media_type';
	if (status >= 500) return 'internal_error';
	if (status === 409) return 'conflict';
	if (status === 429) return 'too_many_runs';
	return 'invalid_input';
}

export type BodyResult<T> = { ok: true; data: T } | { ok: false; response: Response };

const JSON_TYPE = /^application\/([\w.+-]+\+)?json$/;
const FORM_TYPES = ['application/x-www-form-urlencoded', 'multipart/form-data'];

/** The zod issues as `{ path, message }`, paths dotted (`geometry.heightM`), empty for the root. */
export function inputIssues(error: z.ZodError): InputIssue[] {
	return error.issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message }));
}

function sizeRefusal(maxBytes: number, size?: number): Response {
	const what = size === undefined ? `more than ${maxBytes} bytes` : `${size} bytes`;
	return errorResponse(413, 'body_too_large', `The request body is ${what}; the limit is ${maxBytes} bytes (${maxBytes / 1024} KiB)`);
}

/**
 * The body's bytes, or null when it passes `maxBytes`. The rest of a too-large body is read and
 * dropped (the server's own request limit bounds it): a client still sending would otherwise see
 * the connection reset instead of the answer.
 */
export async function readCapped(request: Request, maxBytes: number): Promise<Uint8Array<ArrayBuffer> | null> {
	if (!request.body) return new Uint8Array(0);
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.byteLength;
		if (size > maxBytes) {
			try {
				while (!(await reader.read()).done);
			} catch {
				// past the server's limit: the answer is the same
			}
			return null;
		}
		chunks.push(value);
	}
	const bytes = new Uint8Array(size);
	let at = 0;
	for (const c of chunks) {
		bytes.set(c, at);
		at += c.byteLength;
	}
	return bytes;
}

/**
 * Reads a JSON or form body and checks it with `schema`. Refusals: wrong content type 415, more
 * than `maxBytes` 413, unreadable JSON 400 `invalid_json`, unreadable form 400 `invalid_form`,
 * anything the schema refuses 400 `invalid_input` with one issue per problem. Form fields arrive
 * as strings (the last one of a repeated name; files are left out). `prepare` rewrites the parsed
 * input before the check (e.g. upgrading an older case document).
 */
export async function readBody<S extends z.ZodType>(
	request: Request,
	schema: S,
	options: { maxBytes?: number; prepare?: (input: unknown) => unknown } = {}
): Promise<BodyResult<z.output<S>>> {
	const maxBytes = options.maxBytes ?? MAX_COMMAND_BODY_BYTES;
	const contentType = request.headers.get('content-type') ?? '';
	const mediaType = contentType.split(';')[0].trim().toLowerCase();
	const isJson = JSON_TYPE.test(mediaType);
	if (!isJson && !FORM_TYPES.includes(mediaType)) {
		const got = mediaType ? `"${mediaType}"` : 'no content type';
		return { ok: false, response: errorResponse(415, 'unsupported_media_type', `Send the body as application/json (or a form); got ${got}`) };
	}
	const declared = Number(request.headers.get('content-length'));
	if (Number.isFinite(declared) && declared > maxBytes) return { ok: false, response: sizeRefusal(maxBytes, declared) };
	const bytes = await readCapped(request, maxBytes);
	if (!bytes) return { ok: false, response: sizeRefusal(maxBytes) };

	let input: unknown;
	if (isJson) {
		let text: string;
		try {
			text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
		} catch {
			return { ok: false, response: errorResponse(400, 'invalid_json', 'The request body is not UTF-8 text') };
		}
		if (text.trim() === '') return { ok: false, response: errorResponse(400, 'invalid_json', 'The request body is empty; send a JSON object') };
		try {
			input = JSON.parse(text);
		} catch (e) {
			const detail = e instanceof SyntaxError ? `: ${e.message}` : '';
			return { ok: false, response: errorResponse(400, 'invalid_json', `The request body is not valid JSON${detail}`) };
		}
	} else {
		try {
			input = formValues(await new Response(bytes, { headers: { 'content-type': contentType } }).formData());
		} catch {
			return { ok: false, response: errorResponse(400, 'invalid_form', 'The request body is not a readable form') };
		}
	}

	const result = schema.safeParse(options.prepare ? options.prepare(input) : input);
	if (result.success) return { ok: true, data: result.data };
	const issues = inputIssues(result.error);
	const message = issues.map((i) => i.message).join('; ');
	return { ok: false, response: errorResponse(400, 'invalid_input', message, issues) };
}
