/**
 * Finished demo work for the invented demo team, so the first sign-in shows the product working:
 * on the pilot column C-101 a base case and three drag-law variants, and a clean-water re-aeration
 * test (batch oxygen transfer), with runs computed here by the real solver (the same step loop, residual rows, snapshots and summary a worker stores), a
 * comparison of the drag laws awaiting the lead's sign-off, a U_g sweep study whose members are
 * computed the same way, and two uploads of invented data labelled as such (a holdup profile and a
 * re-aeration test). Local installs only; `npm start` seeds it once, the test database never unless
 * a test asks (`seedDemo(db, { work: true })`).
 */
import { and, eq } from 'drizzle-orm';
import type { Db } from './db/index.js';
import { cases, columns, comparisons, measurements, residuals, runs, snapshots, studies } from './db/schema.js';
import { encodeSnapshot } from './runs/codec.js';
import { storesResidualStep } from '../../../worker/jobs/solve-protocol.js';
import { createSimulation, defaultCase, SOLVER_VERSION, type CaseDocument } from '../../../solver/index.js';
import { expandStudy, type StudySpec } from '../studies/spec.js';
import type { StudyPoint } from '../studies/types.js';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** A run computed in this process: what a worker would have stored for it. */
interface ComputedRun {
	status: 'converged' | 'finished' | 'failed';
	steps: number;
	timeS: number;
	wallTimeS: number;
	summary: Record<string, unknown>;
	errorMessage: string | null;
	residualRows: Array<{ step: number; timeS: number; values: Record<string, number> }>;
	snapshotRows: Array<{ step: number; timeS: number; isFinal: boolean; data: Buffer }>;
}

/** Steps the case to its end exactly as a worker's solver thread does (residual rows, periodic and final snapshots). */
export function computeRun(caseDoc: CaseDocument): ComputedRun {
	const t0 = performance.now();
	const sim = createSimulation(caseDoc);
	const intervalS = caseDoc.numerics.snapshotIntervalS;
	let next = 1;
	const residualRows: ComputedRun['residualRows'] = [];
	const snapshotRows: ComputedRun['snapshotRows'] = [];
	for (;;) {
		const s = sim.step();
		const { step, timeS } = sim.state;
		const ended = s.status !== 'running';
		if (ended || storesResidualStep(step)) residualRows.push({ step, timeS, values: { ...sim.residuals() } });
		if (ended) {
			const { profiles, ...summary } = sim.results();
			snapshotRows.push({ step, timeS, isFinal: true, data: Buffer.from(encodeSnapshot(profiles, { precision: 'float64' })) });
			const status = summary.status === 'running' ? 'finished' : (summary.status as ComputedRun['status']);
			return {
				status,
				steps: step,
				timeS,
				wallTimeS: (performance.now() - t0) / 1000,
				summary: JSON.parse(JSON.stringify(summary)) as Record<string, unknown>,
				errorMessage: status === 'failed' ? (summary.message ?? s.message ?? 'failed') : null,
				residualRows,
				snapshotRows
			};
		}
		if (timeS >= next * intervalS * (1 - 1e-12)) {
			snapshotRows.push({ step, timeS, isFinal: false, data: Buffer.from(encodeSnapshot(sim.snapshot(), { precision: 'float32' })) });
			next = Math.floor((timeS / intervalS) * (1 + 1e-12)) + 1;
		}
	}
}

