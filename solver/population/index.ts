/**
 * Bubble-size class method (population balance) for coalescence and breakage: the fixed-pivot
 * discretisation of Kumar & Ramkrishna (1996), Chem. Eng. Sci. 51, 1311, its kernels, an explicit
 * Runge–Kutta integrator that keeps every class non-negative, and moment helpers.
 *
 * @example
 * const grid = pivotGrid({ minDiameterM: 1e-3, ratio: 2, classes: 16 });
 * const balance = createPopulationBalance(grid);
 * const eps = columnDissipationRateM2S3({ superficialGasVelocityMS: 0.05 });
 * const table = balance.tabulate({ coalescence: princeBlanchCoalescence({ dissipationM2S3: eps, ... }), breakage: luoSvendsenBreakage({ ... }) });
 * createPopulationIntegrator(balance).advance(N, table, 1.0); // N in 1/m³, advanced 1 s in place
 */
export { pivotGrid, pivotBelow, lumpVolume, sphereVolumeM3, sphereDiameterM, gaussLegendreUnit, type PivotGrid, type Lumping } from './grid.js';
export {
	createPopulationBalance,
	emptyKernelTable,
	pairIndex,
	type PopulationBalance,
	type KernelTable,
	type Kernels,
	type CoalescenceKernel,
	type BreakageKernel
} from './pivot.js';
export * from './kernels.js';
export { volumeMoment, diameterMoment, totalNumber, gasVolumeFraction, sauterDiameterM, interfacialAreaPerM, projectDensity } from './moments.js';
export { createPopulationIntegrator, type PopulationIntegrator, type IntegrationOptions, type IntegrationStats } from './integrate.js';
