/**
 * Measurements of a team's columns. Every query filters by the caller's team. An upload is checked
 * here again from the raw file text (the browser preview is a convenience, never trusted) and
 * stored in one transaction with its audit line: whole or not at all.
 */
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { db } from './db/app.js';
import { isUuid } from './guard.js';
import { auditLog, cases, columns, comparisons, measurements, runs, snapshots } from './db/schema.js';
import { parseMeasurementCsv, type CsvIssue } from '../measurements/csv.js';
import {
	errorMeasures,
	operatingPointMatches,
	operatingPointOfCase,
	profileFieldOfKind,
	profileForMeasurement,
	type ErrorMeasures,
	type MatchTolerances,
	type Series
} from '../measurements/compare.js';
import type { MeasurementKind, OperatingPoint } from '../measurements/kinds.js';
import type { CaseDocument } from '../../../solver/case.js';
import { decodeSnapshot } from './runs/codec.js';
import type { Snapshot } from '../../../solver/types.js';
import { validateUploadMeta } from '../measurements/upload.js';

export type Measurement = typeof measurements.$inferSelect;

export interface MeasurementSummary {
	id: string;
	kind: MeasurementKind;
	name: string;
	superficialGasVelocityMS: number;
	temperatureK: number;
	pressurePa: number;
	sourceNote: string;
	fileName: string | null;
	points: number;
	createdAt: Date;
}

const summaryFields = {
	id: measurements.id,
	kind: measurements.kind,
	name: measurements.name,
	superficialGasVelocityMS: measurements.superficialGasVelocityMS,
	temperatureK: measurements.temperatureK,
	pressurePa: measurements.pressurePa,
	sourceNote: measurements.sourceNote,
	fileName: measurements.fileName,
	points: sql<number>`jsonb_array_length(${measurements.data}->'x')`.as('points'),
	createdAt: measurements.createdAt
};

export async function listMeasurementsForColumn(options: { teamId: string; columnId: string }): Promise<MeasurementSummary[]> {
	return db
		.select(summaryFields)
		.from(measurements)
		.where(and(eq(measurements.teamId, options.teamId), eq(measurements.columnId, options.columnId)))
		.orderBy(desc(measurements.createdAt), asc(measurements.name));
}

export async function getMeasurement(options: { teamId: string; id: string }): Promise<Measurement | null> {
	// a malformed id would make PostgreSQL raise instead of matching nothing
	if (!isUuid(options.id)) return null;
	const [row] = await db
		.select()
		.from(measurements)
		.where(and(eq(measurements.id, options.id), eq(measurements.teamId, options.teamId)))
		.limit(1);
	return row ?? null;
}

export type CreateMeasurementResult =
	| { ok: true; measurement: Measurement }
	| { ok: false; fieldErrors: Record<string, string>; csvErrors: CsvIssue[] };

/**
 * Check and store an upload. `form` holds the upload form's fields (see `uploadFormSchema`),
 * `csvText` the file. The column's height bounds the heights in the file.
 */
export async function createMeasurement(options: {
	teamId: string;
	userId: string;
	columnId: string;
	form: unknown;
	csvText: string;
	fileName?: string | null;
}): Promise<CreateMeasurementResult | null> {
	const [column] = await db
		.select({ id: columns.id, heightM: columns.heightM })
		.from(columns)
		.where(and(eq(columns.id, options.columnId), eq(columns.teamId, options.teamId)))
		.limit(1);
	if (!column) return null;

	const meta = validateUploadMeta(options.form);
	if (!meta.ok) return { ok: false, fieldErrors: meta.fieldErrors, csvErrors: [] };
	const { kind, name, sourceNote, units, operatingPoint } = meta.meta;
	const parsed = parseMeasurementCsv({ text: options.csvText, kind, xUnit: units.x, yUnit: units.y, columnHeightM: column.heightM });
	if (!parsed.ok) return { ok: false, fieldErrors: {}, csvErrors: parsed.errors };

	const measurement = await db.transaction(async (tx) => {
		const [row] = await tx
			.insert(measurements)
			.values({
				teamId: options.teamId,
				columnId: column.id,
				kind,
				name,
				sourceNote,
				fileName: options.fileName?.slice(0, 255) || null,
				units,
				...operatingPoint,
				data: { x: parsed.table.x, y: parsed.table.y },
				createdBy: options.userId
			})
			.returning();
		await tx.insert(auditLog).values({
			teamId: options.teamId,
			userId: options.userId,
			action: 'measurement.create',
			subject: row.id,
			detail: { columnId: column.id, kind, name, points: parsed.table.x.length }
		});
		return row;
	});
	return { ok: true, measurement };
}

export async function deleteMeasurement(options: { teamId: string; userId: string; id: string; columnId?: string }): Promise<boolean> {
	return db.transaction(async (tx) => {
		const rows = await tx
			.delete(measurements)
			.where(
				and(
					eq(measurements.id, options.id),
					eq(measurements.teamId, options.teamId),
					options.columnId ? eq(measurements.columnId, options.columnId) : undefined
				)
			)
			.returning({ id: measurements.id, name: measurements.name });
		if (rows.length === 0) return false;
		await tx.insert(auditLog).values({ teamId: options.teamId, userId: options.userId, action: 'measurement.delete', subject: rows[0].id, detail: { name: rows[0].name } });
		return true;
	});
}

