/** Padé approximants of a series: coefficients, values, poles in an interval, the table of [L/M]. */
export * from './pade';
export * from './borel';
