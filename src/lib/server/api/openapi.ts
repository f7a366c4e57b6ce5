/**
 * The OpenAPI 3.1 document of `/api/v1`, generated from the same zod schemas the handlers check
 * requests with (`schemas.ts`, the case schema, the study, upload, comparison and sign-off forms)
 * through zod's JSON Schema output (draft 2020-12, the dialect of OpenAPI 3.1). Served at
 * `/api/v1/openapi.json` and drawn by the reference page `/team/api`.
 *
 * Adding a route: write `src/routes/api/v1/…/+server.ts`, then add its operation to `operations`
 * below (method, path, role, query, body, responses). The API test compares this list with the
 * route files and validates real responses of every route against the document.
 */
import { z } from 'zod';
import { caseSchema } from '../../../../solver/case.js';
import { studyInputSchema } from '../studies/commands.js';
import { signOffForm } from '../signoffs.js';
import type { Role } from '../roles.js';
import { rateLimitSettings } from './rate-limit.js';
import * as s from './schemas.js';

type JsonSchema = Record<string, unknown>;
type Method = 'get' | 'post' | 'put' | 'delete';

// ---------------------------------------------------------------- named schemas

/** Response shapes (JSON Schema of the zod output). */
const responseSchemas = {
	Error: s.errorSchema,
	Me: s.meSchema,
	Column: s.columnSchema,
	ColumnPage: s.pageOf(s.columnSchema),
	CaseDocument: caseSchema,
	CaseSummary: s.caseSummarySchema,
	CasePage: s.pageOf(s.caseSummarySchema),
	Case: s.caseDetailSchema,
	StudyPoint: s.studyPointSchema,
	Run: s.runSchema,
	RunPage: s.pageOf(s.runSchema),
	RunDetail: s.runDetailSchema,
	RunEnvelope: s.runEnvelope,
	Profiles: s.profilesSchema,
	Results: s.resultsSchema,
	ResidualPoint: s.residualPointSchema,
	ResidualPage: s.pageOf(s.residualPointSchema),
	SnapshotInfo: s.snapshotInfoSchema,
	SnapshotInfoPage: s.pageOf(s.snapshotInfoSchema),
	Snapshot: s.snapshotSchema,
	StudySummary: s.studySummarySchema,
	StudyPage: s.pageOf(s.studySummarySchema),
	StudyMember: s.studyMemberSchema,
	StudyProgress: s.studyProgressSchema,
	Study: s.studyDetailSchema,
	StudyCreated: s.studyCreated,
	StudyCancelled: s.studyCancelled,
	StudyRerun: s.studyRerun,
	MeasurementSummary: s.measurementSummarySchema,
	MeasurementPage: s.pageOf(s.measurementSummarySchema),
	Measurement: s.measurementDetailSchema,
	ComparisonSummary: s.comparisonSummarySchema,
	ComparisonPage: s.pageOf(s.comparisonSummarySchema),
	Comparison: s.comparisonDetailSchema,
	SignOff: s.signOffSchema,
	SignOffList: s.signOffList,
	SignOffCreated: s.signOffCreated
} satisfies Record<string, z.ZodType>;

/** Request bodies (JSON Schema of the zod input: fields with defaults may be left out). */
const requestSchemas = {
	CaseDocumentInput: caseSchema,
	CaseCreate: s.caseCreateBody,
	CaseUpdate: s.caseUpdateBody,
	QueueRun: s.queueBody,
	StudyCreate: studyInputSchema,
	MeasurementUpload: s.measurementUploadBody,
	ComparisonCreate: s.comparisonCreateBody,
	SignOffCreate: signOffForm
} satisfies Record<string, z.ZodType>;

type ResponseName = keyof typeof responseSchemas;
type RequestName = keyof typeof requestSchemas;

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });

/** Formats say it all: the long patterns zod adds beside them only clutter the reference. */
const FORMATS_WITHOUT_PATTERN = new Set(['uuid', 'date-time', 'date', 'email']);

/**
 * zod's JSON Schema with our field metadata in standard places: the case schema's `label` becomes
 * `title`, `help` the description, `unit` the `x-unit` annotation; its `min`/`max` copies go.
 */
