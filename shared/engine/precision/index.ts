/** Precision: engine errors, exact rationals and decimal reals at a chosen number of digits, fixed-point kernels. */
export * from './errors';
export * from './fixed';
export * from './real';
