/**
 * The JSON API's shapes, as zod schemas: request bodies and query strings are checked with them,
 * and the OpenAPI document (`openapi.ts`) is generated from them, so both say the same thing.
 * Response schemas describe the wire form (dates as ISO 8601 strings); the `…View` functions turn
 * database rows into exactly that form. Ids are UUIDs except user ids (opaque strings).
 */
import { z } from 'zod';
import { caseKinds, caseSchema, upgradeCaseDocument } from '../../../../solver/case.js';
import { measurementKinds } from '../../measurements/kinds.js';
import { uploadFormSchema } from '../../measurements/upload.js';
import { studyKinds } from '../../studies/spec.js';
import { runStatusEnum } from '../db/schema.js';
import { ROLES } from '../roles.js';
import { comparisonForm } from '../comparisons.js';
import type { Column } from '../columns.js';
import type { Case } from '../cases.js';
import type { Run } from '../runs/commands.js';
import type { Measurement, MeasurementSummary } from '../measurements.js';
import type { StudyMember } from '../studies/reads.js';
import type { StudyProgress } from '../../studies/results.js';

const id = z.uuid();
const dateTime = z.iso.datetime();
const iso = (d: Date) => d.toISOString();
const isoOrNull = (d: Date | null | undefined) => (d ? d.toISOString() : null);

export const RUN_STATUSES = runStatusEnum.enumValues;
export const runStatusSchema = z.enum(RUN_STATUSES);

// ---------------------------------------------------------------- errors and pages

export const issueSchema = z.object({
	path: z.string().meta({ description: 'dotted path of the field, e.g. `document.geometry.heightM`; empty for the body as a whole' }),
	message: z.string()
});

export const errorSchema = z
	.object({
		message: z.string().meta({ description: 'the same as error.message' }),
		error: z.object({
			code: z.string().meta({ description: 'e.g. invalid_input, unauthorized, forbidden, not_found, rate_limited' }),
			message: z.string(),
			issues: z.array(issueSchema)
		})
	})
	.meta({ description: 'Every refusal has this body.' });

export function pageOf<T extends z.ZodType>(item: T) {
	return z.object({
		items: z.array(item),
		nextCursor: z.string().nullable().meta({ description: 'pass as `cursor` for the next page; null on the last page' })
	});
}

// ---------------------------------------------------------------- query strings

const dateOrDateTime = z
	.union([z.iso.datetime({ offset: true }), z.iso.date()], { error: 'Use an ISO 8601 date (2025-03-01) or date-time (2025-03-01T12:00:00Z)' })
	.transform((s) => new Date(s.length === 10 ? `${s}T00:00:00Z` : s));

/** `cursor` and `limit` of every list, plus the time window on the list's own time column. */
export const listQueryShape = {
	cursor: z.string().max(200).optional().meta({ description: 'the `nextCursor` of the previous page' }),
	limit: z.coerce
		.number({ error: 'limit must be a whole number from 1 to 200' })
		.int({ error: 'limit must be a whole number from 1 to 200' })
		.min(1, { error: 'limit must be at least 1' })
		.max(200, { error: 'limit must be at most 200' })
		.default(50)
		.meta({ description: 'items per page, 1–200' }),
	since: dateOrDateTime.optional().meta({ description: 'only items created (runs: queued) at or after this instant' }),
	until: dateOrDateTime.optional().meta({ description: 'only items created (runs: queued) before this instant' })
};
const columnFilter = z.uuid({ error: 'column must be a column id (a UUID)' }).optional().meta({ description: 'only the items of this column' });

export const columnsQuery = z.strictObject({ ...listQueryShape });
export const casesQuery = z.strictObject({ ...listQueryShape, column: columnFilter });
export const runsQuery = z.strictObject({
	...listQueryShape,
	column: columnFilter,
	case: z.uuid({ error: 'case must be a case id (a UUID)' }).optional().meta({ description: 'only the runs of this case' }),
	study: z.uuid({ error: 'study must be a study id (a UUID)' }).optional().meta({ description: 'only the runs of this study' }),
	status: z
		.string()
		.regex(new RegExp(`^(${RUN_STATUSES.join('|')})(,(${RUN_STATUSES.join('|')}))*$`), { error: `status must be one or more of ${RUN_STATUSES.join(', ')}, separated by commas` })
		.optional()
		.meta({ description: `one status or several separated by commas: ${RUN_STATUSES.join(', ')}` })
});
export const studiesQuery = z.strictObject({ ...listQueryShape, column: columnFilter });
export const measurementsQuery = z.strictObject({
	...listQueryShape,
	column: columnFilter,
	kind: z.enum(measurementKinds, { error: `kind must be one of ${measurementKinds.join(', ')}` }).optional()
});
export const comparisonsQuery = z.strictObject({ ...listQueryShape, column: columnFilter });

