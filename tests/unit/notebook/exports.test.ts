import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { escapeLatexText, notebookDocument, toLatexDocument, toNotebookDocument } from '../../../shared/notebook/exports';
import { jobForCell, type SetupInput } from '../../../shared/notebook/jobs';
import type { CellInput } from '../../../shared/notebook/cells';

const params: SetupInput = { kind: 'setup', model: { preset: 'on', N: 3 }, d: '3', s: '1.5', loops: 2, digits: 30 };
const cells = [
  { label: 'intro', input: { kind: 'note' as const, text: '# Invented check\nThe bubble at $s = 3/2$, 100% by hand & machine:\n$$G(a,b) = \\frac{\\Gamma(d/2-a)}{\\Gamma(a)}$$' }, output: null },
  { label: 'params', input: params, output: null },
  {
    label: 'bubble',
    input: { kind: 'integral' as const, uses: 'params', form: 'bubble' as const, a: 's/2', b: 's/2', d: '2*s-eps', order: 1 },
    output: { lowest: -1, order: 1, coeffs: ['2.2567', '1.8815', '1.6276'] },
  },
];

describe('notebook JSON file', () => {
  test('an exported document validates and round-trips unchanged through JSON text', () => {
    const document = toNotebookDocument('Invented O(3) check', 'invented scenario', cells, new Date('2026-01-01T00:00:00Z'));
    const reread = notebookDocument.parse(JSON.parse(JSON.stringify(document)));
    assert.deepEqual(reread, document);
  });

  test('files of another format or version, or with repeated labels, are refused with a clear message', () => {
    const document = toNotebookDocument('x', '', cells, new Date());
    assert.match(notebookDocument.safeParse({ ...document, format: 'other' }).error!.issues[0].message, /Not a Rungbook notebook file/);
    assert.match(notebookDocument.safeParse({ ...document, formatVersion: 2 }).error!.issues[0].message, /Unsupported notebook file version/);
    assert.match(notebookDocument.safeParse({ ...document, cells: [document.cells[1], document.cells[1]] }).error!.issues[0].message, /share a label/);
  });
});

describe('LaTeX export', () => {
  const tex = toLatexDocument(toNotebookDocument('Invented O(3) check', '', cells, new Date()));

  test('is a complete document with the title', () => {
    assert.match(tex, /^\\documentclass\[10pt\]\{article\}/);
    assert.match(tex, /\\title\{Invented O\(3\) check\}/);
    assert.match(tex, /\\end\{document\}\n$/);
  });

  test('keeps note mathematics as mathematics and escapes LaTeX specials in prose (LaTeX2e special characters: # $ % & _ { } ~ ^ \\)', () => {
    assert.match(tex, /\$s = 3\/2\$/);
    assert.match(tex, /\\\[G\(a,b\) = \\frac\{\\Gamma\(d\/2-a\)\}\{\\Gamma\(a\)\}\\\]/);
    assert.match(tex, /100\\% by hand \\& machine/);
    assert.equal(escapeLatexText('a_b^c~{d}#$'), 'a\\_b\\^{}c\\~{}\\{d\\}\\#\\$');
  });

  test('writes a series result as an equation with its truncation order', () => {
    assert.match(tex, /I &= 2\.2567\\,\\varepsilon\^\{-1\} \+ 1\.8815 \+ 1\.6276\\,\\varepsilon \+ O\(\\varepsilon\^\{2\}\)/);
  });
});

describe('cell → engine job', () => {
  const setups = new Map<string, SetupInput>([['params', params]]);

  test('an integral cell takes s and digits from its setup cell', () => {
    assert.deepEqual(jobForCell(cells[2].input, setups), { job: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1, at: { s: '1.5' }, digits: 30 });
  });

  test('an exponents cell builds the exponents job of the engine contract', () => {
    assert.deepEqual(jobForCell({ kind: 'exponents', uses: 'params' }, setups), { job: 'exponents', model: { preset: 'on', N: 3 }, loops: 2, digits: 30, d: '3', s: '1.5' });
  });

  test('a reference to a missing setup is a field error, never an engine call', () => {
    assert.throws(() => jobForCell({ kind: 'flow', uses: 'nope' }, setups), /no model & parameters cell labelled "nope"/);
  });
});

