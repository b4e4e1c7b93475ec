import katex from 'katex';

/**
 * Formulas from a notebook, made safe to compile by someone who did not write them.
 *
 * TeX can read and write files (\input, \openin, \write, \immediate), run programs (\write18),
 * redefine anything (\def, \catcode, \csname) and spell a backslash without typing one (^^5c).
 * So a formula keeps only what is on the allow-list below: commands that KaTeX renders and that
 * LaTeX with amsmath and amssymb typesets without touching a file. Anything else is removed (and
 * reported), TeX comments and ^^-notation are removed, and the result must still parse in KaTeX,
 * or the formula is printed as escaped text instead.
 *
 * An export runs on the request thread, so its cost is bounded up front: KaTeX (roughly 10 µs per
 * character) parses at most KATEX_BUDGET characters per export, and formulas past that get a
 * linear check of their structure instead (braces, \begin/\end, \left/\right) — their commands
 * are still only those on the allow-list, which is what makes them safe. Past MAX_FORMULAS
 * formulas, the rest is printed as text.
 */
const SAFE_COMMANDS = new Set(
  [
    // Greek
    'alpha beta gamma delta epsilon varepsilon zeta eta theta vartheta iota kappa varkappa lambda mu nu xi pi varpi rho varrho',
    'sigma varsigma tau upsilon phi varphi chi psi omega digamma Gamma Delta Theta Lambda Xi Pi Sigma Upsilon Phi Psi Omega',
    'varGamma varDelta varTheta varLambda varXi varPi varSigma varUpsilon varPhi varPsi varOmega',
    // binary operators
    'pm mp times div cdot ast star circ bullet oplus ominus otimes oslash odot cap cup sqcap sqcup vee wedge setminus',
    'wr diamond amalg dagger ddagger triangleleft triangleright bigtriangleup bigtriangledown land lor',
    // relations
    'leq le geq ge neq ne equiv sim simeq approx approxeq cong propto ll gg subset supset subseteq supseteq in ni notin',
    'perp parallel mid nmid prec succ preceq succeq asymp doteq models vdash dashv lesssim gtrsim leqslant geqslant',
    'lessapprox gtrapprox ll lll gg ggg smile frown bowtie vartriangleleft vartriangleright',
    // arrows
    'to gets rightarrow leftarrow leftrightarrow Rightarrow Leftarrow Leftrightarrow longrightarrow longleftarrow',
    'Longrightarrow Longleftarrow longleftrightarrow Longleftrightarrow mapsto longmapsto uparrow downarrow updownarrow',
    'Uparrow Downarrow Updownarrow nearrow searrow swarrow nwarrow hookrightarrow hookleftarrow rightleftharpoons',
    'leftharpoonup rightharpoonup implies iff',
    // other symbols
    'infty partial nabla hbar hslash ell forall exists nexists emptyset varnothing neg lnot top bot angle triangle Box',
    'square blacksquare prime backslash aleph beth Re Im wp surd flat natural sharp cdots ldots dots vdots ddots dotsc',
    'dotsb dotsm colon vert Vert lvert rvert lVert rVert langle rangle lfloor rfloor lceil rceil lbrace rbrace',
    'lbrack rbrack imath jmath therefore because checkmark complement mho eth',
    // big operators
    'sum prod coprod int iint iiint oint bigcup bigcap bigoplus bigotimes bigodot biguplus bigvee bigwedge bigsqcup',
    // named functions
    'sin cos tan cot sec csc arcsin arccos arctan sinh cosh tanh coth exp log ln lg lim liminf limsup sup inf max min',
    'det dim ker deg gcd arg hom Pr mod bmod pmod pod',
    // structures and decorations
    'frac dfrac tfrac cfrac binom dbinom tbinom sqrt over atop choose overline underline overbrace underbrace',
    'hat widehat tilde widetilde bar vec dot ddot dddot breve check acute grave mathring',
    'overrightarrow overleftarrow overleftrightarrow underrightarrow underleftarrow stackrel overset underset',
    'substack boxed phantom hphantom vphantom smash not left right middle',
    'big Big bigg Bigg bigl bigr Bigl Bigr biggl biggr Biggl Biggr',
    'limits nolimits displaystyle textstyle scriptstyle scriptscriptstyle operatorname mathop mathbin mathrel mathord',
    'mathrm mathit mathbf mathsf mathtt mathcal mathbb mathfrak boldsymbol pmb',
    'text textrm textit textbf textsf texttt textnormal mbox',
    'quad qquad enspace thinspace medspace thickspace negthinspace',
    'begin end',
  ]
    .join(' ')
    .split(/\s+/)
    .map((name) => `\\${name}`),
);

