/** Scans of exponent series over s: derive once, evaluate many times; crossover marks. */
export * from './scan';
export * from './flowScan';
