import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, test } from 'node:test';
import { runJob } from '../../../shared/jobs';
import type { CellInput } from '../../../shared/notebook/cells';
import { extractPoints, readTable } from '../../../shared/notebook/datasetParsing';
import type { ExportedDataset } from '../../../shared/notebook/datasets';
import { toLatexDocument, toNotebookDocument, type ExportableCell, type LatexExportOptions } from '../../../shared/notebook/exports';
import { jobForCell, type DatasetForJob, type SetupInput } from '../../../shared/notebook/jobs';
import { demoDatasets } from '../../../server/seed/demoDatasets';
import { demoNotebook } from '../../../server/seed/demo';

/** A TeX tool from Debian's TeX Live. A missing one fails the test: tests never install system packages. */
function texTool(name: string, debianPackage: string): string {
  const found = spawnSync('sh', ['-c', `command -v ${name}`]).stdout.toString().trim();
  if (!found) throw new Error(`${name} is missing: install Debian's ${debianPackage} (apt-get install ${debianPackage}); .ci/run does this`);
  return found;
}

/** The demo notebook as the seed builds it (server/seed/demo.ts), its datasets read as a paste reads them, every cell run. */
function demoCells(): { cells: ExportableCell[]; datasets: ExportedDataset[] } {
  const datasets = demoDatasets.map(({ description, text, fileName }): ExportedDataset => {
    const { points } = extractPoints(readTable(text, { header: description.header, fileName }), description);
    return { label: description.label, name: description.name, source: description.source, note: description.note ?? '', shape: description.shape, xAxis: description.xAxis, yAxis: description.yAxis, points };
  });
  const forJobs = new Map(datasets.map((d): [string, DatasetForJob] => [d.label, { label: d.label, shape: d.shape, xAxis: d.xAxis, yAxis: d.yAxis, points: d.points, contentHash: 'demo' }]));
  const inputs = new Map<string, CellInput>(demoNotebook.cells.map((c) => [c.label, c.input]));
  const setups = new Map(demoNotebook.cells.flatMap((c) => (c.input.kind === 'setup' ? [[c.label, c.input as SetupInput] as const] : [])));
  const cells = demoNotebook.cells.map(({ label, input }) => {
    const job = jobForCell(input, setups, { cells: inputs, datasets: forJobs });
    return { label, input, output: job ? runJob(job) : null };
  });
  return { cells, datasets };
}

/** pdflatex run twice (the figure reference), in a fresh directory; returns the directory and the log. */
function compile(tex: string): { dir: string; log: string } {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-demo-tex-'));
  fs.writeFileSync(path.join(dir, 'demo.tex'), tex);
  for (let run = 0; run < 2; run++) {
    const result = spawnSync(texTool('pdflatex', 'texlive-latex-base'), ['-interaction=nonstopmode', '-halt-on-error', 'demo.tex'], { cwd: dir, encoding: 'utf8', timeout: 120_000 });
    assert.equal(result.status, 0, result.stdout.split('\n').filter((line) => line.startsWith('!')).join('\n') || result.stdout.slice(-2000));
  }
  return { dir, log: fs.readFileSync(path.join(dir, 'demo.log'), 'latin1') };
}

/** What TeX says about the page: no overfull line, no character the font lacks, no error, no unresolved reference. */
function assertCleanLog(log: string): void {
  const around = (pattern: RegExp) => log.split('\n').filter((line) => pattern.test(line)).slice(0, 5).join('\n');
  assert.ok(!/Overfull \\hbox/.test(log), around(/Overfull/));
  assert.ok(!/Missing character/.test(log), around(/Missing character/));
  assert.ok(!/^! /m.test(log), around(/^! /));
  assert.ok(!/LaTeX Warning: (Reference|There were undefined)/.test(log), around(/LaTeX Warning/));
}

