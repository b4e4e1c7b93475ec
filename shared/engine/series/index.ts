/** Series: Laurent series in ε over a coefficient ring, and the numeric ring at a working precision. */
export * from './ring';
export * from './laurent';
export * from './numeric';
