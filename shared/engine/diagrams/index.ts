/** Diagrams: the graph catalogue, tensor weights, loop integrals, subtraction, Z-factors → RG functions. */
export * from './graphs';
export * from './generate';
export * from './weights';
export * from './integrals';
export * from './catalogue';
export * from './calculus';
export * from './subtraction';
export * from './renormalization';
export * from './lineGraph';
export * from './seriesParallel';
export * from './forests';
export * from './forestFlow';
