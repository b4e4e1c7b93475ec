import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { test } from 'node:test';
import { runJob } from '../../../shared/jobs';
import type { CellInput } from '../../../shared/notebook/cells';
import { toLatexDocument, toNotebookDocument } from '../../../shared/notebook/exports';
import { jobForCell, type SetupInput } from '../../../shared/notebook/jobs';

/** pdflatex from Debian's texlive-latex-base. A missing one fails the test: tests never install system packages. */
function pdflatex(): string {
  const found = spawnSync('sh', ['-c', 'command -v pdflatex']).stdout.toString().trim();
  if (!found) throw new Error("pdflatex is missing: install Debian's texlive-latex-base (apt-get install texlive-latex-base); .ci/run does this");
  return found;
}

test('the LaTeX export of a computed notebook compiles with pdflatex (a real TeX engine is the judge)', () => {
  const setup: SetupInput = { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 15 };
  const setups = new Map([['params', setup]]);
  const inputs: { label: string; input: CellInput }[] = [
    { label: 'intro', input: { kind: 'note', text: '# Invented check of $1/\\nu$\nSome prose with 100% & an_underscore.\n$$\\varepsilon = 2s - d$$' } },
    { label: 'params', input: setup },
    { label: 'bubble', input: { kind: 'integral', uses: 'params', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 } },
    { label: 'flow', input: { kind: 'flow', uses: 'params' } },
    { label: 'fixed', input: { kind: 'fixedpoints', uses: 'params' } },
    { label: 'exps', input: { kind: 'exponents', uses: 'params' } },
    { label: 'scan', input: { kind: 'scan', uses: 'params', from: '1.55', to: '1.95', points: 5, quantities: ['nuInv', 'omega'], deltaSigmaShortRange: '0.5181489' } },
  ];
  const cells = inputs.map(({ label, input }) => {
    const job = jobForCell(input, setups);
    return { label, input, output: job ? runJob(job) : null };
  });
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-tex-'));
  const tex = toLatexDocument(toNotebookDocument('Invented check (demo)', 'invented scenario', cells, new Date()));
  // Everything the engine writes is ordinary mathematics: the safety filter removes nothing from it.
  assert.doesNotMatch(tex, /Export note/);
  fs.writeFileSync(path.join(dir, 'notebook.tex'), tex);
  const run = spawnSync(pdflatex(), ['-interaction=nonstopmode', '-halt-on-error', 'notebook.tex'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
  assert.equal(run.status, 0, run.stdout.split('\n').filter((line) => line.startsWith('!')).join('\n') || run.stdout.slice(-2000));
  assert.ok(fs.statSync(path.join(dir, 'notebook.pdf')).size > 10_000);
  fs.rmSync(dir, { recursive: true, force: true });
});