/** Residual history and snapshot lists page by step, and are longer. */
export const stepPageQuery = z.strictObject({
	cursor: z.string().max(200).optional().meta({ description: 'the `nextCursor` of the previous page' }),
	limit: z.coerce
		.number({ error: 'limit must be a whole number from 1 to 10000' })
		.int({ error: 'limit must be a whole number from 1 to 10000' })
		.min(1, { error: 'limit must be at least 1' })
		.max(10_000, { error: 'limit must be at most 10000' })
		.default(1000)
		.meta({ description: 'items per page, 1–10000' })
});

export const eventsQuery = z.strictObject({
	after: z.string().max(200).optional().meta({ description: 'resume after this event id (the same as the Last-Event-ID header)' })
});

// ---------------------------------------------------------------- who am I

export const roleSchema = z.enum(ROLES as [string, ...string[]]);

export const meSchema = z.object({
	user: z.object({ id: z.string(), email: z.string(), name: z.string().nullable() }),
	team: z.object({ id, name: z.string(), slug: z.string() }),
	role: roleSchema.meta({ description: 'the role requests act with (a read-only token: viewer)' }),
	token: z
		.object({ id, name: z.string(), prefix: z.string(), scope: z.enum(['read', 'role']) })
		.nullable()
		.meta({ description: 'the token of this request; null for a browser session' })
});

// ---------------------------------------------------------------- columns

export const columnSchema = z.object({
	id,
	tag: z.string(),
	service: z.string(),
	diameterM: z.number().meta({ description: 'inner diameter, m' }),
	heightM: z.number().meta({ description: 'tangent-to-tangent height, m' }),
	notes: z.string(),
	createdAt: dateTime,
	updatedAt: dateTime
});

export function columnView(c: Column): z.output<typeof columnSchema> {
	return { id: c.id, tag: c.tag, service: c.service, diameterM: c.diameterM, heightM: c.heightM, notes: c.notes, createdAt: iso(c.createdAt), updatedAt: iso(c.updatedAt) };
}

// ---------------------------------------------------------------- cases

export const caseSummarySchema = z.object({
	id,
	columnId: id,
	name: z.string(),
	kind: z.enum(caseKinds),
	schemaVersion: z.int(),
	createdAt: dateTime,
	updatedAt: dateTime
});
export const caseDetailSchema = caseSummarySchema.extend({ document: caseSchema });

export const caseCreateBody = z.object(
	{
		columnId: z.uuid({ error: (i) => (i.input === undefined ? 'columnId is required: the id of the column the case belongs to' : 'columnId must be a column id (a UUID)') }),
		document: caseSchema
	},
	{ error: 'The body must be a JSON object with columnId and document (the case)' }
);
export const caseUpdateBody = z.object({ document: caseSchema }, { error: 'The body must be a JSON object with document (the case)' });

/**
 * A case body's `document` of an earlier schema version upgraded as an imported file is (`upgradeCaseDocument`), so
 * scripts written against an earlier version keep working; the body schemas and the OpenAPI document state the
 * current version. Anything else is returned as it is, for the body schema to judge.
 */
export function upgradeBodyDocument(input: unknown): unknown {
	if (!input || typeof input !== 'object' || Array.isArray(input) || !('document' in input)) return input;
	const b = input as Record<string, unknown>;
	return { ...b, document: upgradeCaseDocument(b.document) };
}

type CaseSummaryRow = Pick<Case, 'id' | 'columnId' | 'name' | 'kind' | 'schemaVersion' | 'createdAt' | 'updatedAt'>;

export function caseSummaryView(c: CaseSummaryRow): z.output<typeof caseSummarySchema> {
	return { id: c.id, columnId: c.columnId, name: c.name, kind: c.kind, schemaVersion: c.schemaVersion, createdAt: iso(c.createdAt), updatedAt: iso(c.updatedAt) };
}

