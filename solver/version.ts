/** Version of the numerical models; stored with every run and checkpoint so results stay reproducible. */
export const SOLVER_VERSION = '1.0.0';
