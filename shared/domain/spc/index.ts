/**
 * Statistical process control for critical characteristics: control-chart constants, charts with
 * frozen limits and run rules, capability, a normality check, histogram bins and rule rehearsal.
 * Pure computations in doubles; only rule rehearsal judges readings, through tolerance.ts.
 */
export * from './capability.js';
export * from './charts.js';
export * from './constants.js';
export * from './histogram.js';
export * from './limits.js';
export * from './normal.js';
export * from './normality.js';
export * from './rehearse.js';
export * from './run-rules.js';
export * from './summary.js';
