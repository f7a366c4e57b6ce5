export * from './spec.js';
export * from './results.js';
export type { StudyPoint } from './types.js';