export function caseDetailView(c: Case): z.output<typeof caseDetailSchema> {
	return { ...caseSummaryView(c), document: c.document };
}

// ---------------------------------------------------------------- runs

export const studyPointSchema = z.object({ label: z.string(), values: z.record(z.string(), z.union([z.number(), z.string()])) });

export const runSchema = z.object({
	id,
	columnId: id,
	caseId: id.nullable().meta({ description: 'null once the case was deleted (the run keeps its frozen copy)' }),
	status: runStatusSchema,
	solverVersion: z.string(),
	queuedBy: z.string().nullable().meta({ description: 'user id' }),
	queuedAt: dateTime,
	startedAt: dateTime.nullable(),
	finishedAt: dateTime.nullable(),
	heartbeatAt: dateTime.nullable(),
	attempts: z.int(),
	cancelRequested: z.boolean(),
	steps: z.int(),
	simulatedTimeS: z.number(),
	wallTimeS: z.number(),
	summary: z.record(z.string(), z.unknown()).nullable().meta({ description: 'design numbers and convergence, once the run ended' }),
	errorMessage: z.string().nullable(),
	studyId: id.nullable(),
	studyIndex: z.int().nullable(),
	studyPoint: studyPointSchema.nullable()
});
/** `caseDocument`: the case as frozen when the run was queued. */
export const runDetailSchema = runSchema.extend({ caseDocument: caseSchema });

export const queueBody = z.object(
	{
		caseId: z.uuid({
			error: (issue) => (issue.input === undefined ? 'caseId is required: the id of the case to run (a UUID)' : 'caseId must be a case id (a UUID, 36 characters)')
		})
	},
	{ error: 'The body must be a JSON object with caseId, the id of the case to run (a UUID)' }
);

export type RunRow = Omit<Run, 'caseDocument'> & { caseDocument?: Run['caseDocument'] };

export function runView(r: RunRow): z.output<typeof runSchema> {
	return {
		id: r.id,
		columnId: r.columnId,
		caseId: r.caseId,
		status: r.status,
		solverVersion: r.solverVersion,
		queuedBy: r.queuedBy,
		queuedAt: iso(r.queuedAt),
		startedAt: isoOrNull(r.startedAt),
		finishedAt: isoOrNull(r.finishedAt),
		heartbeatAt: isoOrNull(r.heartbeatAt),
		attempts: r.attempts,
		cancelRequested: r.cancelRequested,
		steps: r.steps,
		simulatedTimeS: r.simulatedTimeS,
		wallTimeS: r.wallTimeS,
		summary: r.summary,
		errorMessage: r.errorMessage,
		studyId: r.studyId,
		studyIndex: r.studyIndex,
		studyPoint: r.studyPoint
	};
}

export function runDetailView(r: Run): z.output<typeof runDetailSchema> {
	return { ...runView(r), caseDocument: r.caseDocument };
}

export const runEnvelope = z.object({ run: runSchema });

export const profilesSchema = z.object({
	snapshotId: z.int(),
	step: z.int(),
	timeS: z.number().meta({ description: 'simulated time, s' }),
	isFinal: z.boolean().meta({ description: 'false: the newest periodic snapshot of a run without a final one' }),
	x: z.array(z.number()).meta({ description: 'cell centres: height above the sparger (height profile) or radius (cross-section), m' }),
	fields: z.record(z.string(), z.array(z.number())).meta({ description: 'one value per cell and field, SI units' })
});

export const resultsSchema = z.object({
	runId: id,
	status: runStatusSchema,
	summary: z.record(z.string(), z.unknown()).nullable(),
	profiles: profilesSchema.nullable().meta({ description: 'the final profiles, else the newest snapshot; null before the first snapshot' })
});

export const residualPointSchema = z.object({ step: z.int(), timeS: z.number(), values: z.record(z.string(), z.number()) });
export const snapshotInfoSchema = z.object({ id: z.int(), step: z.int(), timeS: z.number(), isFinal: z.boolean(), bytes: z.int().meta({ description: 'stored msgpack size' }) });
export const snapshotSchema = z.object({
	id: z.int(),
	step: z.int(),
	timeS: z.number(),
	isFinal: z.boolean(),
	x: z.array(z.number()),
	fields: z.record(z.string(), z.array(z.number()))
});

