import { error } from '@sveltejs/kit';
import { and, asc, eq } from 'drizzle-orm';
import type { Actions, PageServerLoad } from './$types';
import { requireMember } from '$lib/server/guard';
import { hasRole } from '$lib/server/roles';
import { db } from '$lib/server/db/app';
import { columns, snapshots, users } from '$lib/server/db/schema';
import * as runs from '$lib/server/runs';
import { timeHistories, type TimeHistory } from '$lib/server/run-results';
import { measurementsForRun } from '$lib/server/measurements';
import { analyseRunReaeration } from '$lib/measurements/run-reaeration';

/**
 * The run page. The live part (residuals, progress, current profile) is fetched in the browser
 * from the history route and the event stream; the load gives what does not move: the run, its
 * frozen case, and for an ended run the final profiles and the time histories.
 */
export const load: PageServerLoad = async (event) => {
	const member = await requireMember(event, 'viewer');
	const run = await runs.getRun({ db, teamId: member.team.id, runId: event.params.id });
	if (!run) error(404, 'Run not found.');
	const [column] = await db.select({ id: columns.id, tag: columns.tag }).from(columns).where(eq(columns.id, run.columnId));
	const [queuedBy] = run.queuedBy ? await db.select({ email: users.email, name: users.name }).from(users).where(eq(users.id, run.queuedBy)) : [];
	const ended = (runs.TERMINAL_STATUSES as readonly string[]).includes(run.status);
	let finalProfile: { x: number[]; fields: Record<string, number[]>; timeS: number; step: number } | null = null;
	let histories: TimeHistory[] = [];
	if (ended) {
		const rows = await db
			.select({ data: snapshots.data, isFinal: snapshots.isFinal })
			.from(snapshots)
			.where(eq(snapshots.runId, run.id))
			.orderBy(asc(snapshots.step));
		const decoded = rows.map((r) => ({ ...runs.decodeSnapshot(r.data), isFinal: r.isFinal }));
		const last = decoded.findLast((s) => s.isFinal) ?? decoded.at(-1);
		if (last) {
			const fields: Record<string, number[]> = {};
			for (const [k, v] of Object.entries(last.fields)) fields[k] = Array.from(v);
			finalProfile = { x: Array.from(last.x), fields, timeS: last.timeS, step: last.step };
		}
		histories = timeHistories({ kind: run.caseDocument.kind, snapshots: decoded });
	}
	// a batch oxygen run is a re-aeration test in the model: analyse its own series as an uploaded test would be
	const summary = (run.summary ?? null) as { series?: Record<string, { timeS: number[]; concentrationKgM3: number[] }>; design?: Record<string, { value: number }> } | null;
	const reaeration = ended
		? analyseRunReaeration({ doc: run.caseDocument, series: summary?.series?.dissolvedOxygen, surfaceSaturationKgM3: summary?.design?.surfaceSaturationKgM3?.value })
		: null;
	const { workerId: _w, jobId: _j, ...visible } = run;
	return {
		run: visible,
		column,
		queuedBy: queuedBy ?? null,
		canControl: hasRole(member.role, 'analyst'),
		finalProfile,
		histories,
		reaeration,
		// measurements of the column at this operating point, with this run's error measures
		measurementOverlay: ended ? await measurementsForRun({ teamId: member.team.id, run, snapshot: finalProfile }) : []
	};
};

export const actions: Actions = {
	cancel: async (event) => {
		const member = await requireMember(event, 'analyst');
		try {
			await runs.cancel({ teamId: member.team.id, runId: event.params.id });
		} catch (e) {
			if (e instanceof runs.RunRequestError) {
				// another team's run (or a malformed id) answers 404 like the page itself
				if (e.status === 404) error(404, 'Run not found.');
				return { cancelError: e.message };
			}
			throw e;
		}
		return { cancelled: true };
	},
	rerun: async (event) => {
		const member = await requireMember(event, 'analyst');
		try {
			const run = await runs.rerun({ teamId: member.team.id, runId: event.params.id, userId: member.user.id });
			return { rerunId: run.id };
		} catch (e) {
			if (e instanceof runs.RunRequestError) {
				if (e.status === 404) error(404, 'Run not found.');
				return { rerunError: e.message };
			}
			throw e;
		}
	}
};
