/** Numerical data held against the series: smoothing spline with GCV, and the kink locator. Double precision. */
export { locateKinks, noiseLevel, KINK_THRESHOLDS, type KinkFound, type KinkSearch } from './kinks';
export { prepareSpline, fitSpline, gcvSpline, gcvScore, evaluateSpline, type SplineFit, type SplineSetup } from './spline';
export { mulberry32 } from './random';