/** The first page as a PNG for a person to look at (poppler-utils' pdftoppm; skipped with a message when absent). */
function savePageOne(dir: string, name: string): void {
  const pdftoppm = spawnSync('sh', ['-c', 'command -v pdftoppm']).stdout.toString().trim();
  if (!pdftoppm) {
    console.log('pdftoppm (Debian poppler-utils) is missing: the first-page PNG artifact is skipped');
    return;
  }
  const target = path.join('test-artifacts', 'latex');
  fs.mkdirSync(target, { recursive: true });
  const result = spawnSync(pdftoppm, ['-png', '-r', '110', '-f', '1', '-l', '1', '-singlefile', path.join(dir, 'demo.pdf'), path.join(target, name)], { encoding: 'utf8' });
  assert.equal(result.status, 0, result.stderr);
}

describe('the LaTeX export of the demo notebook (pdflatex is the judge)', () => {
  const demo = demoCells();
  const exportOf = (options?: LatexExportOptions) =>
    toLatexDocument({ ...toNotebookDocument(demoNotebook.title, demoNotebook.summary, demo.cells, new Date('2026-01-01T00:00:00Z')), datasets: demo.datasets }, options);

  test('with exact coefficients and all digits: compiles with no overfull line, missing character or error', () => {
    const tex = exportOf();
    assert.doesNotMatch(tex, /Export note/, 'everything the engine writes passes the safety filter untouched');
    assert.doesNotMatch(tex, /\{"/, 'no JSON anywhere');
    // the O(N) action of docs/physics.md §1, with λ_abcd = λ(δδ + δδ + δδ)/3 summed: (λ/4!)(φ_aφ_a)²
    assert.ok(tex.includes('\\frac{\\lambda}{4!}\\,(\\phi_a\\phi_a)^2'));
    // β(u) = −εu + (N + 8)/3 u² + … (docs/physics.md §5), N = 3: 11/3, as a fraction; u* = 3ε/(N + 8) = 3ε/11
    assert.match(tex, /\\beta_\{u\} &= -\\varepsilon\\,u \+ \\frac\{11\}\{3\}\\,u\^\{2\}/);
    assert.match(tex, /u_\* &= \\frac\{3\}\{11\}\\,\\varepsilon/);
    assert.match(tex, /1\\,a_1\^\{\(u\)\}\\big\|_\{u\^\{2\}\} &= \\frac\{11\}\{3\}/, 'the trail assembles into the one-loop β coefficient');
    // the two-loop β coefficient assembled from the trail's pole parts equals the flow job's own (to its last digit but one)
    const flow = demo.cells.find((c) => c.label === 'flow')!.output as { beta: { u: { monomial: string; coeff: string }[] } };
    const fromFlow = Number(flow.beta.u.find((t) => t.monomial === 'u^3')!.coeff);
    const fromTrail = Number(/2\\,a_1\^\{\(u\)\}\\big\|_\{u\^\{3\}\} &= (-?[\d.]+)/.exec(tex)![1]);
    assert.ok(Math.abs(fromTrail - fromFlow) < 1e-14 * Math.abs(fromFlow), `${fromTrail} vs ${fromFlow}`);
    const { dir, log } = compile(tex);
    assertCleanLog(log);
    assert.ok(fs.statSync(path.join(dir, 'demo.pdf')).size > 20_000);
    savePageOne(dir, 'demo-page1');
    fs.rmSync(dir, { recursive: true, force: true });
  });

  test('rounded to 6 digits without fractions: compiles as cleanly', () => {
    const tex = exportOf({ digits: 6 });
    // u* = 3ε/(N + 8) at one loop (docs/physics.md §5), N = 3: 3/11 = 0.272727… → 0.272727 at 6 digits
    assert.match(tex, /u_\* &= 0\.272727\\,\\varepsilon/);
    const { dir, log } = compile(tex);
    assertCleanLog(log);
    fs.rmSync(dir, { recursive: true, force: true });
  });
});