/** Control symbols: spacing, line breaks in environments, and escaped specials. */
const SAFE_SYMBOLS = new Set(['\\,', '\\;', '\\:', '\\!', '\\>', '\\ ', '\\\\', '\\{', '\\}', '\\|', '\\#', '\\%', '\\&', '\\_', '\\$']);

/** Math environments both KaTeX and amsmath know, usable inside \[ \] and $ $. */
const SAFE_ENVIRONMENTS = new Set(['matrix', 'pmatrix', 'bmatrix', 'Bmatrix', 'vmatrix', 'Vmatrix', 'smallmatrix', 'cases', 'aligned', 'alignedat', 'gathered', 'array', 'subarray', 'split']);

/** Control characters have their own TeX meanings (^^M ends a line, ^^? is invalid): none belongs in a notebook text. */
export function withoutControlCharacters(text: string): string {
  return text.replace(/\r\n?/g, '\n').replace(/[\x00-\x08\x0b-\x1f\x7f]/g, '');
}

/** What was taken out of a document's formulas, for the note at the top of the export. */
export class TexSafetyReport {
  readonly removedCommands = new Set<string>();
  formulasWithRemovals = 0;
  formulasAsText = 0;
  formulasOverLimit = 0;

  get empty(): boolean {
    return this.formulasWithRemovals === 0 && this.formulasAsText === 0 && this.formulasOverLimit === 0;
  }

  /** "2 formulas contained commands that were removed: \input, \write. 1 formula that KaTeX cannot read was printed as text." */
  summary(): string {
    const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;
    const parts: string[] = [];
    if (this.formulasWithRemovals) {
      const names = [...this.removedCommands].slice(0, 30).map(printableName);
      parts.push(`${plural(this.formulasWithRemovals, 'formula')} contained commands that were removed: ${names.join(', ')}${this.removedCommands.size > 30 ? ', ...' : ''}.`);
    }
    if (this.formulasAsText) parts.push(`${plural(this.formulasAsText, 'formula')} that KaTeX cannot read ${this.formulasAsText === 1 ? 'was' : 'were'} printed as text.`);
    if (this.formulasOverLimit) parts.push(`Text after the first ${MAX_FORMULAS} formulas was printed without typesetting its mathematics.`);
    return parts.join(' ');
  }
}

/** A removed name as one line of printable ASCII (a backslash-newline is shown as \<newline>). */
function printableName(name: string): string {
  return name.replace(/[^\x21-\x7e]/g, (c) => (c === ' ' ? '<space>' : c === '\n' ? '<newline>' : `<U+${c.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}>`));
}

type Token = { kind: 'command' | 'text'; source: string };

/** TeX's own split: a backslash with the letters after it, or with one other character; ^^; % to the end of the line. */
const TEX_TOKEN = /\\[a-zA-Z]+|\\[\s\S]?|\^\^|%[^\n]*|[^\\^%]+|\^/gy;

function tokenize(math: string): Token[] {
  return [...math.matchAll(TEX_TOKEN)].map(([source]) => ({ kind: source.startsWith('\\') ? 'command' : 'text', source }));
}

const ENVIRONMENT_NAME = /^\s*\{([^{}]*)\}/;

/**
 * Keep allowed commands; replace every other command, ^^ and comment by a space (a space, so that
 * what is left can never join into a new command name: "\in\@put" must not become "\input").
 */
function filterTokens(math: string, removed: Set<string>): string[] {
  const kept: Token[] = [];
  for (const token of tokenize(math)) {
    if (token.source.startsWith('%')) kept.push({ kind: 'text', source: ' ' });
    else if (token.source === '^^' || (token.kind === 'command' && !SAFE_COMMANDS.has(token.source) && !SAFE_SYMBOLS.has(token.source))) {
      removed.add(token.source);
      kept.push({ kind: 'text', source: ' ' });
    } else kept.push(token);
  }
  // \begin and \end only directly before the name of an allowed environment (never {document}).
  return kept.map((token, index) => {
    if (token.source !== '\\begin' && token.source !== '\\end') return token.source;
    const next = kept[index + 1];
    const name = next?.kind === 'text' ? ENVIRONMENT_NAME.exec(next.source)?.[1] : undefined;
    if (name !== undefined && SAFE_ENVIRONMENTS.has(name)) return token.source;
    removed.add(name === undefined ? token.source : `${token.source}{${name}}`);
    return ' ';
  });
}

