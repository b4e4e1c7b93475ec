/**
 * P(s) (docs/tetrahedron.md) from the independent two-fold Mellin–Barnes integration in mpmath 1.3.0
 * (mpmath as reference library), printed by
 *   python3 tests/unit/helpers/tetrahedron_mpmath.py 18 2 1.75 1.5 1
 *   python3 tests/unit/helpers/tetrahedron_mpmath.py 18 1.9 1.6 1.25 0.5
 * (mp.dps = 18, printed with 15 significant digits; the run takes about 4–5 minutes per s).
 * Good to TETRAHEDRON_MPMATH_DIGITS digits: at s = 2 the same run gives 6ζ(3) = 7.21234141895757 to all 15.
 * Tests never run python; these strings are the stored output.
 */
export const TETRAHEDRON_MPMATH_DIGITS = 14;

export const TETRAHEDRON_MPMATH: Record<string, string> = {
  '2': '7.21234141895757',
  '1.9': '8.94285517417247',
};