function tidy(schema: JsonSchema): void {
	if (typeof schema.label === 'string') {
		schema.title ??= schema.label;
		delete schema.label;
	}
	if (typeof schema.help === 'string') {
		schema.description ??= schema.help;
		delete schema.help;
	}
	if (typeof schema.unit === 'string') {
		schema['x-unit'] = schema.unit;
		delete schema.unit;
	}
	if ('min' in schema && 'minimum' in schema) delete schema.min;
	if ('max' in schema && 'maximum' in schema) delete schema.max;
	if ('min' in schema && 'exclusiveMinimum' in schema) delete schema.min;
	if (typeof schema.format === 'string' && FORMATS_WITHOUT_PATTERN.has(schema.format)) delete schema.pattern;
	delete schema.id;
}

function registrySchemas(entries: Record<string, z.ZodType>, io: 'input' | 'output'): Record<string, JsonSchema> {
	const registry = z.registry<{ id: string }>();
	for (const [id, schema] of Object.entries(entries)) registry.add(schema, { id });
	const out = z.toJSONSchema(registry, {
		target: 'draft-2020-12',
		io,
		unrepresentable: 'any',
		uri: (id) => `#/components/schemas/${id}`,
		override: (ctx) => tidy(ctx.jsonSchema as JsonSchema)
	}).schemas as Record<string, JsonSchema>;
	for (const schema of Object.values(out)) {
		delete schema.$schema;
		delete schema.$id;
	}
	return out;
}

/** One field of a query string (or a path parameter) as a JSON Schema. */
function fieldSchema(schema: z.ZodType): JsonSchema {
	const json = z.toJSONSchema(schema, { target: 'draft-2020-12', io: 'input', unrepresentable: 'any', override: (ctx) => tidy(ctx.jsonSchema as JsonSchema) }) as JsonSchema;
	delete json.$schema;
	return json;
}

// ---------------------------------------------------------------- operations

export type Tag = 'Account' | 'Columns' | 'Cases' | 'Runs' | 'Studies' | 'Measurements' | 'Comparisons';

interface Success {
	status: number;
	description: string;
	/** a JSON body of this named schema */
	json?: ResponseName;
	/** other media types (no schema: bytes or a stream) */
	other?: Record<string, string>;
	headers?: Record<string, { description: string; schema: JsonSchema }>;
}

export interface Operation {
	method: Method;
	/** relative to the server URL `/api/v1`, with `{param}` placeholders */
	path: string;
	operationId: string;
	tag: Tag;
	summary: string;
	description?: string;
	minRole: Role;
	/** path parameters: name → description (ids are UUIDs unless listed in `integerParams`) */
	params?: Record<string, string>;
	integerParams?: string[];
	query?: z.ZodObject;
	body?: { json?: RequestName; other?: Record<string, { description: string; schema: JsonSchema }>; description?: string; query?: z.ZodObject };
	ok: Success[];
	/** refusals beyond the usual ones (400 with a body or query, 401, 403, 404 with ids, 429) */
	also?: number[];
}

const etagHeader = { ETag: { description: 'changes whenever the results change; send it back as If-None-Match', schema: { type: 'string' } } };

const idParam = (what: string) => ({ id: `the ${what}'s id` });

function signOffOperations(base: string, subject: string, tag: Tag): Operation[] {
	return [
		{
			method: 'get',
			path: `${base}/{id}/signoffs`,
			operationId: `list${subject}SignOffs`,
			tag,
			summary: `The sign-offs of a ${subject.toLowerCase()}`,
			minRole: 'viewer',
			params: idParam(subject.toLowerCase()),
			ok: [{ status: 200, description: 'Newest first', json: 'SignOffList' }]
		},
		{
			method: 'post',
			path: `${base}/{id}/signoffs`,
			operationId: `signOff${subject}`,
			tag,
			summary: `Sign off a ${subject.toLowerCase()}`,
			description: 'Records the verdict (a comment is required for changes requested) and e-mails whoever queued the runs concerned, as the page does.',
			minRole: 'lead',
			params: idParam(subject.toLowerCase()),
			body: { json: 'SignOffCreate' },
			ok: [{ status: 201, description: 'The verdict was recorded', json: 'SignOffCreated' }]
		}
	];
}

