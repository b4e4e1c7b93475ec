export * from './values';
export * from './gammaExpansion';
export * from './loops';
