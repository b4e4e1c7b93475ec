/** Work limits enforced before any computation starts. */
export const JOB_LIMITS = {
  minDigits: 5,
  maxDigits: 1000,
  /** Digits of the flow jobs (flow, fixedpoints, exponents, scan) and of a notebook's setup. */
  maxFlowDigits: 200,
  defaultFlowDigits: 30,
  /** Digits of a numeric series (laurent, bubble, fourier, startriangle with "at") when the job gives none. */
  defaultSeriesDigits: 30,
  /** Digits of a comparison with data (values held against data with a few significant digits). */
  maxCompareDigits: 50,
  defaultCompareDigits: 20,
  /** Highest polygamma order for a `special` job. */
  maxPsiOrder: 200,
  /** Laurent jobs: eps powers from minOrder to maxOrder may be requested. */
  minOrder: -20,
  maxOrder: 30,
  /** Terms beyond the leading power (order − lowest): numeric and symbolic caps. */
  maxNumericDepth: 30,
  maxSymbolicDepth: 6,
  /** digits × (depth + 1) for numeric series; digits × (order + 1) for polygamma. */
  maxDigitsTimesTerms: 12000,
  /** |x| bound for special-function arguments. */
  maxAbsArgument: 1e12,
  maxExpressionLength: 2000,
  maxGammaFactors: 40,
  /** Γ factors × terms for symbolic expansions: the number of ψ-monomials grows combinatorially in both. */
  maxSymbolicFactorsTimesDepth: 24,
  /** digits × terms × Γ factors for numeric expansions (about 5 s of engine time at the limit on 2 cores). */
  maxNumericWork: 60_000,
  /** digits × terms summed over the jobs of one batch. */
  maxBatchWork: 60_000,
  maxBatch: 100,
  maxPadeCoefficients: 41,
  /** Size of any exact number built while reading an expression (numerator or denominator). */
  maxNumberBits: 4096,
  /** |power| of one Γ factor after nested powers are multiplied out. */
  maxGammaPower: 50,
  /** |n| of an integer power written in an expression, (…)^n. */
  maxIntegerPower: 50,
  /** Characters of a fixed point's name in "fixedPoint". */
  maxFixedPointName: 100,
  /** Bootstrap resamples of the kink locator. */
  minResamples: 20,
  maxResamples: 1000,
  defaultResamples: 200,
} as const;

/**
 * Sizes of stored results, in characters of result JSON (results are ASCII, so also bytes). A finished
 * result over `maxResultBytes` is not stored; a scan whose estimated result is over it is refused up front.
 * A notebook's cells' results together stay under `maxNotebookResultBytes` (they travel in one reply).
 */
export const RESULT_LIMITS = {
  maxResultBytes: 4_000_000,
  maxNotebookResultBytes: 16_000_000,
} as const;

/** Field components of a custom potential. Presets take any real N through the symbolic-N family; only integer N from 1 to 6 also get explicit tensors (for field directions). */
export const MAX_FIELDS = 6;

/** Points of one scan. */
export const MAX_SCAN_POINTS = 1000;