export const operations: Operation[] = [
	{
		method: 'get',
		path: '/me',
		operationId: 'me',
		tag: 'Account',
		summary: 'Who the request acts for',
		description: 'The member, team and role of the token (or session), and the token itself. A cheap way to check a token.',
		minRole: 'viewer',
		ok: [{ status: 200, description: 'The caller', json: 'Me' }]
	},
	{
		method: 'get',
		path: '/openapi.json',
		operationId: 'openapi',
		tag: 'Account',
		summary: 'This document',
		minRole: 'viewer',
		ok: [{ status: 200, description: 'The OpenAPI 3.1 document', other: { 'application/json': 'OpenAPI 3.1 document' } }]
	},
	// ------------------------------------------------------------ columns
	{
		method: 'get',
		path: '/columns',
		operationId: 'listColumns',
		tag: 'Columns',
		summary: "The team's columns",
		description: 'Newest first.',
		minRole: 'viewer',
		query: s.columnsQuery,
		ok: [{ status: 200, description: 'A page of columns', json: 'ColumnPage' }]
	},
	{
		method: 'get',
		path: '/columns/{id}',
		operationId: 'getColumn',
		tag: 'Columns',
		summary: 'One column',
		minRole: 'viewer',
		params: idParam('column'),
		ok: [{ status: 200, description: 'The column', json: 'Column' }]
	},
	// ------------------------------------------------------------ cases
	{
		method: 'get',
		path: '/cases',
		operationId: 'listCases',
		tag: 'Cases',
		summary: "The team's cases",
		description: 'Newest first, without their documents (get one case for that).',
		minRole: 'viewer',
		query: s.casesQuery,
		ok: [{ status: 200, description: 'A page of cases', json: 'CasePage' }]
	},
	{
		method: 'post',
		path: '/cases',
		operationId: 'createCase',
		tag: 'Cases',
		summary: 'Create a case',
		description:
			'The document is checked with the case schema the editor uses (SI units; sections and fields with defaults may be left out). Refusals name the field path, e.g. `document.geometry.heightM`.',
		minRole: 'analyst',
		body: { json: 'CaseCreate' },
		ok: [{ status: 201, description: 'The case as stored (defaults filled in)', json: 'Case' }],
		also: [404]
	},
	{
		method: 'get',
		path: '/cases/{id}',
		operationId: 'getCase',
		tag: 'Cases',
		summary: 'One case with its document',
		minRole: 'viewer',
		params: idParam('case'),
		ok: [{ status: 200, description: 'The case', json: 'Case' }]
	},
	{
		method: 'put',
		path: '/cases/{id}',
		operationId: 'updateCase',
		tag: 'Cases',
		summary: "Replace a case's document",
		description: 'Runs already queued keep their frozen copy.',
		minRole: 'analyst',
		params: idParam('case'),
		body: { json: 'CaseUpdate' },
		ok: [{ status: 200, description: 'The case as stored', json: 'Case' }]
	},
	...signOffOperations('/cases', 'Case', 'Cases'),
	// ------------------------------------------------------------ runs
	{
		method: 'get',
		path: '/runs',
		operationId: 'listRuns',
		tag: 'Runs',
		summary: "The team's runs",
		description: 'Newest queued first, without the frozen case documents.',
		minRole: 'viewer',
		query: s.runsQuery,
		ok: [{ status: 200, description: 'A page of runs', json: 'RunPage' }]
	},
	{
		method: 'post',
		path: '/runs',
		operationId: 'queueRun',
		tag: 'Runs',
		summary: 'Queue a run of a case',
		description: "The case is validated and frozen into the run. 429 when the team already has its most runs queued or running at once (`too_many_runs`).",
		minRole: 'analyst',
		body: { json: 'QueueRun' },
		ok: [{ status: 201, description: 'The queued run', json: 'RunEnvelope' }],
		also: [404]
	},
	{
		method: 'get',
		path: '/runs/{id}',
		operationId: 'getRun',
		tag: 'Runs',
		summary: 'One run: status, progress, summary and its frozen case',
		minRole: 'viewer',
		params: idParam('run'),
		ok: [{ status: 200, description: 'The run', json: 'RunDetail' }]
	},
	{
		method: 'post',
		path: '/runs/{id}/cancel',
		operationId: 'cancelRun',
		tag: 'Runs',
		summary: 'Cancel a run',
		description: 'A queued run is cancelled at once; a running one stops within about a second (`cancelRequested`); an ended one is left as it is.',
		minRole: 'analyst',
		params: idParam('run'),
		ok: [{ status: 200, description: 'The run after the request', json: 'RunEnvelope' }]
	},
	{
		method: 'post',
		path: '/runs/{id}/rerun',
		operationId: 'rerunRun',
		tag: 'Runs',
		summary: "Queue a new run of this run's frozen case",
		minRole: 'analyst',
		params: idParam('run'),
		ok: [{ status: 201, description: 'The new run', json: 'RunEnvelope' }]
	},
	{
		method: 'get',
		path: '/runs/{id}/results',
		operationId: 'getRunResults',
		tag: 'Runs',
		summary: 'Summary and profiles',
		description: 'The final profiles when the run has them, else its newest snapshot. Send the ETag back as If-None-Match to get 304 while nothing changed.',
		minRole: 'viewer',
		params: idParam('run'),
		ok: [
			{ status: 200, description: 'The results', json: 'Results', headers: etagHeader },
			{ status: 304, description: 'Not modified since the ETag sent', headers: etagHeader }
		]
	},
	{
		method: 'get',
		path: '/runs/{id}/residuals',
		operationId: 'listRunResiduals',
		tag: 'Runs',
		summary: 'Residual history',
		description: 'Oldest step first. Stored for every step to 999, every 10th to 9 999, every 100th beyond, and the last step.',
		minRole: 'viewer',
		params: idParam('run'),
		query: s.stepPageQuery,
		ok: [{ status: 200, description: 'A page of residual points', json: 'ResidualPage' }]
	},
	{
		method: 'get',
		path: '/runs/{id}/snapshots',
		operationId: 'listRunSnapshots',
		tag: 'Runs',
		summary: 'Snapshots of a run',
		description: 'Oldest first. Periodic snapshots are stored in single precision; the final one (`isFinal`) in double precision.',
		minRole: 'viewer',
		params: idParam('run'),
		query: s.stepPageQuery,
		ok: [{ status: 200, description: 'A page of snapshots', json: 'SnapshotInfoPage' }]
	},
	{
		method: 'get',
		path: '/runs/{id}/snapshots/{snapshotId}',
		operationId: 'getRunSnapshot',
		tag: 'Runs',
		summary: 'One snapshot, as JSON or msgpack',
		description:
			'By the Accept header: `application/json` (default) or `application/x-msgpack` for the stored bytes (decode with msgpackr `new Packr({ moreTypes: true })`: `{ v, step, timeS, names, shape: [fields, cells], x, values }`, values row-major by field).',
		minRole: 'viewer',
		params: { ...idParam('run'), snapshotId: "the snapshot's id (from the snapshot list)" },
		integerParams: ['snapshotId'],
		ok: [{ status: 200, description: 'The snapshot', json: 'Snapshot', other: { 'application/x-msgpack': 'the stored msgpack bytes' } }],
		also: [406]
	},
	{
		method: 'get',
		path: '/runs/{id}/events',
		operationId: 'followRun',
		tag: 'Runs',
		summary: 'Live events (server-sent events)',
		description:
			'`residuals` `{ points: [{ step, timeS, values }] }`, `progress` `{ step, simulatedTimeS, endTimeS, fraction, wallTimeS }`, `snapshot` `{ id, step, timeS, isFinal }` and `status` `{ status, attempts, errorMessage, summary, startedAt, finishedAt }`. Each event has an id; send the last one as `Last-Event-ID` (or `?after=`) to resume exactly where you left. The stream stays open after the run ended: stop on a `status` of converged, finished, failed or cancelled.',
		minRole: 'viewer',
		params: idParam('run'),
		query: s.eventsQuery,
		ok: [{ status: 200, description: 'The event stream', other: { 'text/event-stream': 'server-sent events' } }]
	},
	// ------------------------------------------------------------ studies
	{
		method: 'get',
		path: '/studies',
		operationId: 'listStudies',
		tag: 'Studies',
		summary: "The team's studies",
		minRole: 'viewer',
		query: s.studiesQuery,
		ok: [{ status: 200, description: 'A page of studies', json: 'StudyPage' }]
	},
	{
		method: 'post',
		path: '/studies',
		operationId: 'createStudy',
		tag: 'Studies',
		summary: 'Create and queue a study',
		description: "A sweep, closure matrix or grid study of a case; every member is an ordinary run. Refused (400, naming the field) when a member would not be a valid case or the study is larger than the team's cap.",
		minRole: 'analyst',
		body: { json: 'StudyCreate' },
		ok: [{ status: 201, description: 'The study and its members', json: 'StudyCreated' }],
		also: [404]
	},
	{
		method: 'get',
		path: '/studies/{id}',
		operationId: 'getStudy',
		tag: 'Studies',
		summary: 'One study with its members and progress',
		minRole: 'viewer',
		params: idParam('study'),
		ok: [{ status: 200, description: 'The study', json: 'Study' }]
	},
	{
		method: 'post',
		path: '/studies/{id}/cancel',
		operationId: 'cancelStudy',
		tag: 'Studies',
		summary: 'Cancel every queued and running member',
		minRole: 'analyst',
		params: idParam('study'),
		ok: [{ status: 200, description: 'What was cancelled', json: 'StudyCancelled' }]
	},
	{
		method: 'post',
		path: '/studies/{id}/rerun',
		operationId: 'rerunStudy',
		tag: 'Studies',
		summary: 'Queue again the members that failed or were cancelled',
		minRole: 'analyst',
		params: idParam('study'),
		ok: [{ status: 201, description: 'The new runs', json: 'StudyRerun' }],
		also: [409]
	},
	...signOffOperations('/studies', 'Study', 'Studies'),
	// ------------------------------------------------------------ measurements
	{
		method: 'get',
		path: '/measurements',
		operationId: 'listMeasurements',
		tag: 'Measurements',
		summary: "The team's measurements",
		minRole: 'viewer',
		query: s.measurementsQuery,
		ok: [{ status: 200, description: 'A page of measurements (without their points)', json: 'MeasurementPage' }]
	},
	{
		method: 'post',
		path: '/measurements',
		operationId: 'uploadMeasurement',
		tag: 'Measurements',
		summary: 'Upload a measurement',
		description:
			'JSON with the upload form\'s fields and either `csv` (the file as text) or `rows` ([x, y] pairs), or the file itself as `text/csv` with the same fields in the query string. The same checks as the upload page: units, operating point, order and range of every row (a row refusal names `rows.<i>` or `csv` and the file row), at most 20 000 rows and 400 KiB.',
		minRole: 'analyst',
		body: {
			json: 'MeasurementUpload',
			other: { 'text/csv': { description: 'the file; its fields in the query string (see the parameters)', schema: { type: 'string' } } },
			query: s.measurementCsvQuery
		},
		ok: [{ status: 201, description: 'The stored measurement (SI)', json: 'Measurement' }],
		also: [404]
	},
	{
		method: 'get',
		path: '/measurements/{id}',
		operationId: 'getMeasurement',
		tag: 'Measurements',
		summary: 'One measurement with its points (SI)',
		minRole: 'viewer',
		params: idParam('measurement'),
		ok: [{ status: 200, description: 'The measurement', json: 'Measurement' }]
	},
	{
		method: 'delete',
		path: '/measurements/{id}',
		operationId: 'deleteMeasurement',
		tag: 'Measurements',
		summary: 'Delete a measurement',
		minRole: 'analyst',
		params: idParam('measurement'),
		ok: [{ status: 204, description: 'Deleted' }]
	},
	// ------------------------------------------------------------ comparisons
	{
		method: 'get',
		path: '/comparisons',
		operationId: 'listComparisons',
		tag: 'Comparisons',
		summary: "The team's comparisons",
		minRole: 'viewer',
		query: s.comparisonsQuery,
		ok: [{ status: 200, description: 'A page of comparisons', json: 'ComparisonPage' }]
	},
	{
		method: 'post',
		path: '/comparisons',
		operationId: 'createComparison',
		tag: 'Comparisons',
		summary: 'Compare 2–6 converged or finished runs of one column',
		minRole: 'lead',
		body: { json: 'ComparisonCreate' },
		ok: [{ status: 201, description: 'The comparison', json: 'Comparison' }],
		also: [404]
	},
	{
		method: 'get',
		path: '/comparisons/{id}',
		operationId: 'getComparison',
		tag: 'Comparisons',
		summary: 'One comparison with the design numbers of its runs',
		minRole: 'viewer',
		params: idParam('comparison'),
		ok: [{ status: 200, description: 'The comparison', json: 'Comparison' }]
	},
	...signOffOperations('/comparisons', 'Comparison', 'Comparisons')
];

