/**
 * P(s) (docs/tetrahedron.md) from an independent implementation of the spectral sum in mpmath 1.3.0
 * (mpmath as reference library: tanh-sinh quadrature with mpmath.gamma, the l-tail from a numerical fit
 * of its large-l form summed with mpmath's Hurwitz ζ — no Stirling series, Bernoulli numbers or exp-sinh
 * rule, so the engine's implementation is checked, the spectral formula itself by the Mellin–Barnes
 * values in tetrahedron-values.ts). Printed by
 *   nice python3 tests/unit/helpers/tetrahedron_spectral_mpmath.py 50 2 1.9 1.75 1.6 1.5 1.25 1 0.75 0.5
 * (2026-12-04, 45–65 s per s). Each s is computed with two settings (working precision, number of
 * directly summed l, fit degree); they agree to 50–61 digits, and at s = 2 the value is 6ζ(3) to 61
 * digits. Tests never run python; these strings are the stored output (50 significant digits).
 */
export const TETRAHEDRON_SPECTRAL_DIGITS = 48;

export const TETRAHEDRON_SPECTRAL: Record<string, string> = {
  '2': '7.212341418957565712398428969068699944589917754043', // settings agree to 61 digits
  '1.9': '8.9428551741724688641406964585595924569483452545765', // settings agree to 52 digits
  '1.75': '12.130788879157757847573040443803684029321204334492', // settings agree to 50 digits
  '1.6': '16.088514670125597618720842336112480090470547710056', // settings agree to 52 digits
  '1.5': '19.163920155546503916817939249854165484074998171354', // settings agree to 60 digits
  '1.25': '28.210895002227843869115232673690735991557917248184', // settings agree to 61 digits
  '1': '38.314143595940872973249291053572025266111854957804', // settings agree to 61 digits
  '0.75': '47.398216980171161916979847647014108829528233075951', // settings agree to 60 digits
  '0.5': '52.522550765435439332082478576907149038224945347814', // settings agree to 61 digits
};

/**
 * Between s = 1/3 and 1/2 the engine subtracts the large-t behaviour and adds its integral back (the
 * analytic continuation it also uses below 1/3); the mpmath spectral sum integrates plainly there. Printed by
 *   nice python3 tests/unit/helpers/tetrahedron_spectral_mpmath.py 40 0.45 0.4 0.35
 * (2026-12-04; the two settings agree to 47–49 digits). Stored to 40 significant digits.
 */
export const TETRAHEDRON_SPECTRAL_BELOW_HALF_DIGITS = 38;

export const TETRAHEDRON_SPECTRAL_BELOW_HALF: Record<string, string> = {
  '0.45': '52.81034144562449997998607782107201174476', // settings agree to 49 digits
  '0.4': '52.80882174192684787617712394945435522337', // settings agree to 49 digits
  '0.35': '52.50600849940263763047549083926102480505', // settings agree to 47 digits
};

/**
 * Below s = 1/3 the sum exists only through the analytic continuation. The mpmath helper's own
 * implementation of it (integral_l_continued: the subtracted integral by quadrature, plus K(s)) printed
 *   nice python3 tests/unit/helpers/tetrahedron_spectral_mpmath.py --continued 30 0.3 0.25 0.4
 * (2026-12-04; its two settings agree to 32, 34 and 38 digits; at 0.4 it equals the plain value above).
 */
export const TETRAHEDRON_SPECTRAL_CONTINUED_DIGITS = 30;

export const TETRAHEDRON_SPECTRAL_CONTINUED: Record<string, string> = {
  '0.3': '51.8944051929394729751065633195', // settings agree to 32 digits
  '0.25': '50.9715463973670800599283374145', // settings agree to 34 digits
  '0.4': '52.8088217419268478761771239495', // settings agree to 38 digits
};
