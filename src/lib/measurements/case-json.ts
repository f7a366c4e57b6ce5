/**
 * The case as a versioned JSON document for download and import. The document is the case itself
 * (its `schemaVersion` first) so it can be read and edited by hand; importing checks the version
 * before anything else and then validates the whole case, so a document is taken whole or refused.
 */
import { SCHEMA_VERSION, validateCase, type CaseDocument, type CaseIssue } from '../../../solver/case.js';

/** Larger than any case (a few kB); keeps a stray upload of a big file from being parsed. */
export const MAX_CASE_JSON_BYTES = 262_144;

/** The case as pretty-printed JSON with `schemaVersion` as the first key. */
export function caseToJson(caseDoc: CaseDocument): string {
	const { schemaVersion, ...rest } = caseDoc;
	return JSON.stringify({ schemaVersion, ...rest }, null, '\t') + '\n';
}

export type CaseImportResult = { ok: true; value: CaseDocument } | { ok: false; issues: CaseIssue[] };

function refuse(path: string, message: string): CaseImportResult {
	return { ok: false, issues: [{ path, message }] };
}

/**
 * Read a case document from JSON text. Refuses, with a message, text that is not JSON, a document
 * without a `schemaVersion`, an unknown or newer version, and any field the case schema rejects.
 */
export function caseFromJson(text: string): CaseImportResult {
	const bytes = new TextEncoder().encode(text).length;
	if (bytes > MAX_CASE_JSON_BYTES) return refuse('', `The file is ${bytes} bytes; a case document is at most ${MAX_CASE_JSON_BYTES} bytes`);
	let doc: unknown;
	try {
		doc = JSON.parse(text.replace(/^\uFEFF/, ''));
	} catch (e) {
		return refuse('', `The file is not valid JSON: ${(e as Error).message}`);
	}
	if (!doc || typeof doc !== 'object' || Array.isArray(doc)) return refuse('', 'The file does not hold a case document (a JSON object)');
	if (!('schemaVersion' in doc)) return refuse('schemaVersion', 'The document has no schemaVersion, so it is not a Twofold case document');
	const v = (doc as { schemaVersion: unknown }).schemaVersion;
	if (typeof v !== 'number' || !Number.isInteger(v) || v < 1) {
		return refuse('schemaVersion', `The document has an unknown schemaVersion (${JSON.stringify(v)}); this Twofold reads version ${SCHEMA_VERSION}`);
	}
	// validateCase refuses a newer version with its own message
	return validateCase(doc);
}
