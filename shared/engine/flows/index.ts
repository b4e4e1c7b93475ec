/** Flows: the derived β-functions and anomalous dimensions of a model, evaluated and differentiated. */
export * from './flow';
export * from './family';