// ---------------------------------------------------------------- the document

const errorResponses: Record<number, { name: string; description: string }> = {
	400: { name: 'BadRequest', description: 'The query or body is not valid; `issues` name the fields' },
	401: { name: 'Unauthorized', description: 'No token or session, or a token that is unknown, revoked or expired' },
	403: { name: 'Forbidden', description: "The token's role (a read-only token: viewer) is below what the operation needs" },
	404: { name: 'NotFound', description: 'No such item in your team (another team\'s ids and malformed ids look the same)' },
	406: { name: 'NotAcceptable', description: 'The Accept header asks for no media type this resource has' },
	409: { name: 'Conflict', description: 'The item is not in a state that allows this' },
	413: { name: 'TooLarge', description: 'The body is larger than the operation takes' },
	415: { name: 'UnsupportedMediaType', description: 'The body is not of a media type the operation takes' },
	429: { name: 'TooManyRequests', description: 'Rate limit of the token (`rate_limited`, see Retry-After) or the team\'s limit of active runs (`too_many_runs`)' }
};

const ROLE_TEXT: Record<Role, string> = {
	viewer: 'Any member (viewer and up).',
	analyst: 'Analysts and up.',
	lead: 'Leads and admins.',
	admin: 'Admins only.'
};

function describe(): string {
	const { perMinute, burst } = rateLimitSettings();
	return [
		"Twofold's JSON API for scripts, notebooks and the plant's other tools.",
		'',
		'**Authentication.** Create a personal API token under Team → API tokens and send it as `Authorization: Bearer tf_…`. A token acts for you in the team you created it in, with your role (or, read-only, as a viewer) — never more. Browser sessions work too.',
		'',
		'**Errors.** Every refusal has the body `{ "message": "…", "error": { "code", "message", "issues": [{ "path", "message" }] } }`. 401: no or a bad token; 403: your role does not allow it; 404: no such item in your team (another team\'s ids and malformed ids answer the same).',
		'',
		'**Requests** with a body send JSON (`Content-Type: application/json`); measurement uploads also take `text/csv`. Form content types (what `curl -d` sends without a Content-Type header) are refused with 403 by the cross-site form protection.',
		'',
		`**Rate limit.** ${perMinute} requests a minute per token, bursts of up to ${burst}; beyond that 429 with \`Retry-After\` (seconds).`,
		'',
		'**Lists** are newest first, `limit` (1–200, default 50) items a page; pass `nextCursor` as `cursor` for the next page (null on the last). Filters: `column`, `since`, `until` (ISO 8601), and `status` on runs.',
		'',
		'**Units.** SI throughout (m, s, Pa, K, kg/m³).'
	].join('\n');
}

