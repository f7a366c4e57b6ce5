/**
 * Measurements: kinds and units, reading uploads, holding runs against them, the re-aeration
 * analysis and CSV exports. Pure TypeScript, used by the browser and the server alike.
 */
export * from './kinds.js';
export * from './csv.js';
export * from './compare.js';
export * from './reaeration.js';
export * from './export.js';
export { studentTQuantile, studentTCdf } from './stats.js';
export * from './upload.js';
export * from './case-json.js';
