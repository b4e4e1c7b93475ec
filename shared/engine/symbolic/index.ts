/** Symbolic: exact rationals, affine forms, expressions in ψ/ζ/π atoms, polynomials and rational functions, formatting. */
export * from './rational';
export * from './util';
export * from './affine';
export * from './expression';
export * from './canonical';
export * from './evaluate';
export * from './format';
export * from './parse';
export * from './polynomial';
export * from './ratfunc';
export * from './ring';
export * from './substitute';
