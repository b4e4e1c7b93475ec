import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import { demoNotebook } from '../../../server/seed/demo';
import type { CellInput } from '../../../shared/notebook/cells';
import { toLatexDocument, toNotebookDocument, type NotebookDocument } from '../../../shared/notebook/exports';
import { KATEX_BUDGET, MAX_FORMULAS } from '../../../shared/notebook/latexSafety';

/**
 * TeX primitives and LaTeX commands that read or write files, run programs, or change how TeX reads
 * its input (TeXbook ch. 20–21 and appendix B; LaTeX2e source for \input, \include, \usepackage).
 */
const DANGEROUS = [
  'input', 'include', 'InputIfFileExists', 'IfFileExists', 'openin', 'openout', 'read', 'readline', 'write', 'immediate', 'closein', 'closeout',
  'catcode', 'csname', 'endcsname', 'def', 'edef', 'gdef', 'xdef', 'let', 'futurelet', 'newcommand', 'renewcommand', 'providecommand',
  'special', 'usepackage', 'RequirePackage', 'documentclass', 'makeatletter', 'string', 'expandafter', 'lowercase', 'uppercase',
  'scantokens', 'everyeof', 'shipout', 'jobname', 'message', 'typeout', 'errmessage', 'includegraphics', 'href', 'url', 'verb', 'label',
];
const DANGEROUS_PATTERN = new RegExp(`\\\\(${DANGEROUS.join('|')})(?![a-zA-Z])`);

/** What the hostile notebook tries, in every place a person can type text. `{dir}` is replaced by an absolute directory. */
const HOSTILE_FORMULAS = [
  '\\input{secret}',
  '\\input{{dir}/secret}',
  '\\include{secret}',
  '\\openin5=secret \\read5 to\\x',
  '\\immediate\\openout5=pwned.tex \\immediate\\write5{owned}',
  '\\immediate\\openout5={dir}/pwned.tex \\immediate\\write5{owned}',
  '\\write18{touch shell-ran}',
  '\\catcode`\\^=12',
  '\\csname input\\endcsname{secret}',
  '\\def\\x{\\input{secret}}\\x',
  '\\let\\x=\\input \\x{secret}',
  '\\newcommand{\\x}{\\input{secret}}\\x',
  '\\end{document}',
  '\\special{ps: x}',
  '\\usepackage{shellesc}',
  '\\documentclass{article}',
  '\\makeatletter',
  'x^^5cinput{secret}',
  '\\string\\input',
  '\\expandafter\\input\\expandafter{secret}',
  '\\lowercase{\\INPUT{secret}}',
  '\\uppercase{\\input{secret}}',
  '\\scantokens{\\input{secret}}',
  '\\in\\@put{secret}',
  '\\text{\\input{secret}}',
  '\\begin{array}{@{\\input{secret}}c} a \\end{array}',
  '\\mathrm{\\write18{touch shell-ran}}',
  '\\frac{\\input{secret}}{2}',
];

const HOSTILE_TEXT = 'Plain words: \\input{secret} ^^5cinput{secret} \\catcode`\\^^M=13 % a comment \\end{document} \\write18{touch shell-ran} \\verb|x| \\\\';

function hostileDocument(dir: string): NotebookDocument {
  const formulas = HOSTILE_FORMULAS.map((f) => f.replaceAll('{dir}', dir));
  const note = [
    `# Heading ${HOSTILE_TEXT} $${formulas[0]}$`,
    HOSTILE_TEXT,
    ...formulas.map((f) => `Inline $${f}$ and display:\n$$${f}$$`),
  ].join('\n\n');
  const cells = [
    { label: 'intro', input: { kind: 'note', text: note } as CellInput, output: null },
    // Labels and setup strings cannot hold these through the API schemas; the writer escapes them anyway.
    { label: 'x\\input{secret}', input: { kind: 'setup', model: { preset: 'custom', potential: '\\input{secret}' }, d: '\\write18{touch shell-ran}', s: '1.5', loops: 2, digits: 30 } as unknown as CellInput, output: { error: { message: '\\input{secret}' } } },
    { label: 'series', input: { kind: 'exponents', uses: 'params' } as CellInput, output: { lowest: 0, coeffs: ['\\input{secret}', '1'] } },
    { label: 'shape', input: { kind: 'exponents', uses: 'params' } as CellInput, output: { unknown: 'x\\end{verbatim}\\input{secret}' } },
  ];
  return { ...toNotebookDocument(`Title \\input{secret} ^^5c`, `Summary \\write18{touch shell-ran} \\end{document}`, [], new Date()), cells } as NotebookDocument;
}