/**
 * The column's measurements whose operating point matches (see `operatingPointMatches`), optionally
 * of some kinds only; full rows with data, for overlays and error measures.
 */
export async function listMatchingMeasurements(options: {
	teamId: string;
	columnId: string;
	operatingPoint: OperatingPoint;
	kinds?: MeasurementKind[];
	tolerances?: MatchTolerances;
}): Promise<Measurement[]> {
	const rows = await db
		.select()
		.from(measurements)
		.where(and(eq(measurements.teamId, options.teamId), eq(measurements.columnId, options.columnId)))
		.orderBy(asc(measurements.name));
	return rows.filter(
		(m) =>
			(!options.kinds || options.kinds.includes(m.kind)) &&
			operatingPointMatches({ run: options.operatingPoint, measurement: m, tolerances: options.tolerances }).matches
	);
}

export interface RunAtOperatingPoint {
	id: string;
	caseName: string;
	status: string;
	queuedAt: Date;
	/** the run's kLa estimate, 1/s, when its summary carries one */
	kLaPerS: number | null;
	/** the liquid volume of the run's case (π D²/4 · clear-liquid level), m³ */
	liquidVolumeM3: number;
}

/** Pull a kLa design number out of a run summary, whatever shape the worker stored it in. */
function kLaOfSummary(summary: Record<string, unknown> | null): number | null {
	if (!summary) return null;
	const design = (summary.design ?? summary) as Record<string, unknown>;
	for (const key of ['kLaPerS', 'kLa', 'kla']) {
		const v = design[key];
		if (typeof v === 'number' && Number.isFinite(v)) return v;
		if (v && typeof v === 'object' && typeof (v as { value?: unknown }).value === 'number') return (v as { value: number }).value;
	}
	return null;
}

/**
 * The column's runs at an operating point matching a measurement's, newest first, with their kLa
 * estimates: shown beside a re-aeration analysis.
 */
export async function listRunsAtOperatingPoint(options: { teamId: string; columnId: string; operatingPoint: OperatingPoint }): Promise<RunAtOperatingPoint[]> {
	const rows = await db
		.select({ id: runs.id, caseName: cases.name, status: runs.status, queuedAt: runs.queuedAt, document: runs.caseDocument, summary: runs.summary })
		.from(runs)
		.leftJoin(cases, eq(cases.id, runs.caseId))
		.where(and(eq(runs.teamId, options.teamId), eq(runs.columnId, options.columnId)))
		.orderBy(desc(runs.queuedAt))
		.limit(200);
	return rows
		.filter((r) => operatingPointMatches({ run: operatingPointOfCase(r.document), measurement: options.operatingPoint }).matches)
		.map((r) => ({
			id: r.id,
			caseName: r.caseName ?? r.document.name,
			status: r.status,
			queuedAt: r.queuedAt,
			kLaPerS: kLaOfSummary(r.summary),
			liquidVolumeM3: (Math.PI / 4) * r.document.geometry.diameterM ** 2 * r.document.geometry.clearLiquidLevelM
		}));
}

/** The final snapshot of each given run that has one, decoded. */
async function finalSnapshots(runIds: string[]): Promise<Map<string, Snapshot>> {
	const out = new Map<string, Snapshot>();
	if (runIds.length === 0) return out;
	const rows = await db
		.select({ runId: snapshots.runId, data: snapshots.data })
		.from(snapshots)
		.where(and(inArray(snapshots.runId, runIds), eq(snapshots.isFinal, true)));
	for (const r of rows) out.set(r.runId, decodeSnapshot(r.data));
	return out;
}

export interface RunHeldAgainst {
	runId: string;
	caseName: string;
	status: string;
	queuedAt: Date;
	/** the run's profile on the measurement's x, for the overlay; null without a final snapshot */
	profile: { x: number[]; y: number[] } | null;
	measures: ErrorMeasures | null;
}

/**
 * The column's runs a profile measurement is held against — same column, matching operating
 * point, the case kind that computes that profile — with their error measures, ranked by RMSE
 * (runs without a final profile last).
 */
export async function runsHeldAgainstMeasurement(options: { teamId: string; measurement: Measurement }): Promise<RunHeldAgainst[]> {
	const m = options.measurement;
	const pair = profileFieldOfKind[m.kind];
	if (!pair) return [];
	const rows = await db
		.select(runRowColumns)
		.from(runs)
		.leftJoin(cases, eq(cases.id, runs.caseId))
		.where(and(eq(runs.teamId, options.teamId), eq(runs.columnId, m.columnId)))
		.orderBy(desc(runs.queuedAt))
		.limit(200);
	const matching = rows.filter((r) => r.document.kind === pair.caseKind && operatingPointMatches({ run: operatingPointOfCase(r.document), measurement: m }).matches);
	return holdRunsAgainst(m, matching);
}

