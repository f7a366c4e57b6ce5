/**
 * Small helpers the `/api/v1` handlers share: query strings checked with zod, the uniform
 * refusals, opaque cursors, content negotiation and the mapping of the server modules' own
 * refusal errors. The handlers stay thin: guard, parse, call the module, shape the answer.
 */
import { json } from '@sveltejs/kit';
import type { z } from 'zod';
import { codeForStatus, errorResponse, inputIssues, type InputIssue } from '../json-body.js';
import { RunRequestError } from '../runs/commands.js';
import { StudyRequestError } from '../studies/commands.js';
import { ComparisonError } from '../comparisons.js';

export type Parsed<T> = { ok: true; data: T } | { ok: false; response: Response };

/** A 400 naming the fields, in the uniform body. */
export function invalid(issues: InputIssue[], message = issues.map((i) => i.message).join('; ')): Response {
	return errorResponse(400, 'invalid_input', message, issues);
}

export function notFound(what: string): Response {
	return errorResponse(404, 'not_found', `${what} not found.`);
}

/** The query string checked with `schema` (a strict object: an unknown parameter is refused, naming it). */
export function parseQuery<S extends z.ZodType>(url: URL, schema: S): Parsed<z.output<S>> {
	const input: Record<string, string> = {};
	for (const [k, v] of url.searchParams) input[k] = v;
	const r = schema.safeParse(input);
	if (r.success) return { ok: true, data: r.data };
	const issues = inputIssues(r.error).map((i) =>
		i.path === '' && /unrecognized/i.test(i.message) ? { path: '', message: `Unknown query parameter: ${i.message.replace(/^Unrecognized keys?:\s*/i, '')}` } : i
	);
	return { ok: false, response: invalid(issues) };
}

/** JSON with the API's defaults. */
export function ok(data: unknown, init: { status?: number; headers?: Record<string, string> } = {}): Response {
	return json(data, { status: init.status ?? 200, headers: init.headers });
}

/** The refusals the run, study and comparison modules throw, as uniform responses; null for anything else. */
export function moduleRefusal(e: unknown): Response | null {
	if (e instanceof StudyRequestError) return errorResponse(e.status, codeForStatus(e.status), e.message, e.issues);
	if (e instanceof RunRequestError) return errorResponse(e.status, codeForStatus(e.status), e.message);
	if (e instanceof ComparisonError) return errorResponse(400, 'invalid_input', e.message, [{ path: /measurement/i.test(e.message) ? 'measurementId' : 'runIds', message: e.message }]);
	return null;
}

/** A list's query string with its cursor decoded. */
export function parseListQuery<S extends z.ZodType<{ cursor?: string }>>(url: URL, schema: S): Parsed<Omit<z.output<S>, 'cursor'> & { cursor: TimeCursor | null }> {
	const q = parseQuery(url, schema);
	if (!q.ok) return q;
	const c = decodeTimeCursor(q.data.cursor);
	if (!c.ok) return c;
	return { ok: true, data: { ...q.data, cursor: c.data } };
}

// ---------------------------------------------------------------- cursors

/**
 * Lists page newest first by (time, id). The cursor is opaque to clients: base64url of the last
 * item's time (microseconds, UTC, as PostgreSQL stores it) and id.
 */
export interface TimeCursor {
	at: string;
	id: string;
}

export function encodeTimeCursor(c: TimeCursor): string {
	return Buffer.from(`t|${c.at}|${c.id}`).toString('base64url');
}

const CURSOR_AT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{6}Z$/;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The decoded cursor, null without one, or a 400 for one this API did not make. */
export function decodeTimeCursor(cursor: string | undefined): Parsed<TimeCursor | null> {
	if (cursor === undefined || cursor === '') return { ok: true, data: null };
	const [tag, at, id] = Buffer.from(cursor, 'base64url').toString('utf8').split('|');
	if (tag !== 't' || !CURSOR_AT.test(at ?? '') || !UUID.test(id ?? '')) return { ok: false, response: invalid([{ path: 'cursor', message: 'cursor is not a cursor of this list; pass nextCursor as it came' }]) };
	return { ok: true, data: { at, id } };
}

/** Residuals and snapshots page by step: the cursor names the last step of the previous page. */
export function encodeStepCursor(step: number): string {
	return Buffer.from(`s|${step}`).toString('base64url');
}

export function decodeStepCursor(cursor: string | undefined): Parsed<number> {
	if (cursor === undefined || cursor === '') return { ok: true, data: -1 };
	const [tag, step] = Buffer.from(cursor, 'base64url').toString('utf8').split('|');
	if (tag !== 's' || !/^\d{1,9}$/.test(step ?? '')) return { ok: false, response: invalid([{ path: 'cursor', message: 'cursor is not a cursor of this list; pass nextCursor as it came' }]) };
	return { ok: true, data: Number(step) };
}

// ---------------------------------------------------------------- content negotiation

/**
 * The best of `offered` for an Accept header (q-values honoured, `*` wildcards), the first offered
 * without a header, null when the header accepts none of them.
 */
export function negotiate(accept: string | null, offered: readonly string[]): string | null {
	if (!accept || accept.trim() === '') return offered[0] ?? null;
	const ranges = accept.split(',').map((part, order) => {
		const [type, ...params] = part.trim().split(';');
		const q = params.map((p) => p.trim()).find((p) => p.startsWith('q='));
		return { type: type.trim().toLowerCase(), q: q ? Number(q.slice(2)) || 0 : 1, order };
	});
	let best: { type: string; q: number; specificity: number; order: number } | null = null;
	for (const [index, type] of offered.entries()) {
		const [major] = type.split('/');
		for (const r of ranges) {
			const specificity = r.type === type ? 3 : r.type === `${major}/*` ? 2 : r.type === '*/*' ? 1 : 0;
			if (!specificity || r.q <= 0) continue;
			const candidate = { type, q: r.q, specificity, order: index };
			if (!best || candidate.q > best.q || (candidate.q === best.q && (candidate.specificity > best.specificity || (candidate.specificity === best.specificity && candidate.order < best.order)))) {
				best = candidate;
			}
		}
	}
	return best?.type ?? null;
}

export function notAcceptable(offered: readonly string[]): Response {
	return errorResponse(406, 'not_acceptable', `This resource is available as ${offered.join(' or ')}; the Accept header asks for neither.`);
}

/** Does an If-None-Match header name this ETag (or `*`)? */
export function matchesEtag(ifNoneMatch: string | null, etag: string): boolean {
	if (!ifNoneMatch) return false;
	const bare = (t: string) => t.trim().replace(/^W\//, '');
	return ifNoneMatch.split(',').some((t) => t.trim() === '*' || bare(t) === bare(etag));
}
