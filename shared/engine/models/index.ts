/** Models: quartic coupling tensors, presets, custom potentials, projections onto couplings. */
export * from './tensor';
export * from './model';
export * from './presets';
export * from './custom';
export * from './projection';
export * from './couplingPolynomial';
