/** Critical exponents at a fixed point: ε-series, scaling relations, mean-field statement, notices, short-range crossover. */
export * from './exponents';
export * from './quadratic';
export * from './fieldMatrix';
export * from './atPoint';
export * from './notices';
export * from './shortRange';