async function insertComputedRun(
	tx: Tx,
	o: { teamId: string; columnId: string; caseId: string; caseDoc: CaseDocument; userId: string; study?: { id: string; index: number; point: StudyPoint } }
): Promise<string> {
	const r = computeRun(o.caseDoc);
	const finishedAt = new Date();
	const startedAt = new Date(finishedAt.getTime() - Math.ceil(r.wallTimeS * 1000));
	const [run] = await tx
		.insert(runs)
		.values({
			teamId: o.teamId,
			columnId: o.columnId,
			caseId: o.caseId,
			caseDocument: o.caseDoc,
			solverVersion: SOLVER_VERSION,
			status: r.status,
			queuedBy: o.userId,
			queuedAt: startedAt,
			startedAt,
			finishedAt,
			attempts: 1,
			workerId: 'demo-seed',
			steps: r.steps,
			simulatedTimeS: r.timeS,
			wallTimeS: r.wallTimeS,
			summary: r.summary,
			errorMessage: r.errorMessage,
			studyId: o.study?.id ?? null,
			studyIndex: o.study?.index ?? null,
			studyPoint: o.study?.point ?? null
		})
		.returning({ id: runs.id });
	for (let i = 0; i < r.residualRows.length; i += 1000) {
		await tx.insert(residuals).values(r.residualRows.slice(i, i + 1000).map((x) => ({ runId: run.id, step: x.step, simulatedTimeS: x.timeS, values: x.values })));
	}
	await tx.insert(snapshots).values(r.snapshotRows.map((x) => ({ runId: run.id, step: x.step, simulatedTimeS: x.timeS, isFinal: x.isFinal, data: x.data })));
	return run.id;
}

/** The pilot column's base case: air–water at 20 °C, 1.2 m clear level, U_g 0.05 m/s, two bubble classes, the default drag. */
function pilotCase(name: string, drag: CaseDocument['closures']['drag'] = 'schiller-naumann'): CaseDocument {
	const c = defaultCase('height-profile');
	c.name = name;
	c.geometry = { heightM: 2, diameterM: 0.15, clearLiquidLevelM: 1.2 };
	c.sparging.superficialGasVelocityMS = 0.05;
	c.closures.drag = drag;
	c.numerics.cells = 80;
	c.numerics.endTimeS = 120;
	c.numerics.snapshotIntervalS = 2;
	return c;
}

const DEMO_NOTE = 'Invented demo data for the Marrow Bay demo team — not a measurement of any real column.';

/** A smooth invented holdup profile with a little scatter (deterministic), for the demo only. */
function demoHoldupProfile(): { x: number[]; y: number[] } {
	const x = [0.1, 0.25, 0.4, 0.55, 0.7, 0.85, 1.0, 1.15, 1.3];
	const scatter = [0.004, -0.003, 0.002, -0.004, 0.003, -0.002, 0.001, -0.003, 0.002];
	return { x, y: x.map((z, i) => Number((0.118 + 0.01 * (z / 1.3) + scatter[i]).toFixed(4))) };
}

/** An invented re-aeration test (ASCE/EWRI 2-06 shape, kLa ≈ 0.012 1/s, C* ≈ 9.3 mg/L), for the demo only. */
function demoReaeration(): { x: number[]; y: number[] } {
	const x: number[] = [];
	const y: number[] = [];
	for (let t = 0; t <= 420; t += 15) {
		const wobble = 0.05 * Math.sin(t / 37);
		x.push(t);
		y.push(Number(((9.3 - (9.3 - 0.4) * Math.exp(-0.012 * t) + wobble) / 1000).toFixed(6)));
	}
	return { x, y };
}

/**
 * Adds the finished work to the demo team (once: nothing happens when its pilot column already has
 * cases). Returns what it made, for the seed's log line.
 */
