/** Data shapes the chart components take. */

export interface ResidualSeries {
	/** completed step of each point */
	steps: number[];
	/** one array per residual id, aligned with `steps`; null where absent */
	values: Record<string, (number | null)[]>;
}

export interface Profile {
	label: string;
	x: ArrayLike<number>;
	y: ArrayLike<number>;
}

export interface Reference {
	label: string;
	value: number;
}