describe('LaTeX export of results', () => {
  const doc = (label: string, input: CellInput, output: unknown) => toLatexDocument(toNotebookDocument('t', '', [{ label, input, output }], new Date()));
  const params: CellInput = { kind: 'exponents', uses: 'params' };

  test('Markdown headings become unnumbered sections by level, with mathematics inside kept as mathematics', () => {
    const tex = doc('n', { kind: 'note', text: '# The bubble at $s = 3/2$\nbody\n## Next' }, null);
    assert.match(tex, /\\section\*\{The bubble at \$s = 3\/2\$\}\nbody\n\\subsection\*\{Next\}/);
    assert.doesNotMatch(tex, /\\#/);
  });

  test('exponent series are aligned equations with their truncation order, exact coefficients as fractions; values a booktabs table', () => {
    const tex = doc('e', params, { eps: '0.5', fixedPoint: 'Ising', series: { nuInv: ['1.75', '-0.3333', '-0.142'] }, values: { nuInv: '1.5478' } });
    // 1.75 = 7/4 exactly; -0.3333 is a decimal of its own (3333/10000 has a denominator over 1000)
    assert.match(tex, /1\/\\nu &= \\frac\{7\}\{4\} - 0\.3333\\,\\varepsilon - 0\.142\\,\\varepsilon\^\{2\} \+ O\(\\varepsilon\^\{3\}\)/);
    assert.match(tex, /\\begin\{align\*\}/);
    assert.match(tex, /\$1\/\\nu\$ & \$1\.5478\$ & -- \\\\/);
    assert.match(tex, /\\toprule/);
  });

  test('with digits chosen, series are rounded and no fraction is written', () => {
    const tex = toLatexDocument(toNotebookDocument('t', '', [{ label: 'e', input: params, output: { series: { nuInv: ['1.75', '-0.45454545454545454545'] } } }], new Date()), { digits: 4 });
    assert.match(tex, /1\/\\nu &= 1\.75 - 0\.4545\\,\\varepsilon \+ O\(\\varepsilon\^\{2\}\)/);
  });

  test('β-functions and fixed points are equations, scans a table; engine text is made ASCII TeX', () => {
    const flow = doc('f', { kind: 'flow', uses: 'params' }, { beta: { u: [{ monomial: 'eps*u', coeff: '-1' }, { monomial: 'u^2', coeff: '3' }] }, checks: ['1/ε² poles match'] });
    assert.match(flow, /\\beta_\{u\} &= -\\varepsilon\\,u \+ 3\\,u\^\{2\}/);
    assert.match(flow, /1\/\\ensuremath\{\\varepsilon\}\\textsuperscript\{2\} poles match/);
    const fixed = doc('p', { kind: 'fixedpoints', uses: 'params' }, { fixedPoints: [{ name: 'Ising', status: 'real', couplings: { u: { series: ['0', '0.5'], value: '0.1' } }, stability: { values: ['0.4'] }, stable: true }] });
    assert.match(fixed, /\\paragraph\{Ising\} \(IR-stable\)/);
    assert.match(fixed, /u_\* &= \\frac\{1\}\{2\}\\,\\varepsilon \+ O\(\\varepsilon\^\{2\}\)/);
    assert.match(fixed, /\\lambda_\{1\} &= \\frac\{2\}\{5\}/);
    const scan = doc('s', { kind: 'scan', uses: 'params', from: '1.5', to: '1.9', points: 2, quantities: ['nuInv'] }, { quantities: ['nuInv'], marks: { sStar: '1.96' }, points: [{ s: '1.5', values: { nuInv: '1.5' }, flagged: true, regime: 'mean-field' }] });
    assert.match(scan, /\$1\.5\$ & \$1\.5\$ & mean-field \\\\/);
    assert.match(scan, /\$s\^\* = 1\.96\$/);
    // pdflatex with its default fonts reads ASCII only outside mathematics (LaTeX2e input encoding, common practice).
    for (const tex of [flow, fixed, scan]) assert.doesNotMatch(tex.replace(/\\usepackage\[utf8\]\{inputenc\}/, ''), /[^\x00-\x7f]/);
  });
});