function parameterList(op: Operation): JsonSchema[] {
	const out: JsonSchema[] = [];
	for (const [name, description] of Object.entries(op.params ?? {})) {
		const schema = op.integerParams?.includes(name) ? { type: 'integer', minimum: 1 } : { type: 'string', format: 'uuid' };
		out.push({ name, in: 'path', required: true, description, schema });
	}
	const query = op.query ?? op.body?.query;
	if (query) {
		for (const [name, field] of Object.entries(query.shape as Record<string, z.ZodType>)) {
			const schema = fieldSchema(field);
			const description = typeof schema.description === 'string' ? schema.description : undefined;
			delete schema.description;
			const param: JsonSchema = { name, in: 'query', required: !field.safeParse(undefined).success, schema };
			if (op.body?.query) param.description = `${description ? `${description}; ` : ''}with a text/csv body only`;
			else if (description) param.description = description;
			if (op.body?.query) param.required = false;
			out.push(param);
		}
	}
	return out;
}

function operationObject(op: Operation): JsonSchema {
	const responses: Record<string, unknown> = {};
	for (const okResponse of op.ok) {
		const content: Record<string, unknown> = {};
		if (okResponse.json) content['application/json'] = { schema: ref(okResponse.json) };
		for (const [type, description] of Object.entries(okResponse.other ?? {})) {
			content[type] = type === 'application/json' ? { schema: { type: 'object', description } } : { schema: { description } };
		}
		const r: JsonSchema = { description: okResponse.description };
		if (Object.keys(content).length) r.content = content;
		if (okResponse.headers) r.headers = okResponse.headers;
		responses[String(okResponse.status)] = r;
	}
	const refusals = new Set<number>([401, 403, 429, ...(op.also ?? [])]);
	if (op.query || op.body) refusals.add(400);
	if (op.params) refusals.add(404);
	if (op.body) {
		refusals.add(413);
		refusals.add(415);
	}
	for (const status of [...refusals].sort((a, b) => a - b)) responses[String(status)] = { $ref: `#/components/responses/${errorResponses[status].name}` };

	const o: JsonSchema = {
		operationId: op.operationId,
		tags: [op.tag],
		summary: op.summary,
		description: [op.description, ROLE_TEXT[op.minRole]].filter(Boolean).join('\n\n'),
		'x-min-role': op.minRole,
		responses
	};
	const parameters = parameterList(op);
	if (parameters.length) o.parameters = parameters;
	if (op.body) {
		const content: Record<string, unknown> = {};
		if (op.body.json) content['application/json'] = { schema: ref(op.body.json) };
		for (const [type, other] of Object.entries(op.body.other ?? {})) content[type] = { schema: { ...other.schema, description: other.description } };
		o.requestBody = { required: true, content, ...(op.body.description ? { description: op.body.description } : {}) };
	}
	return o;
}

