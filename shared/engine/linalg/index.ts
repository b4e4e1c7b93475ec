/**
 * The engine's one linear algebra, below Padé and the models: complex numbers, linear solves and null
 * spaces over a coefficient ring, polynomial roots (double precision and polished with multiplicities,
 * and real roots in an interval), the characteristic polynomial, eigenvalues, and the symmetric
 * eigen-solver. Imports only precision/ and series/.
 */
export * from './complex';
export * from './solve';
export * from './polynomial';
export * from './realRoots';
export * from './characteristic';
export * from './eigen';
export * from './symmetric';