export const cancelRunResult = runEnvelope;

// ---------------------------------------------------------------- studies

export const studySummarySchema = z.object({
	id,
	name: z.string(),
	kind: z.enum(studyKinds),
	columnId: id,
	caseId: id.nullable(),
	memberCount: z.int(),
	measurementId: id.nullable(),
	createdAt: dateTime,
	cancelledAt: dateTime.nullable()
});

const designValueSchema = z.object({ value: z.number(), unit: z.string(), label: z.string() });

export const studyMemberSchema = z.object({
	id,
	index: z.int(),
	point: studyPointSchema,
	status: runStatusSchema,
	steps: z.int(),
	attempts: z.int(),
	fraction: z.number().meta({ description: 'simulated time / end time, 0–1' }),
	wallTimeS: z.number(),
	queuedAt: dateTime.nullable(),
	startedAt: dateTime.nullable(),
	finishedAt: dateTime.nullable(),
	errorMessage: z.string().nullable(),
	solverVersion: z.string(),
	design: z.record(z.string(), designValueSchema).nullable()
});

export const studyProgressSchema = z.object({
	total: z.int(),
	done: z.int(),
	running: z.int(),
	queued: z.int(),
	failed: z.int(),
	cancelled: z.int(),
	fraction: z.number(),
	timeLeftS: z.number().nullable(),
	ended: z.boolean()
});

export const studyDetailSchema = studySummarySchema.extend({
	spec: z.record(z.string(), z.unknown()).meta({ description: 'the study settings as created (see the create body)' }),
	progress: studyProgressSchema,
	members: z.array(studyMemberSchema).meta({ description: 'the newest run at each position, in position order' })
});

export const studyCreated = z.object({
	study: z.object({ id, name: z.string(), kind: z.enum(studyKinds), memberCount: z.int(), columnId: id, caseId: id.nullable() }),
	members: z.array(z.object({ id, index: z.int(), label: z.string() }))
});
export const studyCancelled = z.object({ cancelled: z.int().meta({ description: 'queued members cancelled at once' }), stopping: z.int().meta({ description: 'running members asked to stop' }) });
export const studyRerun = z.object({ runs: z.array(runSchema) });

interface StudyRow {
	id: string;
	name: string;
	kind: (typeof studyKinds)[number];
	columnId: string;
	caseId: string | null;
	memberCount: number;
	measurementId: string | null;
	createdAt: Date;
	cancelledAt: Date | null;
}

export function studySummaryView(s: StudyRow): z.output<typeof studySummarySchema> {
	return {
		id: s.id,
		name: s.name,
		kind: s.kind,
		columnId: s.columnId,
		caseId: s.caseId,
		memberCount: s.memberCount,
		measurementId: s.measurementId,
		createdAt: iso(s.createdAt),
		cancelledAt: isoOrNull(s.cancelledAt)
	};
}

const asDate = (v: string | Date | null | undefined) => (v == null ? null : new Date(v).toISOString());

export function studyMemberView(m: StudyMember): z.output<typeof studyMemberSchema> {
	return {
		id: m.id,
		index: m.index,
		point: m.point,
		status: m.status as z.output<typeof runStatusSchema>,
		steps: m.steps,
		attempts: m.attempts,
		fraction: m.fraction,
		wallTimeS: m.wallTimeS,
		queuedAt: asDate(m.queuedAt),
		startedAt: asDate(m.startedAt),
		finishedAt: asDate(m.finishedAt),
		errorMessage: m.errorMessage ?? null,
		solverVersion: m.solverVersion,
		design: m.design
	};
}

export function studyDetailView(s: StudyRow & { spec: Record<string, unknown> }, members: StudyMember[], progress: StudyProgress): z.output<typeof studyDetailSchema> {
	return { ...studySummaryView(s), spec: s.spec, progress, members: members.map(studyMemberView) };
}

// ---------------------------------------------------------------- measurements

export const measurementSummarySchema = z.object({
	id,
	columnId: id,
	kind: z.enum(measurementKinds),
	name: z.string(),
	superficialGasVelocityMS: z.number(),
	temperatureK: z.number(),
	pressurePa: z.number(),
	sourceNote: z.string(),
	fileName: z.string().nullable(),
	points: z.int(),
	createdAt: dateTime
});
export const measurementDetailSchema = measurementSummarySchema.extend({
	units: z.record(z.string(), z.string()).meta({ description: 'the units of the two file columns as uploaded, e.g. { "x": "mm", "y": "%" }' }),
	data: z.object({ x: z.array(z.number()), y: z.array(z.number()) }).meta({ description: 'the points in SI' })
});