export async function seedDemoWork(db: Db, o: { teamId: string; analystId: string; leadId: string }): Promise<{ runs: number } | null> {
	const [pilot] = await db
		.select()
		.from(columns)
		.where(and(eq(columns.teamId, o.teamId), eq(columns.tag, 'C-101')));
	if (!pilot) return null;
	const existing = await db.select({ id: cases.id }).from(cases).where(eq(cases.columnId, pilot.id)).limit(1);
	if (existing.length) return null;
	let count = 0;
	await db.transaction(async (tx) => {
		const storeCase = async (doc: CaseDocument) =>
			(await tx.insert(cases).values({ teamId: o.teamId, columnId: pilot.id, name: doc.name, kind: doc.kind, schemaVersion: doc.schemaVersion, document: doc, createdBy: o.analystId }).returning({ id: cases.id }))[0].id;

		// a base case and the drag laws a lead would weigh for tap water
		const variants: Array<[string, CaseDocument['closures']['drag']]> = [
			['C-101 base — Schiller–Naumann', 'schiller-naumann'],
			['C-101 drag — Ishii–Zuber', 'ishii-zuber'],
			['C-101 drag — Tomiyama (contaminated)', 'tomiyama-contaminated']
		];
		const runIds: string[] = [];
		let baseCaseId = '';
		for (const [name, drag] of variants) {
			const doc = pilotCase(name, drag);
			const caseId = await storeCase(doc);
			if (!baseCaseId) baseCaseId = caseId;
			runIds.push(await insertComputedRun(tx, { teamId: o.teamId, columnId: pilot.id, caseId, caseDoc: doc, userId: o.analystId }));
			count++;
		}

		// a clean-water re-aeration test in the model, at the operating point of the demo upload below: its run page
		// analyses the run's own dissolved-oxygen series as the upload's page analyses the invented one
		const aeration = pilotCase('C-101 re-aeration — clean water, batch');
		aeration.numerics.endTimeS = 300;
		aeration.transfer.mode = 'batch';
		aeration.transfer.massTransferCoefficient = 'frossling';
		const aerationCaseId = await storeCase(aeration);
		await insertComputedRun(tx, { teamId: o.teamId, columnId: pilot.id, caseId: aerationCaseId, caseDoc: aeration, userId: o.analystId });
		count++;

		// invented uploads, labelled as demo data
		const [profile] = await tx
			.insert(measurements)
			.values({
				teamId: o.teamId,
				columnId: pilot.id,
				kind: 'holdup-height',
				name: 'Demo holdup taps at 0.05 m/s',
				sourceNote: DEMO_NOTE,
				fileName: 'demo-holdup.csv',
				units: { x: 'm', y: '1' },
				superficialGasVelocityMS: 0.05,
				temperatureK: 293.15,
				pressurePa: 101325,
				data: demoHoldupProfile(),
				createdBy: o.analystId
			})
			.returning({ id: measurements.id });
		await tx.insert(measurements).values({
			teamId: o.teamId,
			columnId: pilot.id,
			kind: 'dissolved-oxygen',
			name: 'Demo re-aeration test, mid-height probe',
			sourceNote: DEMO_NOTE,
			fileName: 'demo-reaeration.csv',
			units: { x: 's', y: 'kg/m³' },
			superficialGasVelocityMS: 0.05,
			temperatureK: 293.15,
			pressurePa: 101325,
			data: demoReaeration(),
			createdBy: o.analystId
		});

		// the comparison of the drag laws, held against the demo profile, awaiting the lead's sign-off
		await tx.insert(comparisons).values({
			teamId: o.teamId,
			columnId: pilot.id,
			name: 'C-101 drag laws at 0.05 m/s',
			runIds,
			baselineRunId: runIds[0],
			measurementId: profile.id,
			createdBy: o.leadId
		});

		// a sweep of the gas rate over the pilot's range, members computed like the runs above
		const base = pilotCase('C-101 base — Schiller–Naumann');
		const spec: StudySpec = { kind: 'sweep', axes: [{ input: 'superficialGasVelocityMS', spacing: 'list', values: [0.01, 0.02, 0.04, 0.06, 0.08, 0.1, 0.15] }] };
		const expansion = expandStudy(base, spec);
		if (!expansion.ok) throw new Error(`demo sweep does not expand: ${expansion.issues.map((i) => i.message).join('; ')}`);
		const [study] = await tx
			.insert(studies)
			.values({
				teamId: o.teamId,
				columnId: pilot.id,
				caseId: baseCaseId,
				name: 'C-101 gas-rate sweep',
				kind: 'sweep',
				spec: spec as unknown as Record<string, unknown>,
				baseCase: base,
				memberCount: expansion.members.length,
				createdBy: o.analystId
			})
			.returning({ id: studies.id });
		for (const m of expansion.members) {
			await insertComputedRun(tx, {
				teamId: o.teamId,
				columnId: pilot.id,
				caseId: baseCaseId,
				caseDoc: m.caseDoc,
				userId: o.analystId,
				study: { id: study.id, index: m.index, point: { label: m.label, values: m.values } }
			});
			count++;
		}
	});
	return { runs: count };
}
