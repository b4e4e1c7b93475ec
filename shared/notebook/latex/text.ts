/**
 * Engine text (notes, checks, relations) is Unicode: ε, γ_{φ²}, ∂β_i/∂g_j. pdflatex with its default
 * fonts sets none of these characters in text, so each becomes a TeX command from the fixed tables
 * below (never from the text itself); a character not in the tables becomes "?".
 */
const MATH_SYMBOLS: Record<string, string> = {
  'α': '\\alpha', 'β': '\\beta', 'γ': '\\gamma', 'δ': '\\delta', 'ε': '\\varepsilon', 'η': '\\eta', 'λ': '\\lambda', 'μ': '\\mu',
  'ν': '\\nu', 'π': '\\pi', 'σ': '\\sigma', 'φ': '\\phi', 'ψ': '\\psi', 'ω': '\\omega', 'ζ': '\\zeta', 'χ': '\\chi', 'Γ': '\\Gamma', 'Δ': '\\Delta',
  'Σ': '\\Sigma', '∑': '\\sum', '∂': '\\partial', '−': '-', '·': '\\cdot', '×': '\\times', '≤': '\\le', '≥': '\\ge', '≈': '\\approx',
  '→': '\\to', '±': '\\pm', '∞': '\\infty', '…': '\\dots', '√': '\\surd', '≠': '\\ne', '∈': '\\in',
};
const SUPERSCRIPTS: Record<string, string> = { '⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9', '⁻': '-', '⁺': '+' };
const SUBSCRIPTS: Record<string, string> = { '₀': '0', '₁': '1', '₂': '2', '₃': '3', '₄': '4', '₅': '5', '₆': '6', '₇': '7', '₈': '8', '₉': '9', 'ᵢ': 'i', 'ⱼ': 'j', 'ₖ': 'k', 'ₗ': 'l' };
const TEXT_ONLY: Record<string, string> = { '—': '---', '–': '--', '’': "'", '‘': '`', '“': '``', '”': "''", 'é': "\\'e", 'ö': '\\"o', 'ü': '\\"u', '✓': '', '\u00a0': '~' };

/** One non-ASCII character in text mode. */
function textModeChar(char: string): string {
  if (char in TEXT_ONLY) return TEXT_ONLY[char];
  if (char in MATH_SYMBOLS) return `\\ensuremath{${MATH_SYMBOLS[char]}}`;
  if (char in SUPERSCRIPTS) return `\\textsuperscript{${SUPERSCRIPTS[char]}}`;
  if (char in SUBSCRIPTS) return `\\textsubscript{${SUBSCRIPTS[char]}}`;
  return '?';
}

/** Text already escaped for TeX (only ASCII specials escaped) with its non-ASCII characters made TeX. */
export function unicodeToTexText(escaped: string): string {
  return escaped.replace(/[^\x00-\x7f\uE000-\uE01F]/g, textModeChar);
}

/** Runs of superscript or subscript characters become one script: "φ²" → "\phi^{2}", "a₁₂" → "a_{12}". */
function scriptsToTex(text: string): string {
  return text
    .replace(/[⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁺]+/g, (run) => `^{${[...run].map((c) => SUPERSCRIPTS[c]).join('')}}`)
    .replace(/[₀₁₂₃₄₅₆₇₈₉ᵢⱼₖₗ]+/g, (run) => `_{${[...run].map((c) => SUBSCRIPTS[c]).join('')}}`);
}

/**
 * A relation as the engine states it ("1/ν = s − γ_{φ²}(g*)", "ω = smallest eigenvalue of ∂β_i/∂g_j
 * at g*") as a formula: symbols become commands, g* a starred g, and words (three letters or more,
 * or "of", "at") upright text. Returns the formula and a trailing remark in parentheses, if any.
 */
export function relationTex(relation: string): { math: string; remark: string | null } {
  const remarkAt = relation.search(/ \((?=[^()]*(\([^()]*\)[^()]*)*\)\s*$)/);
  const formula = remarkAt > 0 ? relation.slice(0, remarkAt) : relation;
  const remark = remarkAt > 0 ? relation.slice(remarkAt + 2, -1).trim() : null;
  const math = scriptsToTex(formula)
    .replace(/_([A-Za-z0-9]{2,})\b/g, '_{$1}')
    .replace(/[^\x00-\x7f]/g, (c) => (c in MATH_SYMBOLS ? `${MATH_SYMBOLS[c]} ` : ''))
    .replace(/([A-Za-z])\*/g, '$1^{*}')
    .replace(/(?<![\\A-Za-z])(?:[A-Za-z]{3,}|of|at)(?:[ ,]+[A-Za-z]{2,})*\b/g, (words) => `\\text{ ${words} }`)
    .replace(/ +/g, ' ')
    .trim();
  return { math, remark };
}