/** The export without the comment lines it writes itself (they name what was removed). */
const withoutOwnComments = (tex: string) => tex.replace(/^% Export note: .*$/m, '');
/** From \\begin{document} on: everything that comes from the notebook. */
const documentPart = (tex: string) => tex.slice(tex.indexOf('\\begin{document}'));

describe('LaTeX export of a notebook someone else wrote', () => {
  const tex = toLatexDocument(hostileDocument('/nonexistent'));
  const body = withoutOwnComments(tex);

  test('no file, shell or catcode primitive survives as a control sequence, in notes, formulas, titles, labels or inputs', () => {
    const found = documentPart(body).match(new RegExp(DANGEROUS_PATTERN.source, 'g'));
    assert.equal(found, null, `control sequences left in the export: ${found?.join(' ')}`);
    assert.doesNotMatch(body, /\^\^/, '^^ notation (^^5c is a backslash to TeX) must not survive');
  });

  test('the preamble is ours alone (title escaped), and \\end{document} comes once, at the end', () => {
    const preamble = body.slice(0, body.indexOf('\\begin{document}')).split('\n').filter(Boolean);
    assert.deepEqual(preamble.filter((line) => !line.startsWith('% Export note')), [
      '\\documentclass[10pt]{article}',
      '\\usepackage[a4paper,margin=2.5cm]{geometry}',
      '\\usepackage{amsmath,amssymb,booktabs,longtable}',
      '\\usepackage[utf8]{inputenc}',
      '\\allowdisplaybreaks',
      '\\setlength{\\parindent}{0pt}',
      '\\setlength{\\parskip}{0.5\\baselineskip}',
      '\\renewcommand{\\labelitemi}{$\\bullet$}',
      '\\title{Title \\textbackslash{}input\\{secret\\} \\^{}\\^{}5c}',
      '\\date{}',
    ]);
    assert.equal(body.match(/\\end\{document\}/g)?.length, 1);
    assert.match(body, /\\end\{document\}\n$/);
  });

  test('says what it removed: a comment line and a visible note', () => {
    // Every hostile formula appears twice (inline and display) plus once in the heading and once as the series coefficient.
    assert.match(tex, /^% Export note: \d+ formulas contained commands that were removed: .*\\input/m);
    assert.match(body, /\\emph\{Export note: \d+ formulas contained commands that were removed: .*\\textbackslash\{\}input/);
    const count = Number(/^% Export note: (\d+) formulas/m.exec(tex)?.[1]);
    assert.ok(count >= HOSTILE_FORMULAS.length * 2, `counted ${count} formulas with removals`);
  });

  test('commands cannot be assembled from pieces left over after a removal ("\\in\\@put" is not "\\input")', () => {
    const tex = toLatexDocument(toNotebookDocument('t', '', [{ label: 'n', input: { kind: 'note', text: '$\\in\\@put{x}$ $\\alpha\\@beta$' }, output: null }], new Date()));
    assert.doesNotMatch(withoutOwnComments(tex), /\\input|\\alphabeta/);
    assert.match(tex, /\$\\in +put\{x\}\$/);
  });
});

describe('LaTeX export of raw characters', () => {
  test('control characters and the private characters the writer marks headings with are dropped from notes', () => {
    const text = 'a\uE000b\uE001c\u0001d\u0002e\u007f\r\n# Heading';
    const tex = toLatexDocument(toNotebookDocument('t', '', [{ label: 'n', input: { kind: 'note', text }, output: null }], new Date()));
    assert.deepEqual(tex.match(/\\section\*\{[^}]*\}/g), ['\\section*{Heading}']);
    assert.match(tex, /^abcde\n\\section\*/m);
    assert.doesNotMatch(tex, /[\x00-\x08\x0b-\x1f\x7f\uE000\uE001]/);
  });
});

