import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { test } from 'node:test';
import Papa from 'papaparse';
import { runJob } from '../../../shared/jobs';
import type { CompareResult } from '../../../shared/jobs/contract';
import type { CellInput } from '../../../shared/notebook/cells';
import { comparisonCsv, comparisonSummaryTex, comparisonTexTable } from '../../../shared/notebook/comparisonTable';
import type { ExportedDataset } from '../../../shared/notebook/datasets';
import { toLatexDocument, toNotebookDocument } from '../../../shared/notebook/exports';
import { type DatasetForJob, jobForCell, type SetupInput } from '../../../shared/notebook/jobs';

/** pdflatex from Debian's texlive-latex-base. A missing one fails the test: tests never install system packages. */
function pdflatex(): string {
  const found = spawnSync('sh', ['-c', 'command -v pdflatex']).stdout.toString().trim();
  if (!found) throw new Error("pdflatex is missing: install Debian's texlive-latex-base (apt-get install texlive-latex-base); .ci/run does this");
  return found;
}

/** A real TeX engine is the judge: the document compiles without an error. */
function compiles(tex: string): void {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-comparison-tex-'));
  try {
    fs.writeFileSync(path.join(dir, 'doc.tex'), tex);
    const run = spawnSync(pdflatex(), ['-interaction=nonstopmode', '-halt-on-error', 'doc.tex'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
    assert.equal(run.status, 0, run.stdout.split('\n').filter((line) => line.startsWith('!')).join('\n') || run.stdout.slice(-2000));
    assert.ok(fs.statSync(path.join(dir, 'doc.pdf')).size > 1_000);
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** Invented "lattice" data (test only), with asymmetric errors and one point outside 0 < s ≤ 2 (given as Δφ). */
const dataset: ExportedDataset = {
  label: 'lattice',
  name: 'Invented lattice 1/nu (demo) & co_1',
  source: 'Invented: Monte Carlo $10^6$ sweeps \\input{/etc/passwd} 100%',
  note: '',
  shape: 'points',
  xAxis: { kind: 'Delta_phi' },
  yAxis: { kind: 'nuInv' },
  points: { x: ['0.2', '0.6', '0.625', '0.7'], y: ['1.6', '1.55', '1.52', '1.45'], yErrLow: ['0.01', '0.02', '0.01', '0.03'], yErrHigh: ['0.01', '0.03', '0.01', '0.02'] },
};

/** An invented boundary (test only) with a slope change at s = 1.75: the comparison also reports its kink. */
const boundary: ExportedDataset = {
  label: 'bound',
  name: 'Invented boundary (demo)',
  source: 'invented',
  note: '',
  shape: 'boundary',
  xAxis: { kind: 's' },
  yAxis: { kind: 'nuInv' },
  points: (() => {
    const x = Array.from({ length: 121 }, (_, i) => (1.6 + i * 0.0025).toFixed(4));
    return { x, y: x.map((v) => (1.3 + 0.8 * Math.max(0, Number(v) - 1.75) + 0.1 * (Number(v) - 1.6)).toFixed(6)) };
  })(),
};

function notebookCells() {
  const setup: SetupInput = { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', loops: 2, digits: 20 };
  const inputs: { label: string; input: CellInput }[] = [
    { label: 'params', input: setup },
    { label: 'scan', input: { kind: 'scan', uses: 'params', from: '1.55', to: '1.95', points: 5, quantities: ['nuInv'], deltaSigmaShortRange: '0.5181489' } },
    { label: 'versus', input: { kind: 'comparison', uses: 'scan', dataset: 'lattice', kinks: false } },
    { label: 'edge', input: { kind: 'comparison', uses: 'scan', dataset: 'bound', kinks: true } },
  ];
  const forJob: DatasetForJob = { label: 'lattice', shape: 'points', xAxis: dataset.xAxis, yAxis: dataset.yAxis, points: dataset.points, contentHash: 'test' };
  const edge: DatasetForJob = { label: 'bound', shape: 'boundary', xAxis: boundary.xAxis, yAxis: boundary.yAxis, points: boundary.points, contentHash: 'test' };
  const context = { cells: new Map(inputs.map((c) => [c.label, c.input])), datasets: new Map([['lattice', forJob], ['bound', edge]]) };
  return inputs.map(({ label, input }) => {
    const job = jobForCell(input, new Map([['params', setup]]), context);
    return { label, input, output: job ? runJob(job) : null };
  });
}

test('the LaTeX export of a comparison cell names the setup and the dataset with its source, has the χ² table, and compiles', () => {
  const cells = notebookCells();
  const result = cells[2].output as unknown as CompareResult;
  assert.ok(Array.isArray(result.summary), JSON.stringify(result).slice(0, 300));
  const tex = toLatexDocument({ ...toNotebookDocument('Invented comparison (demo)', '', cells, new Date()), datasets: [dataset, boundary] });
  const kinks = (cells[3].output as unknown as CompareResult).kinks ?? [];
  assert.equal(kinks.length, 1, 'the planted kink');
  assert.ok(tex.includes(`$${kinks[0].x}$ & $${kinks[0].uncertainty}$`), 'kink row: position and uncertainty');
  assert.doesNotMatch(tex, /Export note/, 'every formula passes the safety filter untouched');
  assert.match(tex, /Series from scan cell \\texttt\{scan\}: the O\(1\) model at 2 loops/);
  assert.match(tex, /Invented lattice 1\/nu \(demo\) \\& co\\_1/, 'dataset name escaped');
  assert.match(tex, /Source: Invented: Monte Carlo \\\$10\\\^\{\}6\\\$ sweeps \\textbackslash\{\}input\\\{\/etc\/passwd\\\} 100\\%/, 'source escaped, never executed');
  assert.match(tex, /series & points & points in \$\\chi\^2\$ & \$\\chi\^2\$/);
  for (const label of ['$O(\\varepsilon)$', '$O(\\varepsilon^{2})$', "Pad\\'e $[1/1]$", "Pad\\'e $[0/2]$"]) assert.ok(tex.includes(`${label} & `), `summary row ${label}`);
  // χ² of the one-loop row as the job computed it, rounded to 4 digits in the table
  const one = result.summary.find((row) => row.key === 'order1')!;
  assert.ok(tex.includes(`$O(\\varepsilon)$ & ${one.points} & ${one.chi2Points} & $${String(Number(Number(one.chi2).toPrecision(4)))}$`), 'one-loop χ² row');
  compiles(tex);
});

test('Copy as TeX table: x, data ± error (asymmetric as ^{+}_{-}), series and residuals per variant; it compiles in a plain document', () => {
  const result = notebookCells()[2].output as unknown as CompareResult;
  const table = comparisonTexTable(result);
  const lines = table.split('\n');
  const rows = lines.filter((line) => line.endsWith('\\\\'));
  assert.equal(rows.length, 1 + result.points.length, 'a header and one row per data point');
  assert.equal(rows[0].split(' & ').length, 2 + 2 * result.variants.length, 'x, data, series and residual of each variant');
  assert.ok(rows.some((row) => row.startsWith('$0.6$ & $1.55^{+0.03}_{-0.02}$ & ')), 'asymmetric errors (upper 0.03, lower 0.02) as given');
  assert.ok(rows.some((row) => row.startsWith('$0.625$ & $1.52 \\pm 0.01$ & ')), 'symmetric error');
  const outside = rows.find((row) => row.startsWith('$0.2$'))!;
  assert.deepEqual(outside.split(' & ').slice(2).map((cell) => cell.replace(' \\\\', '')), Array(2 * result.variants.length).fill('--'), 'Δφ = 0.2 is s = 2.6: no series');
  // six significant digits of the job's value (toPrecision is the independent rounding)
  const point = result.points.find((p) => p.x === '0.7')!;
  assert.ok(rows.find((row) => row.startsWith('$0.7$'))!.includes(`$${String(Number(Number(point.series.order2).toPrecision(6)))}$`));
  compiles(['\\documentclass{article}', '\\begin{document}', table, '\\end{document}', ''].join('\n'));
});

test('CSV: a formula-looking label is defused with an apostrophe, negative numbers stay numbers (read back with papaparse, an RFC 4180 parser)', () => {
  const base = notebookCells()[2].output as unknown as CompareResult;
  const attack = "=cmd|' /C calc'!A0";
  const result: CompareResult = {
    ...base,
    variants: base.variants.map((v, i) => (i === 0 ? { ...v, label: attack } : v)),
    points: base.points.map((p, i) => (i === 1 ? { ...p, residual: { ...p.residual, order1: '-0.5' } } : p)),
  };
  const csv = comparisonCsv(result);
  const parsed = Papa.parse<string[]>(csv.trimEnd(), { delimiter: ',' });
  assert.deepEqual(parsed.errors, []);
  const [header, ...rows] = parsed.data;
  assert.equal(header[header.indexOf(`'${attack}`)], `'${attack}`, 'the label comes out as text');
  assert.ok(!header.includes(attack));
  assert.equal(rows.length, result.points.length);
  const residualColumn = header.indexOf(`residual '${attack}`) === -1 ? header.indexOf(`residual ${attack}`) : header.indexOf(`residual '${attack}`);
  assert.equal(rows[1][residualColumn], '-0.5', 'a plain negative number is written as it is');
  assert.equal(header[0], 'Δφ');
  assert.equal(header[1], 's');
  assert.equal(rows[1][1], '1.8', 's = 3 − 2·0.6');
});

test('the TeX summary prints the count χ² sums over: a point with a zero error on the side of the series is in "points" but not in "points in χ²"', () => {
  // Invented data: at s = 1.6 the one-loop 1/ν (1.5333…) lies below y = 1.6, where the lower error is 0 (see compare-job tests)
  const job = { job: 'compare', model: { preset: 'on', N: 1 }, loops: 2, digits: 20, d: '3', s: { from: '1.6', to: '1.9', points: 2 }, quantity: 'nuInv', data: { xAxis: 's', x: ['1.6', '1.7', '1.8'], y: ['1.6', '1.6', '1.5'], yErrLow: ['0', '0.01', '0.01'], yErrHigh: ['0.01', '0.01', '0.01'] } };
  const result = runJob(job) as unknown as CompareResult;
  const tex = comparisonSummaryTex(result);
  // χ² = 100/9 + 100 = 111.1 (4 digits), χ²/point = 55.56: over 2 points, not 3 (hand computation in the compare-job tests)
  assert.ok(tex.includes('$O(\\varepsilon)$ & 3 & 2 & $111.1$ & $55.56$'), tex);
  compiles(['\\documentclass{article}', '\\begin{document}', tex, '\\end{document}', ''].join('\n'));
});
