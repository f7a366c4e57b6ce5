export { HeightModel } from './model.js';
export { configFromCase, gasCompressibility, type HeightModelConfig, type BottomBoundary, type TopBoundary } from './config.js';
export { createHeightSimulation, createHeightSimulationFromConfig, HEIGHT_MODEL_VERSION, residualNames, type HeightSimulation } from './simulation.js';
export { faucetConfig, sedimentationConfig } from './problems.js';
