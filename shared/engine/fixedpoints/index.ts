/** Fixed points of the truncated flow: ε-series, numeric roots, stability matrix and eigenvalues. */
export * from './fixedPoints';
export * from './complexRoots';
