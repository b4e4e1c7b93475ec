/**
 * P(s) (docs/tetrahedron.md) from the independent two-fold Mellin–Barnes integration in mpmath 1.3.0
 * (mpmath as reference library), printed by
 *   python3 tests/unit/helpers/tetrahedron_mpmath.py 18 2 1.9
 *   python3 tests/unit/helpers/tetrahedron_mpmath.py 18 1.75 1.6 1.5 1.25 1 0.5
 *   python3 tests/unit/helpers/tetrahedron_mpmath.py 18 0.3
 *   python3 tests/unit/helpers/tetrahedron_mpmath.py --small-s 20 0.2
 * (mp.dps = 18, printed with 15 significant digits; 4–8 minutes per s, 16 at s = 0.3; 20 minutes for
 * s = 0.2 at mp.dps = 20, whose 17 printed digits are cut to 15 here). At s = 0.2 the default contour
 * (Re u = Re v = −a/3) gave 49.7404492265778 at mp.dps 18 and 22 with two cut sets — off in the 14th digit;
 * --small-s moves it to −a/4. Below s = 1/3 these
 * check the engine's analytic continuation (docs/tetrahedron.md): the Mellin–Barnes form holds for every s > 0.
 * Good to TETRAHEDRON_MPMATH_DIGITS digits: at s = 2 the same run gives 6ζ(3) = 7.21234141895757 to all 15.
 * Tests never run python; these strings are the stored output.
 */
export const TETRAHEDRON_MPMATH_DIGITS = 14;

export const TETRAHEDRON_MPMATH: Record<string, string> = {
  '2': '7.21234141895757',
  '1.9': '8.94285517417247',
  '1.75': '12.1307888791578',
  '1.6': '16.0885146701256',
  '1.5': '19.1639201555465',
  '1.25': '28.2108950022278',
  '1': '38.3141435959409',
  '0.5': '52.5225507654354',
  '0.3': '51.8944051929395',
  '0.2': '49.7404492265764',
};