export interface OpenApiDocument {
	openapi: string;
	info: { title: string; version: string; description: string };
	servers: { url: string }[];
	tags: { name: string; description: string }[];
	paths: Record<string, Record<string, JsonSchema>>;
	components: { schemas: Record<string, JsonSchema>; responses: Record<string, JsonSchema>; securitySchemes: Record<string, JsonSchema> };
	security: Record<string, string[]>[];
}

const tagDescriptions: Record<Tag, string> = {
	Account: 'The caller and this document',
	Columns: 'Equipment items under study',
	Cases: 'Complete setups of a column (the case document, SI)',
	Runs: 'Queued solver runs: queue, cancel, re-run, follow, results',
	Studies: 'Sweeps, closure matrices and grid studies',
	Measurements: "The team's pilot and plant data",
	Comparisons: 'Runs side by side, signed off by a lead'
};

let cached: OpenApiDocument | null = null;

/** The document (built once per process). */
export function openApiDocument(): OpenApiDocument {
	if (cached) return cached;
	const schemas = { ...registrySchemas(responseSchemas, 'output'), ...registrySchemas(requestSchemas, 'input') };
	const responses: Record<string, JsonSchema> = {};
	for (const [status, r] of Object.entries(errorResponses)) {
		const response: JsonSchema = { description: r.description, content: { 'application/json': { schema: ref('Error') } } };
		if (status === '429') response.headers = { 'Retry-After': { description: 'seconds to wait (rate limit)', schema: { type: 'integer', minimum: 1 } } };
		if (status === '401') response.headers = { 'WWW-Authenticate': { description: 'Bearer, when a token was sent', schema: { type: 'string' } } };
		responses[r.name] = response;
	}
	const paths: OpenApiDocument['paths'] = {};
	for (const op of operations) (paths[op.path] ??= {})[op.method] = operationObject(op);
	cached = {
		openapi: '3.1.0',
		info: { title: 'Twofold API', version: '1', description: describe() },
		servers: [{ url: '/api/v1' }],
		tags: (Object.keys(tagDescriptions) as Tag[]).map((name) => ({ name, description: tagDescriptions[name] })),
		paths,
		components: {
			schemas,
			responses,
			securitySchemes: {
				bearerToken: { type: 'http', scheme: 'bearer', bearerFormat: 'tf_ followed by 43 base64url characters', description: 'A personal API token (Team → API tokens)' },
				session: { type: 'apiKey', in: 'cookie', name: 'authjs.session-token', description: 'The browser session of the app' }
			}
		},
		security: [{ bearerToken: [] }, { session: [] }]
	};
	return cached;
}
