export * from './groups.js';
export * from './holdup.js';
export * from './bubble-size.js';
export * from './mass-transfer.js';
export * from './drift-flux.js';
export * from './regime.js';
export * from './terminal-velocity.js';
export * from './churn.js';
