/** A study member's inputs: a label to show and the values set on the base case (same shape as `runs.study_point`). */
export interface StudyPoint {
	label: string;
	values: Record<string, number | string>;
}
