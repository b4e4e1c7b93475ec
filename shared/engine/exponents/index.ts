/** Critical exponents at a fixed point: ε-series, scaling relations, mean-field statement. */
export * from './exponents';
export * from './quadratic';
