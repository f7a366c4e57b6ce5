/**
 * Everything the printable report of a comparison shows, in one load: the column, the operating
 * point, each run's closures, final profiles and design numbers (with deltas against the
 * baseline), the measurements at that operating point with each run's error measures, the
 * sign-off state and comments, the solver versions. Team-filtered; `null` for "not found".
 */
import { and, eq, inArray } from 'drizzle-orm';
import { db } from './db/app.js';
import { columns, comparisons, runs, snapshots } from './db/schema.js';
import { listComments, listSignOffs } from './signoffs.js';
import { listMatchingMeasurements } from './measurements.js';
import { decodeSnapshot } from './runs/codec.js';
import { errorMeasures, operatingPointOfCase, profileFieldOfKind, profileForMeasurement, type ErrorMeasures } from '../measurements/compare.js';
import type { MeasurementKind, OperatingPoint } from '../measurements/kinds.js';
import type { CaseDocument } from '../../../solver/case.js';

export interface DesignValue {
	value: number;
	unit: string;
	label: string;
}

export interface ReportRun {
	id: string;
	name: string;
	isBaseline: boolean;
	status: string;
	solverVersion: string;
	caseDocument: CaseDocument;
	design: Record<string, DesignValue>;
	/** final profiles (x = height or radius, m), or null before the run has one */
	profiles: { x: number[]; fields: Record<string, number[]> } | null;
}

export interface ReportMeasurement {
	id: string;
	name: string;
	kind: MeasurementKind;
	sourceNote: string;
	data: { x: number[]; y: number[] };
	/** per run id, in the order of `runs` */
	measures: Array<{ runId: string; measures: ErrorMeasures | null }>;
}

export interface ComparisonReport {
	comparison: { id: string; name: string; createdAt: Date };
	column: { id: string; tag: string; service: string; diameterM: number; heightM: number };
	operatingPoint: OperatingPoint;
	runs: ReportRun[];
	measurements: ReportMeasurement[];
	signOffs: Awaited<ReturnType<typeof listSignOffs>>;
	comments: Awaited<ReturnType<typeof listComments>>;
}

export async function loadComparisonReport(options: { teamId: string; comparisonId: string }): Promise<ComparisonReport | null> {
	const { teamId } = options;
	const [cmp] = await db
		.select()
		.from(comparisons)
		.where(and(eq(comparisons.id, options.comparisonId), eq(comparisons.teamId, teamId)))
		.limit(1);
	if (!cmp) return null;
	const [column] = await db
		.select({ id: columns.id, tag: columns.tag, service: columns.service, diameterM: columns.diameterM, heightM: columns.heightM })
		.from(columns)
		.where(and(eq(columns.id, cmp.columnId), eq(columns.teamId, teamId)));
	if (!column) return null;

	const runRows = cmp.runIds.length
		? await db
				.select({ id: runs.id, status: runs.status, solverVersion: runs.solverVersion, caseDocument: runs.caseDocument, summary: runs.summary })
				.from(runs)
				.where(and(eq(runs.teamId, teamId), inArray(runs.id, cmp.runIds)))
		: [];
	const finals = runRows.length
		? await db
				.select({ runId: snapshots.runId, data: snapshots.data })
				.from(snapshots)
				.where(and(inArray(snapshots.runId, runRows.map((r) => r.id)), eq(snapshots.isFinal, true)))
		: [];
	const finalByRun = new Map(finals.map((f) => [f.runId, decodeSnapshot(f.data)]));

	// the comparison's order, baseline first
	const order = [cmp.baselineRunId, ...cmp.runIds.filter((id) => id !== cmp.baselineRunId)];
	const reportRuns: ReportRun[] = order
		.map((id) => runRows.find((r) => r.id === id))
		.filter((r): r is (typeof runRows)[number] => !!r)
		.map((r) => {
			const snap = finalByRun.get(r.id);
			const design = ((r.summary as { design?: Record<string, DesignValue> } | null)?.design ?? {}) as Record<string, DesignValue>;
			return {
				id: r.id,
				name: r.caseDocument.name,
				isBaseline: r.id === cmp.baselineRunId,
				status: r.status,
				solverVersion: r.solverVersion,
				caseDocument: r.caseDocument,
				design,
				profiles: snap
					? { x: Array.from(snap.x), fields: Object.fromEntries(Object.entries(snap.fields).map(([k, v]) => [k, Array.from(v)])) }
					: null
			};
		});

	const baseline = reportRuns[0];
	const operatingPoint = baseline
		? operatingPointOfCase(baseline.caseDocument)
		: { superficialGasVelocityMS: NaN, temperatureK: NaN, pressurePa: NaN };
	const caseKinds = new Set(reportRuns.map((r) => r.caseDocument.kind));
	const kinds = (Object.keys(profileFieldOfKind) as MeasurementKind[]).filter((k) => {
		const pair = profileFieldOfKind[k];
		return pair !== null && caseKinds.has(pair.caseKind);
	});
	const matching = baseline ? await listMatchingMeasurements({ teamId, columnId: column.id, operatingPoint, kinds }) : [];
	// the comparison's chosen measurement first
	matching.sort((a, b) => Number(b.id === cmp.measurementId) - Number(a.id === cmp.measurementId));

	const reportMeasurements: ReportMeasurement[] = matching.map((m) => ({
		id: m.id,
		name: m.name,
		kind: m.kind,
		sourceNote: m.sourceNote,
		data: m.data,
		measures: reportRuns.map((r) => {
			const snap = finalByRun.get(r.id);
			const profile = snap ? profileForMeasurement({ kind: m.kind, caseDoc: r.caseDocument, snapshot: snap }) : null;
			return { runId: r.id, measures: profile ? errorMeasures({ profile, measurement: m.data }) : null };
		})
	}));

	return {
		comparison: { id: cmp.id, name: cmp.name, createdAt: cmp.createdAt },
		column,
		operatingPoint,
		runs: reportRuns,
		measurements: reportMeasurements,
		signOffs: await listSignOffs({ teamId, subjectType: 'comparison', subjectId: cmp.id }),
		comments: await listComments({ teamId, subjectType: 'comparison', subjectId: cmp.id })
	};
}
