/** A column of `DataTable`: its header and the value it sorts and filters by. */
export interface Column<R> {
	key: string;
	label: string;
	/** value used for sorting and filtering (numbers sort numerically) */
	value: (row: R) => string | number | null | undefined;
	align?: 'left' | 'right';
}