/**
 * An upload as JSON: the upload form's fields (the same names and checks as the page), the
 * column, and the data either as `csv` (the file's text) or as `rows` ([x, y] pairs in the named
 * units). The same rules apply as to a file: order, ranges, limits.
 */
export const measurementUploadBody = uploadFormSchema.extend({
	columnId: z.uuid({ error: (i) => (i.input === undefined ? 'columnId is required: the id of the column measured' : 'columnId must be a column id (a UUID)') }),
	csv: z.string({ error: 'csv must be the text of the file' }).optional().meta({ description: 'the file as text: two columns, an optional header row' }),
	rows: z
		.array(z.tuple([z.number({ error: 'must be a number' }), z.number({ error: 'must be a number' })], { error: 'each row must be [x, y]' }), { error: 'rows must be an array of [x, y] pairs' })
		.optional()
		.meta({ description: '[x, y] pairs in the units named by xUnit and yUnit' }),
	fileName: z.string().max(255).optional()
});

/** The query string of a `text/csv` upload: the same fields as the JSON upload, without the data. */
export const measurementCsvQuery = uploadFormSchema.extend({
	columnId: measurementUploadBody.shape.columnId,
	fileName: z.string().max(255).optional()
});

export function measurementSummaryView(m: MeasurementSummary & { columnId: string }): z.output<typeof measurementSummarySchema> {
	return {
		id: m.id,
		columnId: m.columnId,
		kind: m.kind,
		name: m.name,
		superficialGasVelocityMS: m.superficialGasVelocityMS,
		temperatureK: m.temperatureK,
		pressurePa: m.pressurePa,
		sourceNote: m.sourceNote,
		fileName: m.fileName,
		points: m.points,
		createdAt: iso(m.createdAt)
	};
}

export function measurementDetailView(m: Measurement): z.output<typeof measurementDetailSchema> {
	return { ...measurementSummaryView({ ...m, points: m.data.x.length }), units: m.units, data: m.data };
}

// ---------------------------------------------------------------- comparisons and sign-offs

export const verdictSchema = z.enum(['approved-basis', 'changes-requested']);

export const comparisonSummarySchema = z.object({
	id,
	name: z.string(),
	columnId: id,
	runIds: z.array(id),
	baselineRunId: id,
	measurementId: id.nullable(),
	createdAt: dateTime,
	verdict: verdictSchema.nullable().meta({ description: 'the newest sign-off, if any' })
});
export const comparisonDetailSchema = comparisonSummarySchema.extend({
	runs: z.array(
		z.object({
			id,
			caseId: id.nullable(),
			caseName: z.string(),
			status: runStatusSchema,
			queuedAt: dateTime,
			design: z.record(z.string(), designValueSchema)
		})
	)
});

/** The comparison form of the page plus the column (the page has it in its address). */
export const comparisonCreateBody = z
	.object({ columnId: z.uuid({ error: (i) => (i.input === undefined ? 'columnId is required: the id of the column the runs belong to' : 'columnId must be a column id (a UUID)') }) })
	.and(comparisonForm);

export const signOffSchema = z.object({
	verdict: verdictSchema,
	comment: z.string(),
	signedByEmail: z.string().nullable(),
	signedByName: z.string().nullable(),
	createdAt: dateTime
});
export const signOffCreated = z.object({
	signOff: signOffSchema,
	mailedTo: z.array(z.string()).meta({ description: 'who was told by e-mail' }),
	mailError: z.string().nullable()
});
export const signOffList = z.object({ items: z.array(signOffSchema).meta({ description: 'newest first; the first is the current verdict' }) });

export function signOffView(s: { verdict: string; comment: string; signedByEmail: string | null; signedByName: string | null; createdAt: Date }): z.output<typeof signOffSchema> {
	return { verdict: s.verdict as z.output<typeof verdictSchema>, comment: s.comment, signedByEmail: s.signedByEmail, signedByName: s.signedByName, createdAt: iso(s.createdAt) };
}