describe('LaTeX export keeps the mathematics people write', () => {
  const demo = toNotebookDocument(demoNotebook.title, demoNotebook.summary, demoNotebook.cells.map((c) => ({ ...c, output: null })), new Date());
  const tex = toLatexDocument(demo);

  test('the demo notebook formulas come through unchanged, with no export note', () => {
    // The three formulas exactly as typed in server/seed/demo.ts.
    assert.ok(tex.includes('$(-\\partial^2)^{s/2}$'));
    assert.ok(tex.includes('$\\varepsilon = 2s - d$'));
    assert.ok(tex.includes('\\[G(a,b) = \\frac{\\Gamma(d/2-a)\\,\\Gamma(d/2-b)\\,\\Gamma(a+b-d/2)}{\\Gamma(a)\\,\\Gamma(b)\\,\\Gamma(d-a-b)}\\]'));
    assert.doesNotMatch(tex, /Export note/);
  });

  test('environments, fonts, accents, big operators and spacing from KaTeX\'s supported list are kept', () => {
    const formulas = [
      '\\begin{pmatrix} a & b \\\\ c & d \\end{pmatrix}',
      '\\begin{aligned} x &= 1 \\\\ y &= 2 \\end{aligned}',
      '\\mathbb{R}^{d} \\ni \\vec{x}, \\hat{p}, \\mathcal{O}(\\varepsilon^{3})',
      '\\sum_{k=0}^{\\infty} \\int_0^1 \\mathrm{d}x\\, \\sqrt[3]{x} \\quad \\left( \\tfrac{1}{2} \\right)',
      '\\text{for } s > d/2, \\; \\nu^{-1} \\approx 2 - \\eta',
    ];
    const tex = toLatexDocument(toNotebookDocument('t', '', [{ label: 'n', input: { kind: 'note', text: formulas.map((f) => `$$${f}$$`).join('\n') }, output: null }], new Date()));
    for (const formula of formulas) assert.ok(tex.includes(`\\[${formula}\\]`), formula);
    assert.doesNotMatch(tex, /Export note/);
  });

  test('a formula KaTeX cannot read is printed as escaped text and counted', () => {
    const tex = toLatexDocument(toNotebookDocument('t', '', [{ label: 'n', input: { kind: 'note', text: 'broken $\\frac{1}{$ here' }, output: null }], new Date()));
    assert.match(tex, /\\texttt\{\\textbackslash\{\}frac\\\{1\\\}\\\{\}/);
    assert.match(tex, /1 formula that KaTeX cannot read was printed as text/);
  });
});

describe('LaTeX export of a very long notebook (its cost is bounded before it starts)', () => {
  const noteCells = (texts: string[]) => texts.map((text, i) => ({ label: `n${i}`, input: { kind: 'note' as const, text }, output: null }));

  test('past the KaTeX budget, formulas are still filtered, kept when balanced and printed as text when not', () => {
    const filler = Array.from({ length: Math.ceil(KATEX_BUDGET / 100) + 10 }, (_, k) => `$x_{${k}} = ${'a+'.repeat(45)}b$`).join(' ');
    const late = 'Late: $\\frac{1}{2}$, $\\input{secret}\\alpha$, $\\frac{1}{$, $\\begin{pmatrix} a \\end{bmatrix}$ and $\\left( x$.';
    const tex = toLatexDocument(toNotebookDocument('t', '', noteCells([filler, late]), new Date()));
    const body = withoutOwnComments(tex);
    assert.match(body, /Late: \$\\frac\{1\}\{2\}\$, \$ +\{secret\}\\alpha\$/);
    assert.doesNotMatch(documentPart(body), DANGEROUS_PATTERN);
    assert.match(body, /\\texttt\{\\textbackslash\{\}frac\\\{1\\\}\\\{\}/);
    assert.match(body, /\\texttt\{\\textbackslash\{\}begin\\\{pmatrix\\\} a \\textbackslash\{\}end\\\{bmatrix\\\}\}/);
    assert.match(body, /\\texttt\{\\textbackslash\{\}left\( x\}/);
    assert.match(tex, /3 formulas that KaTeX cannot read were printed as text/);
  });

  test(`past ${MAX_FORMULAS} formulas, the rest of the text is printed escaped, and the note says so`, () => {
    const many = Array.from({ length: Math.ceil(MAX_FORMULAS / 1000) }, () => '$x$ '.repeat(1000));
    const tex = toLatexDocument(toNotebookDocument('t', '', noteCells([...many, 'After: $\\input{secret}$ $\\frac{1}{2}$']), new Date()));
    assert.match(tex, /After: \\\$\\textbackslash\{\}input\\\{secret\\\}\\\$ \\\$\\textbackslash\{\}frac/);
    assert.doesNotMatch(documentPart(tex), DANGEROUS_PATTERN);
    assert.match(tex, new RegExp(`Text after the first ${MAX_FORMULAS} formulas was printed without typesetting its mathematics`));
  });
});

/** pdflatex from Debian's texlive-latex-base. A missing one fails the test: tests never install system packages. */
function pdflatex(): string {
  const found = spawnSync('sh', ['-c', 'command -v pdflatex']).stdout.toString().trim();
  if (!found) throw new Error("pdflatex is missing: install Debian's texlive-latex-base (apt-get install texlive-latex-base); .ci/run does this");
  return found;
}

/** Compile in `dir` with shell escape off and kpathsea's paranoid file access, as a careful collaborator would. */
function compile(dir: string, tex: string) {
  fs.writeFileSync(path.join(dir, 'notebook.tex'), tex);
  const run = spawnSync(pdflatex(), ['-no-shell-escape', '-interaction=nonstopmode', '-halt-on-error', 'notebook.tex'], {
    cwd: dir,
    encoding: 'utf8',
    timeout: 60_000,
    env: { ...process.env, openin_any: 'p', openout_any: 'p', shell_escape: 'f' },
  });
  const log = fs.existsSync(path.join(dir, 'notebook.log')) ? fs.readFileSync(path.join(dir, 'notebook.log'), 'latin1') : '';
  return { status: run.status, log, errors: run.stdout.split('\n').filter((line) => line.startsWith('!')).join('\n') };
}

describe('a hostile notebook compiled with pdflatex (a real TeX engine is the judge)', () => {
  let dir: string;
  let outside: string;
  before(() => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-tex-safety-'));
    outside = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-tex-outside-'));
    // Sentinels TeX may read even under paranoid settings (same directory), and one outside it.
    for (const where of [dir, outside]) fs.writeFileSync(path.join(where, 'secret.tex'), '\\typeout{SENTINEL-READ}SENTINEL-READ\n');
  });
  after(() => {
    fs.rmSync(dir, { recursive: true, force: true });
    fs.rmSync(outside, { recursive: true, force: true });
  });

  const untouched = (where: string) => ['pwned.tex', 'shell-ran', 'owned'].filter((name) => fs.existsSync(path.join(where, name)));

  test('the sentinel check itself notices a file being read and written (control: unfiltered TeX)', () => {
    const control = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-tex-control-'));
    fs.copyFileSync(path.join(dir, 'secret.tex'), path.join(control, 'secret.tex'));
    const result = compile(control, '\\documentclass{article}\\begin{document}\\input{secret}\\immediate\\openout5=pwned.tex \\immediate\\write5{x}\\end{document}\n');
    assert.match(result.log, /SENTINEL-READ/);
    assert.deepEqual(untouched(control), ['pwned.tex']);
    fs.rmSync(control, { recursive: true, force: true });
  });

  test('compiles, reads no sentinel and writes no file, in its directory or outside', () => {
    const result = compile(dir, toLatexDocument(hostileDocument(outside)));
    assert.equal(result.status, 0, result.errors || result.log.slice(-2000));
    assert.doesNotMatch(result.log, /SENTINEL-READ|secret\.tex/);
    assert.deepEqual(untouched(dir), []);
    assert.deepEqual(untouched(outside), []);
    assert.ok(fs.statSync(path.join(dir, 'notebook.pdf')).size > 5_000);
  });

  test('the demo notebook (notes and inputs) compiles without an export note', () => {
    const demo = toNotebookDocument(demoNotebook.title, demoNotebook.summary, demoNotebook.cells.map((c) => ({ ...c, output: null })), new Date());
    const result = compile(dir, toLatexDocument(demo));
    assert.equal(result.status, 0, result.errors || result.log.slice(-2000));
  });
});
