import { realTex, valueTex, type NumberStyle } from './numbers';

/**
 * Equations that fit the page: a sum is a list of signed terms, and rows of an align* take as many
 * terms as fit the text width (estimated from the characters TeX will set), breaking before + or −.
 */
export interface Term {
  negative: boolean;
  /** The term without its sign, e.g. "\frac{5}{11}\,\varepsilon". */
  body: string;
}

export interface Equation {
  lhs: string;
  terms: Term[];
}

/** Width of the text block in points: A4 with 2.5 cm margins (see the preamble's geometry). */
export const TEXT_WIDTH_PT = 455;
/** What a row of an align* may fill: the text width less the equation's left side, the "=" and a safety margin. */
const ROW_SHARE = 0.8;

/**
 * Rough width of a formula in points at 10 pt (Computer Modern: digits 5 pt, letters about 5 pt,
 * binary operators with their spacing about 12 pt). Errs on the wide side.
 */
export function estimatedWidthPt(tex: string): number {
  let rest = tex;
  let width = 0;
  rest = rest.replace(/\\frac\{([^{}]*)\}\{([^{}]*)\}/g, (_, top: string, bottom: string) => {
    width += Math.max(estimatedWidthPt(top), estimatedWidthPt(bottom)) + 2;
    return '';
  });
  rest = rest.replace(/[\^_]\{([^{}]*)\}/g, (_, script: string) => {
    width += 0.75 * estimatedWidthPt(script);
    return '';
  });
  rest = rest.replace(/\\text\{([^{}]*)\}/g, (_, text: string) => {
    width += 5 * text.length;
    return '';
  });
  rest = rest.replace(/\\(left|right|big|Big|bigl|bigr|Bigl|Bigr)\b/g, '');
  rest = rest.replace(/\\[,!;: ]/g, () => {
    width += 2;
    return '';
  });
  rest = rest.replace(/\\[a-zA-Z]+/g, () => {
    width += 6;
    return '';
  });
  for (const char of rest.replace(/[{}\s]/g, '')) width += '+-=<>'.includes(char) ? 12 : 5.2;
  return width;
}

/** Terms joined into one line: "a - b + c" (the first term keeps its own minus). */
export function joinTerms(terms: Term[]): string {
  if (terms.length === 0) return '0';
  return terms.map((term, index) => (index === 0 ? `${term.negative ? '-' : ''}${term.body}` : ` ${term.negative ? '-' : '+'} ${term.body}`)).join('');
}

/** Rows of at most `widthPt` each; a row after the first starts with its sign. */
function packRows(terms: Term[], widthPt: number): string[] {
  const rows: Term[][] = [];
  let current: Term[] = [];
  for (const term of terms) {
    const trial = [...current, term];
    if (current.length > 0 && estimatedWidthPt(joinTerms(trial)) > widthPt) {
      rows.push(current);
      current = [term];
    } else current = trial;
  }
  if (current.length) rows.push(current);
  return rows.map((row, index) => (index === 0 ? joinTerms(row) : `${row[0].negative ? '-' : '+'} ${joinTerms([{ ...row[0], negative: false }, ...row.slice(1)])}`));
}

/**
 * The body of an align* (or aligned): one equation per line, each broken into as many rows as it
 * needs; continuation rows are indented by a quad after the "=" column.
 */
export function alignBody(equations: Equation[], widthPt = TEXT_WIDTH_PT): string {
  return equations
    .map(({ lhs, terms }) => {
      const rows = packRows(terms, widthPt * ROW_SHARE - estimatedWidthPt(lhs));
      return [`${lhs} &= ${rows[0] ?? '0'}`, ...rows.slice(1).map((row) => `&\\quad ${row}`)].join(' \\\\\n');
    })
    .join(' \\\\\n');
}

/** Powers of ε after a coefficient: "", "\,\varepsilon", "\,\varepsilon^{2}", "\,\varepsilon^{-1}". */
export function epsilonPower(power: number): string {
  return power === 0 ? '' : power === 1 ? '\\varepsilon' : `\\varepsilon^{${power}}`;
}

/** A coefficient times a monomial, as one signed term; a coefficient ±1 is left out before a monomial. */
export function term(coefficient: unknown, monomial: string, style: NumberStyle): Term | null {
  const tex = valueTex(coefficient, style, true);
  if (/^-?0$/.test(tex) || /^-?0(\.0*)?$/.test(tex)) return null;
  const complex = /\\,i$/.test(tex);
  if (complex) return { negative: false, body: monomial ? `\\left(${tex}\\right)${monomial}` : tex };
  const negative = tex.startsWith('-');
  const magnitude = negative ? tex.slice(1) : tex;
  if (!monomial) return { negative, body: magnitude };
  if (magnitude === '1') return { negative, body: monomial };
  return { negative, body: `${magnitude}\\,${monomial}` };
}

/** An ε-series c_lowest ε^lowest + … with its truncation O(ε^{order+1}); zero coefficients are left out. */
export function seriesTerms(lowest: number, coeffs: unknown[], style: NumberStyle, order?: number): Term[] {
  const terms = coeffs.flatMap((c, k) => term(c, epsilonPower(lowest + k), style) ?? []);
  const next = (order ?? lowest + coeffs.length - 1) + 1;
  return [...terms, { negative: false, body: `O(${epsilonPower(next) || '1'})` }];
}

/** A plain number for use inside a formula (rounded or exact as the style says). */
export const numberIn = (text: string, style: NumberStyle) => realTex(text, style) ?? valueTex(text, style);

/** "eps*u^2" → "\varepsilon\,u^{2}", "g12" → "g_{12}". */
export function monomialTex(monomial: string): string {
  return monomial
    .split('*')
    .map((factor) => {
      const [base, power] = factor.split('^');
      const name = base === 'eps' ? '\\varepsilon' : base.length > 1 ? `${base[0]}_{${base.slice(1)}}` : base;
      return power ? `${name}^{${power}}` : name;
    })
    .join('\\,');
}
