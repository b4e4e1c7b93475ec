import { affineToLatex, affineToString, latexRational } from './affine';
import { type Atom, type Expression, type Power, type Term, atomKey, monomialKey } from './expression';
import { type Poly, polyConstantValue, polyNeg, polyTermCount, polyToLatex, polyToString, sortedTerms } from './polynomial';
import { type Q, qIsOne, qToString } from './rational';
import { type Factor, factorToLatex, ratConstantValue, ratParts } from './ratfunc';

/*
 * Plain-text syntax (parsable by mathjs): sums of terms `c*atoms/(atoms)` with atoms
 * psi(k, x), gamma(x), zeta(n), pi, log(2), eulergamma; parameters by name; powers with ^.
 */

function orderedTerms(e: Expression): Term[] {
  return [...e.terms.values()].sort((a, b) => a.monomial.length - b.monomial.length || (monomialKey(a.monomial) < monomialKey(b.monomial) ? -1 : monomialKey(a.monomial) > monomialKey(b.monomial) ? 1 : 0));
}

function atomText(a: Atom): string {
  switch (a.kind) {
    case 'psi':
      return `psi(${a.order}, ${affineToString(a.arg)})`;
    case 'gamma':
      return `gamma(${affineToString(a.arg)})`;
    case 'tetrahedron':
      return `tetrahedron(${affineToString(a.arg)})`;
    default:
      return atomKey(a);
  }
}

function powerText(p: Power, negate: boolean): string {
  const e = negate ? { num: -p.exponent.num, den: p.exponent.den } : p.exponent;
  const base = atomText(p.atom);
  if (qIsOne(e)) return base;
  return e.den === 1n ? `${base}^${e.num}` : `${base}^(${qToString(e)})`;
}

/** Pull the sign of the first printed term out of a numerator, so c and −c print as "x" and "−x" alike. */
function signedNumerator(num: Poly): { negative: boolean; num: Poly } {
  const lead = sortedTerms(num)[0];
  return lead && lead.coeff.num < 0n ? { negative: true, num: polyNeg(num) } : { negative: false, num };
}

/** How a term prints: plain text (mathjs syntax) or LaTeX. */
interface TermStyle {
  rational: (c: Q) => string;
  poly: (p: Poly) => string;
  parenthesize: (text: string) => string;
  /** A sum in the numerator needs parentheses before a denominator (plain text; LaTeX's \frac groups it). */
  wrapBeforeDenominator: boolean;
  factor: (f: Factor) => string;
  power: (p: Power, negate: boolean) => string;
}

/** A term as its sign and the printed factors of its numerator and denominator. */
function termParts(t: Term, style: TermStyle): { negative: boolean; numParts: string[]; denParts: string[] } {
  const numParts: string[] = [];
  const denParts: string[] = [];
  let negative: boolean;
  const c = ratConstantValue(t.coeff);
  if (c) {
    negative = c.num < 0n;
    const n = negative ? -c.num : c.num;
    if (n !== 1n || !t.monomial.some((p) => p.exponent.num > 0n)) numParts.push(n.toString());
    if (c.den !== 1n) denParts.push(c.den.toString());
  } else {
    const { num: raw, factors } = ratParts(t.coeff);
    const signed = signedNumerator(raw);
    const { num } = signed;
    negative = signed.negative;
    const single = polyConstantValue(num);
    const wrap = polyTermCount(num) > 1 && (t.monomial.length > 0 || negative || (style.wrapBeforeDenominator && factors.length > 0));
    numParts.push(single ? style.rational(single) : wrap ? style.parenthesize(style.poly(num)) : style.poly(num));
    denParts.push(...factors.map(style.factor));
  }
  for (const p of t.monomial) (p.exponent.num > 0n ? numParts : denParts).push(style.power(p, p.exponent.num < 0n));
  return { negative, numParts, denParts };
}

/** Terms joined by their signs: "a + b - c". */
function joinTerms(terms: { negative: boolean; text: string }[]): string {
  if (terms.length === 0) return '0';
  return terms.map((t, i) => (i === 0 ? (t.negative ? `-${t.text}` : t.text) : t.negative ? ` - ${t.text}` : ` + ${t.text}`)).join('');
}

const TEXT: TermStyle = {
  rational: qToString,
  poly: polyToString,
  parenthesize: (text) => `(${text})`,
  wrapBeforeDenominator: true,
  factor: (f) => {
    const base = polyTermCount(f.poly) > 1 ? `(${polyToString(f.poly)})` : polyToString(f.poly);
    return f.power === 1 ? base : `${base}^${f.power}`;
  },
  power: powerText,
};

function termText(t: Term): { negative: boolean; text: string } {
  const { negative, numParts, denParts } = termParts(t, TEXT);
  const numerator = numParts.length ? numParts.join('*') : '1';
  const denominator = denParts.length === 0 ? '' : denParts.length === 1 ? `/${denParts[0]}` : `/(${denParts.join('*')})`;
  return { negative, text: numerator + denominator };
}

export function expressionToString(e: Expression): string {
  return joinTerms(orderedTerms(e).map(termText));
}

// ---------------------------------------------------------------------------------------------

function atomLatex(a: Atom): string {
  switch (a.kind) {
    case 'pi':
      return '\\pi';
    case 'log2':
      return '\\ln 2';
    case 'eulergamma':
      return '\\gamma_E';
    case 'zeta':
      return `\\zeta(${a.n})`;
    case 'psi':
      return `${a.order === 0 ? '\\psi' : a.order === 1 ? "\\psi'" : `\\psi^{(${a.order})}`}\\left(${affineToLatex(a.arg)}\\right)`;
    case 'gamma':
      return `\\Gamma\\left(${affineToLatex(a.arg)}\\right)`;
    case 'tetrahedron':
      return `P\\left(${affineToLatex(a.arg)}\\right)`;
  }
}

function powerLatex(p: Power, negate: boolean): string {
  const e = negate ? { num: -p.exponent.num, den: p.exponent.den } : p.exponent;
  const base = atomLatex(p.atom);
  if (qIsOne(e)) return base;
  if (e.num === 1n && e.den === 2n && p.atom.kind === 'pi') return '\\sqrt{\\pi}';
  const wrapped = p.atom.kind === 'log2' ? `(${base})` : base;
  return `${wrapped}^{${e.den === 1n ? e.num.toString() : qToString(e)}}`;
}

const LATEX: TermStyle = {
  rational: latexRational,
  poly: polyToLatex,
  parenthesize: (text) => `\\left(${text}\\right)`,
  wrapBeforeDenominator: false,
  factor: factorToLatex,
  power: powerLatex,
};

function termLatex(t: Term): { negative: boolean; text: string } {
  const { negative, numParts, denParts } = termParts(t, LATEX);
  const numerator = numParts.length ? numParts.join(' ') : '1';
  return { negative, text: denParts.length ? `\\frac{${numerator}}{${denParts.join(' ')}}` : numerator };
}

export function expressionToLatex(e: Expression): string {
  return joinTerms(orderedTerms(e).map(termLatex));
}
