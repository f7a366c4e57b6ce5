/** Shapes of the verification cases and their results (plain data: stored as JSON, drawn in the browser). */

/** One line of a chart: values aligned with the chart's `x`; null leaves a gap. */
export interface VerificationSeries {
	label: string;
	y: (number | null)[];
	/** `line` (default) for a computed solution, `points` for readings or grid values, `reference` for the analytic or published curve */
	style?: 'line' | 'points' | 'reference';
}

export interface VerificationChart {
	/** ascending */
	x: number[];
	xLabel: string;
	yLabel: string;
	series: VerificationSeries[];
	/** logarithmic axes (both positive) */
	logX?: boolean;
	logY?: boolean;
}

/** Observed order of accuracy over a sequence of grids (coarsest first). */
export interface ObservedOrder {
	cells: number[];
	/** the error on each grid, in the case's error unit */
	errors: number[];
	/** order between each pair of neighbouring grids, ln(e_coarse/e_fine)/ln(h_coarse/h_fine) */
	pairwise: number[];
	/** the order reported: of the two finest grids, or the apparent order of a three-grid study */
	observed: number;
	/** the range the scheme should show here; every pairwise order must lie inside it */
	expected: [number, number];
	/** one line on why that range */
	expectedWhy: string;
}

export interface VerificationOutcome {
	/** the case's error measure (non-negative; NaN when the case could not compute it) */
	error: number;
	errorUnit: string;
	/** the case passes when error ≤ tolerance (and the order lies in its expected range) */
	tolerance: number;
	/** one line on what the error is and where the tolerance comes from */
	errorWhat: string;
	order?: ObservedOrder;
	/** further criteria of the same case; each must hold for the case to pass */
	checks?: VerificationCheck[];
	chart: VerificationChart;
	/** further numbers worth showing beside the error, one line each */
	notes?: string[];
}

/** A further criterion: `value ≤ tolerance` (or `value ≥ tolerance` with `atLeast`). */
export interface VerificationCheck {
	label: string;
	value: number;
	tolerance: number;
	unit: string;
	atLeast?: boolean;
}

export interface VerificationCase {
	id: string;
	title: string;
	/** the short citation for tables: author (year) */
	reference: string;
	/** the reference: author (year) and what was taken from it */
	source: string;
	/** what is checked, one or two sentences */
	what: string;
	/** `fraction` of this case done, 0–1, at least once per grid or run */
	run(onProgress: (fraction: number) => void): VerificationOutcome;
}

/** A case's outcome as stored: the case's description, its outcome and the verdict. */
export interface VerificationResult extends VerificationOutcome {
	id: string;
	title: string;
	reference: string;
	source: string;
	what: string;
	passed: boolean;
	/** wall time of the case, s */
	durationS: number;
	/** set when the case threw instead of producing an outcome */
	failure?: string;
}

export interface VerificationProgress {
	/** cases finished plus the fraction of the current one, over the number of cases (0–1) */
	fraction: number;
	caseIndex: number;
	caseCount: number;
	caseId: string;
	caseTitle: string;
}