/** The run columns both views of runs against a measurement read. */
const runRowColumns = { id: runs.id, caseName: cases.name, status: runs.status, queuedAt: runs.queuedAt, document: runs.caseDocument };
type RunRow = { id: string; caseName: string | null; status: string; queuedAt: Date; document: CaseDocument };

/** Each run's final profile on the measurement's x and its error measures, best RMSE first (no final profile last). */
async function holdRunsAgainst(m: Measurement, rows: RunRow[]): Promise<RunHeldAgainst[]> {
	const finals = await finalSnapshots(rows.map((r) => r.id));
	const held: RunHeldAgainst[] = rows.map((r) => {
		const snap = finals.get(r.id);
		const profile: Series | null = snap ? profileForMeasurement({ kind: m.kind, caseDoc: r.document, snapshot: snap }) : null;
		return {
			runId: r.id,
			caseName: r.caseName ?? r.document.name,
			status: r.status,
			queuedAt: r.queuedAt,
			profile: profile ? { x: Array.from(profile.x), y: Array.from(profile.y) } : null,
			measures: profile ? errorMeasures({ profile, measurement: m.data }) : null
		};
	});
	return held.sort((a, b) => (a.measures?.rmse ?? Infinity) - (b.measures?.rmse ?? Infinity));
}

export interface MeasurementAgainstRun {
	measurement: Pick<Measurement, 'id' | 'kind' | 'name' | 'sourceNote' | 'superficialGasVelocityMS' | 'temperatureK' | 'pressurePa' | 'data'>;
	measures: ErrorMeasures | null;
}

/**
 * For the run and comparison pages: the measurements of the run's column at a matching operating
 * point that its case kind can be held against, with the error measures of the run's profile (the
 * given snapshot, or else its stored final one).
 */
export async function measurementsForRun(options: {
	teamId: string;
	run: { id: string; columnId: string; caseDocument: CaseDocument };
	/** the run's final profiles if the caller has them already (arrays or typed arrays) */
	snapshot?: { x: ArrayLike<number>; fields: Record<string, ArrayLike<number>> } | null;
}): Promise<MeasurementAgainstRun[]> {
	const doc = options.run.caseDocument;
	const kinds = (Object.keys(profileFieldOfKind) as MeasurementKind[]).filter((k) => profileFieldOfKind[k]?.caseKind === doc.kind);
	const list = await listMatchingMeasurements({ teamId: options.teamId, columnId: options.run.columnId, operatingPoint: operatingPointOfCase(doc), kinds });
	if (list.length === 0) return [];
	const snap = options.snapshot ?? (await finalSnapshots([options.run.id])).get(options.run.id) ?? null;
	return list.map((m) => {
		const profile = snap ? profileForMeasurement({ kind: m.kind, caseDoc: doc, snapshot: snap }) : null;
		return {
			measurement: {
				id: m.id,
				kind: m.kind,
				name: m.name,
				sourceNote: m.sourceNote,
				superficialGasVelocityMS: m.superficialGasVelocityMS,
				temperatureK: m.temperatureK,
				pressurePa: m.pressurePa,
				data: m.data
			},
			measures: profile ? errorMeasures({ profile, measurement: m.data }) : null
		};
	});
}

export interface RankedRun extends RunHeldAgainst {
	/** false when the run's operating point is outside the matching rule for this measurement */
	operatingPointMatches: boolean;
}

/**
 * A comparison's runs ranked by RMSE against one chosen measurement of the same column (runs
 * whose case kind cannot be held against it, or without a final profile, last). Null when the
 * measurement is not the team's or not of that column.
 */
export async function rankRunsAgainstMeasurement(options: {
	teamId: string;
	columnId: string;
	runIds: string[];
	measurementId: string;
}): Promise<{ measurement: Measurement; ranked: RankedRun[] } | null> {
	const m = await getMeasurement({ teamId: options.teamId, id: options.measurementId });
	if (!m || m.columnId !== options.columnId) return null;
	if (options.runIds.length === 0) return { measurement: m, ranked: [] };
	const rows = await db
		.select(runRowColumns)
		.from(runs)
		.leftJoin(cases, eq(cases.id, runs.caseId))
		.where(and(eq(runs.teamId, options.teamId), inArray(runs.id, options.runIds)));
	const documents = new Map(rows.map((r) => [r.id, r.document]));
	const ranked: RankedRun[] = (await holdRunsAgainst(m, rows)).map((h) => ({
		...h,
		operatingPointMatches: operatingPointMatches({ run: operatingPointOfCase(documents.get(h.runId)!), measurement: m }).matches
	}));
	return { measurement: m, ranked };
}

/** Remember the measurement a comparison is ranked against (null clears it). */
export async function setComparisonMeasurement(options: { teamId: string; comparisonId: string; measurementId: string | null }): Promise<boolean> {
	if (options.measurementId) {
		const m = await getMeasurement({ teamId: options.teamId, id: options.measurementId });
		if (!m) return false;
	}
	const rows = await db
		.update(comparisons)
		.set({ measurementId: options.measurementId })
		.where(and(eq(comparisons.id, options.comparisonId), eq(comparisons.teamId, options.teamId)))
		.returning({ id: comparisons.id });
	return rows.length > 0;
}
