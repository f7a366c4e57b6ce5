/**
 * Twofold solver — public surface. A pure TypeScript library: no database, no DOM, no I/O.
 */
export * from './case.js';
export type * from './types.js';