/** Characters of formulas one export may have KaTeX parse (a long notebook has about 20 000). */
export const KATEX_BUDGET = 60_000;
/** Formulas one export typesets (a long notebook has a few hundred). */
export const MAX_FORMULAS = 20_000;
/** KaTeX's fixed cost per formula, in characters. */
const KATEX_COST_PER_FORMULA = 50;

type ParseTree = (source: string, options: katex.KatexOptions) => unknown;
/** KaTeX's parser without the HTML rendering (ten times cheaper); renderToString where a build lacks it. */
const katexParse: ParseTree =
  (katex as unknown as { __parse?: ParseTree }).__parse ?? ((source, options) => katex.renderToString(source, options));

function katexReads(math: string, displayMode: boolean): boolean {
  try {
    katexParse(math, { displayMode, throwOnError: true, strict: 'ignore', trust: false, maxExpand: 1000, macros: {} });
    return true;
  } catch {
    return false; // a parse error, or a stack overflow on absurd nesting
  }
}

/** Braces, environments and \left/\right pair up, and no # is left over: what TeX needs to stay in step. */
function structurallyBalanced(math: string): boolean {
  const open: string[] = [];
  let delimiters = 0;
  const tokens = tokenize(math);
  for (const [index, { kind, source }] of tokens.entries()) {
    if (kind === 'text') {
      if (source.includes('#')) return false;
      for (const char of source) {
        if (char === '{') open.push('{');
        else if (char === '}' && open.pop() !== '{') return false;
      }
    } else if (source === '\\left') delimiters += 1;
    else if (source === '\\right' && --delimiters < 0) return false;
    else if (source === '\\begin' || source === '\\end') {
      const next = tokens[index + 1];
      const name = next && ENVIRONMENT_NAME.exec(next.source)?.[1];
      if (!name) return false;
      if (source === '\\begin') open.push(`env:${name}`);
      else if (open.pop() !== `env:${name}`) return false;
      tokens[index + 1] = { kind: 'text', source: next.source.replace(ENVIRONMENT_NAME, '') };
    }
  }
  return open.length === 0 && delimiters === 0;
}

/** Filters the formulas of one export, keeping its report, its KaTeX budget and the answers already given. */
export class FormulaFilter {
  readonly report = new TexSafetyReport();
  private katexBudget = KATEX_BUDGET;
  private formulasLeft = MAX_FORMULAS;
  private readonly answers = new Map<string, { math: string | null; removed: Set<string> }>();

  /**
   * The formula as it may appear in the export, or null when what is left cannot be typeset (the
   * caller then prints the source as text). Removals are recorded in the report.
   */
  safe(source: string, displayMode: boolean): string | null {
    if (this.exhausted) return null;
    this.formulasLeft -= 1;
    const key = `${displayMode ? 'display' : 'inline'}:${source}`;
    let answer = this.answers.get(key);
    if (!answer) {
      const removed = new Set<string>();
      const math = filterTokens(withoutControlCharacters(source), removed).join('');
      answer = { math: math.trim() !== '' && this.typesets(math, displayMode) ? math : null, removed };
      this.answers.set(key, answer);
    }
    if (answer.removed.size) {
      this.report.formulasWithRemovals += 1;
      for (const name of answer.removed) this.report.removedCommands.add(name);
    }
    if (answer.math === null) this.report.formulasAsText += 1;
    return answer.math;
  }

  /** Once true, callers print the rest of the document's text without looking for formulas. */
  get exhausted(): boolean {
    if (this.formulasLeft > 0) return false;
    this.report.formulasOverLimit = 1;
    return true;
  }

  private typesets(math: string, displayMode: boolean): boolean {
    const cost = math.length + KATEX_COST_PER_FORMULA;
    if (cost > this.katexBudget) return structurallyBalanced(math);
    this.katexBudget -= cost;
    return katexReads(math, displayMode);
  }
}
