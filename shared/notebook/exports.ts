import { z } from 'zod';
import { cellInput, cellKindTitles, cellLabel, type CellInput } from './cells';
import { DATASET_LIMITS, exportedDataset } from './datasets';
import { FormulaFilter, withoutControlCharacters } from './latexSafety';
import { CompareResult } from '../jobs/contract';
import { comparisonSummaryTex, numberTex, variantTex } from './comparisonTable';

/**
 * The notebook exchange file: our own JSON schema, versioned by `formatVersion`.
 *
 *   { "format": "rungbook-notebook", "formatVersion": 1, "title": "...", "summary": "...",
 *     "cells": [ { "label": "setup", "input": { "kind": "setup", ... }, "output": <result or null> } ] }
 *
 * `output` is informative only: an import re-runs nothing and keeps no outputs.
 */
export const NOTEBOOK_FORMAT = 'rungbook-notebook';
export const NOTEBOOK_FORMAT_VERSION = 1;

export const notebookDocument = z.strictObject({
  format: z.literal(NOTEBOOK_FORMAT, { error: `Not a Rungbook notebook file (expected "format": "${NOTEBOOK_FORMAT}")` }),
  formatVersion: z.literal(NOTEBOOK_FORMAT_VERSION, { error: `Unsupported notebook file version (this Rungbook reads version ${NOTEBOOK_FORMAT_VERSION})` }),
  title: z.string().trim().min(1).max(200),
  summary: z.string().max(2000).default(''),
  exportedAt: z.string().max(40).optional(),
  cells: z
    .array(z.strictObject({ label: cellLabel, input: cellInput, output: z.unknown().optional() }))
    .max(200)
    .refine((cells) => new Set(cells.map((c) => c.label)).size === cells.length, 'Two cells share a label'),
  /** The notebook's datasets with their points (files written before datasets existed have none). */
  datasets: z
    .array(exportedDataset)
    .max(DATASET_LIMITS.maxPerNotebook)
    .refine((datasets) => new Set(datasets.map((d) => d.label)).size === datasets.length, 'Two datasets share a label')
    .optional(),
});
export type NotebookDocument = z.infer<typeof notebookDocument>;

export interface ExportableCell {
  label: string;
  input: CellInput;
  output: unknown | null;
}

export function toNotebookDocument(title: string, summary: string, cells: ExportableCell[], exportedAt: Date): NotebookDocument {
  return {
    format: NOTEBOOK_FORMAT,
    formatVersion: NOTEBOOK_FORMAT_VERSION,
    title,
    summary,
    exportedAt: exportedAt.toISOString(),
    cells: cells.map((cell) => ({ label: cell.label, input: cell.input, output: cell.output ?? null })),
  };
}

const LATEX_SPECIALS: Record<string, string> = {
  '\\': '\\textbackslash{}', '{': '\\{', '}': '\\}', '#': '\\#', $: '\\$', '%': '\\%', '&': '\\&', _: '\\_', '^': '\\^{}', '~': '\\~{}',
};

/** Text that TeX prints as it is: every special character escaped, control characters dropped. */
export function escapeLatexText(text: string): string {
  return withoutControlCharacters(text).replace(/[\\{}#$%&_^~]/g, (c) => LATEX_SPECIALS[c]);
}

/** One export in progress: every formula goes through the safety filter, which records what it removed. */
class LatexWriter {
  private readonly formulas = new FormulaFilter();
  readonly report = this.formulas.report;

  get formulasExhausted(): boolean {
    return this.formulas.exhausted;
  }

  inline(math: string): string {
    const safe = this.formulas.safe(math, false);
    return safe === null ? `\\texttt{${escapeLatexText(math)}}` : `$${safe}$`;
  }

  display(math: string): string {
    const safe = this.formulas.safe(math, true);
    return safe === null ? this.asText(math) : `\\[${safe}\\]`;
  }

  multline(math: string): string {
    const safe = this.formulas.safe(math, true);
    return safe === null ? this.asText(math) : `\\begin{multline*}\n${safe}\n\\end{multline*}`;
  }

  private asText(math: string): string {
    return `\\begin{center}\\texttt{${escapeLatexText(math)}}\\end{center}`;
  }
}

const HEADING_OPEN = '\uE000';
const HEADING_CLOSE = '\uE001';

/** Prose with $…$ and $$…$$: the prose is escaped, the mathematics goes through the formula filter. Math never crosses a heading's end. */
function proseToLatex(text: string, writer: LatexWriter): string {
  if (writer.formulasExhausted) return escapeLatexText(text);
  return text
    .split(/(\$\$[^\uE000\uE001]+?\$\$|\$[^$\n\uE000\uE001]+?\$)/)
    .map((part) => (part.startsWith('$$') ? writer.display(part.slice(2, -2)) : part.startsWith('$') ? writer.inline(part.slice(1, -1)) : escapeLatexText(part)))
    .join('');
}

/** Note text: Markdown headings become paragraph headings (marked before escaping, so # survives and math inside stays math). */
function noteToLatex(text: string, writer: LatexWriter): string {
  const ownText = withoutControlCharacters(text).replace(/[\uE000\uE001]/g, '');
  const marked = ownText.replace(/^#{1,6}[ \t]+(.*)$/gm, `${HEADING_OPEN}$1${HEADING_CLOSE}`);
  return proseToLatex(marked, writer).replaceAll(HEADING_OPEN, '\\paragraph{').replaceAll(HEADING_CLOSE, '}');
}

function coefficientTex(coefficient: unknown): string {
  if (typeof coefficient === 'string') return coefficient;
  if (coefficient && typeof coefficient === 'object' && 'latex' in coefficient) return String((coefficient as { latex: unknown }).latex);
  return `\\text{${escapeMathText(JSON.stringify(coefficient))}}`;
}

/** Text inside a formula keeps letters, digits and plain punctuation only. */
const escapeMathText = (text: string) => String(text).replace(/[^A-Za-z0-9 .,:;+\-*/=()'"!?<>|[\]_]/g, '').replace(/_/g, '\\_');

const QUANTITY_TEX: Record<string, string> = {
  nuInv: '1/\\nu', nu: '\\nu', eta: '\\eta', gamma: '\\gamma', alpha: '\\alpha', beta: '\\beta', delta: '\\delta',
  omega: '\\omega', Delta_phi: '\\Delta_{\\phi}', Delta_phi2: '\\Delta_{\\phi^2}', Delta_phi3: '\\Delta_{\\phi^3}', Delta_phi4: '\\Delta_{\\phi^4}',
};
const quantityTex = (name: string) => QUANTITY_TEX[name] ?? `\\mathrm{${escapeMathText(name)}}`;
const isRecord = (value: unknown): value is Record<string, unknown> => typeof value === 'object' && value !== null && !Array.isArray(value);

/** "eps*u^2" → "\varepsilon\,u^{2}" (also used by the app's result views). */
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

function polynomialTex(terms: unknown): string | null {
  if (!Array.isArray(terms)) return null;
  const parts = terms.flatMap((term) => (isRecord(term) && typeof term.monomial === 'string' ? [`\\left(${coefficientTex(term.coeff)}\\right)${monomialTex(term.monomial)}`] : []));
  return parts.length ? parts.join(' + ') : '0';
}

/** Non-ASCII text (engine notes, relation strings) in a form pdflatex accepts without extra packages. */
function asciiText(text: string): string {
  const names: Record<string, string> = { 'ε': 'eps', 'β': 'beta', 'γ': 'gamma', 'ν': 'nu', 'η': 'eta', 'ω': 'omega', 'φ': 'phi', 'Δ': 'Delta', '²': '^2', '³': '^3', '⁴': '^4', '−': '-', '≤': '<=', '≥': '>=', '→': '->', '∂': 'd', '·': '*', '…': '...', '₀': '_0', '₁': '_1', '₂': '_2', '₃': '_3', '₄': '_4', 'ᵢ': '_i', 'ⱼ': '_j', 'ₖ': '_k', 'ₗ': '_l', '∑': 'sum', 'Σ': 'Sum', 'ψ': 'psi', 'Γ': 'Gamma', 'π': 'pi', 'λ': 'lambda', 'μ': 'mu', 'σ': 'sigma', 'δ': 'delta', 'α': 'alpha', '≈': '~', '×': 'x', '✓': '' };
  return text.replace(/[^\x00-\x7f]/g, (c) => names[c] ?? '?');
}

function tabular(header: string[], rows: string[][]): string {
  return [
    `\\begin{longtable}{${'l'.repeat(header.length)}}`,
    '\\hline',
    `${header.join(' & ')} \\\\`,
    '\\hline',
    ...rows.map((row) => `${row.join(' & ')} \\\\`),
    '\\hline',
    '\\end{longtable}',
  ].join('\n');
}

const textCell = (value: unknown) => escapeLatexText(asciiText(value === null || value === undefined ? '--' : String(value)));

/** Lines of text in a typewriter face, every character escaped (no verbatim: its end marker could be forged). */
function monospaceBlock(text: string): string {
  const lines = text.split('\n').map((line) => escapeLatexText(line).replace(/^ +/, (spaces) => '~'.repeat(spaces.length)) || '~');
  return `{\\ttfamily\\raggedright\\noindent\n${lines.join('\\\\\n')}\\par}`;
}

function exponentsToLatex(value: Record<string, unknown>, writer: LatexWriter): string {
  const series = isRecord(value.series) ? value.series : {};
  const equations = Object.entries(series)
    .filter(([, coeffs]) => Array.isArray(coeffs))
    .map(([name, coeffs]) => writer.display(` ${quantityTex(name)} = ${seriesTermsTex(0, coeffs as unknown[])} `));
  const values = isRecord(value.values) ? Object.entries(value.values).map(([name, v]) => [writer.inline(quantityTex(name)), textCell(v)]) : [];
  const heading = typeof value.eps === 'string' ? `At ${writer.inline(`\\varepsilon = ${value.eps}`)}${typeof value.fixedPoint === 'string' ? `, fixed point ${textCell(value.fixedPoint)}` : ''}.` : '';
  return [heading, ...equations, values.length ? tabular(['quantity', 'value'], values) : ''].filter(Boolean).join('\n\n');
}

function flowToLatex(value: Record<string, unknown>, writer: LatexWriter): string {
  const betas = isRecord(value.beta) ? Object.entries(value.beta).map(([coupling, terms]) => writer.display(` \\beta_{${monomialTex(coupling)}} = ${polynomialTex(terms)} `)) : [];
  const anomalous = (['gamma_phi', 'gamma_phi2'] as const).flatMap((name) => {
    const tex = polynomialTex(value[name]);
    return tex ? [writer.display(` \\gamma_{${name === 'gamma_phi' ? '\\phi' : '\\phi^2'}} = ${tex} `)] : [];
  });
  const checks = Array.isArray(value.checks) ? [`Checks passed: ${value.checks.map(textCell).join('; ')}.`] : [];
  return [...betas, ...anomalous, ...checks].join('\n\n');
}

function fixedPointsToLatex(value: Record<string, unknown>): string {
  const points = Array.isArray(value.fixedPoints) ? value.fixedPoints.filter(isRecord) : [];
  const rows = points.map((point) => {
    const couplings = isRecord(point.couplings)
      ? Object.entries(point.couplings).map(([name, c]) => `${name} = ${isRecord(c) ? (c.value ?? '--') : '--'}`).join(', ')
      : '--';
    const stability = isRecord(point.stability) && Array.isArray(point.stability.values) ? point.stability.values.join(', ') : '--';
    return [textCell(point.name), textCell(couplings), textCell(stability), point.stable === true ? 'IR-stable' : point.stable === false ? 'unstable' : '--', textCell(point.status)];
  });
  return tabular(['fixed point', 'couplings', 'stability eigenvalues', 'stability', 'status'], rows);
}

function scanToLatex(value: Record<string, unknown>, writer: LatexWriter): string {
  const quantities = Array.isArray(value.quantities) ? value.quantities.map(String) : [];
  const points = Array.isArray(value.points) ? value.points.filter(isRecord) : [];
  const rows = points.map((point) => [textCell(point.s), ...quantities.map((q) => textCell(isRecord(point.values) ? point.values[q] : null)), point.flagged ? textCell(point.regime) : '']);
  const given = isRecord(value.marks) ? value.marks : {};
  const mark = (name: string, at: unknown, note: unknown) => (typeof at === 'string' ? [`${name} ${writer.inline(`= ${numberTex(at)}`)}${typeof note === 'string' ? ` (${textCell(note)})` : ''}`] : []);
  const marks = [...mark('$s = d/2$', given.meanFieldEnd, given.meanFieldEndNote), ...mark('$s^*$', given.sStar, given.sStarSource)].join(', ');
  return [marks ? `Marks: ${marks}.` : '', tabular(['$s$', ...quantities.map((q) => writer.inline(quantityTex(q))), 'outside window'], rows)].filter(Boolean).join('\n\n');
}

function seriesTermsTex(lowest: number, coeffs: unknown[], order?: number): string {
  const terms = coeffs.map((c, k) => {
    const power = lowest + k;
    const epsilon = power === 0 ? '' : power === 1 ? '\\,\\varepsilon' : `\\,\\varepsilon^{${power}}`;
    return `\\left(${coefficientTex(c)}\\right)${epsilon}`;
  });
  return [...terms, `O(\\varepsilon^{${(order ?? lowest + coeffs.length - 1) + 1}})`].join(' + ');
}

/** A cell's result by its kind (the job contract's result of that kind; readers tolerate earlier-shaped results). */
function outputToLatex(output: unknown, kind: CellInput['kind'], writer: LatexWriter): string {
  if (!isRecord(output)) return '';
  if ('error' in output) return `\\emph{This cell failed: ${textCell(isRecord(output.error) ? output.error.message : '')}}`;
  if (kind === 'integral' && typeof output.lowest === 'number' && Array.isArray(output.coeffs)) {
    return writer.multline(seriesTermsTex(output.lowest, output.coeffs, output.order as number | undefined).split(' + ').join('\n + '));
  }
  if (kind === 'exponents') return exponentsToLatex(output, writer);
  if (kind === 'flow') return flowToLatex(output, writer);
  if (kind === 'fixedpoints') return fixedPointsToLatex(output);
  if (kind === 'scan') return scanToLatex(output, writer);
  return monospaceBlock(asciiText(JSON.stringify(output, null, 2)).slice(0, 20_000));
}

type ComparisonCell = Extract<CellInput, { kind: 'comparison' }>;

function modelText(model: Extract<CellInput, { kind: 'setup' }>['model']): string {
  if (model.preset === 'custom') return `a ${model.fields}-field model with potential \\texttt{${textCell(model.potential)}}`;
  return `the ${model.preset === 'on' ? 'O' : 'cubic'}(${textCell(model.N)}) model`;
}

/** Where the series come from: the scan cell the comparison uses and that cell's model & parameters. */
function comparisonSetupText(input: ComparisonCell, document: NotebookDocument, writer: LatexWriter): string {
  const scan = document.cells.find((c) => c.label === input.uses)?.input;
  if (!scan || scan.kind !== 'scan') return `Series from scan cell \\texttt{${escapeLatexText(input.uses)}} (not in this notebook).`;
  const setup = document.cells.find((c) => c.label === scan.uses)?.input;
  const range = `${writer.inline(`s = ${numberTex(scan.from)}`)} to ${writer.inline(numberTex(scan.to))} (${scan.points} points)`;
  const model = setup && setup.kind === 'setup' ? `${modelText(setup.model)} at ${setup.loops} loop${setup.loops === 1 ? '' : 's'}${setup.d ? `, ${writer.inline(`d = ${numberTex(setup.d)}`)}` : ''}, ` : '';
  return `Series from scan cell \\texttt{${escapeLatexText(input.uses)}}: ${model}${range}.`;
}

function comparisonDatasetText(input: ComparisonCell, document: NotebookDocument): string {
  const dataset = document.datasets?.find((d) => d.label === input.dataset);
  if (!dataset) return `Dataset \\texttt{${escapeLatexText(input.dataset)}} (not in this notebook).`;
  const source = dataset.source.trim() ? ` Source: ${textCell(dataset.source)}.` : '';
  return `Data: \\emph{${textCell(dataset.name)}} (dataset \\texttt{${escapeLatexText(dataset.label)}}, ${dataset.points.x.length} points).${source}`;
}

const mathNumber = (value: string | null | undefined, digits?: number) => {
  const tex = numberTex(value, digits);
  return tex === '--' ? '--' : `$${tex}$`;
};

/** A comparison result exactly as the job contract has it (an earlier-shaped one is exported as plain fields). */
function isComparisonResult(output: unknown): output is CompareResult {
  return CompareResult.safeParse(output).success;
}

/** A comparison: the setup of its series, the dataset with its source, the χ² summary per variant, marks, kinks and notes. */
function comparisonToLatex(input: ComparisonCell, output: unknown, document: NotebookDocument, writer: LatexWriter): string {
  const intro = [comparisonSetupText(input, document, writer), comparisonDatasetText(input, document)].join(' ');
  if (!isComparisonResult(output)) return [intro, outputToLatex(output, input.kind, writer)].filter(Boolean).join('\n\n');
  const result = output;
  const axis = result.xAxis === 's' ? 's' : '\\Delta_{\\phi}';
  const heading = `${writer.inline(quantityTex(result.quantity))} against ${writer.inline(axis)} at ${writer.inline(`d = ${numberTex(result.d)}`)}${result.fixedPoint ? `, fixed point ${textCell(result.fixedPoint)}` : ''}.`;
  const marks = [
    `${writer.inline(`s = d/2`)} at ${writer.inline(`${axis} = ${numberTex(result.marks.meanFieldEnd.x)}`)}`,
    ...(result.marks.sStar ? [`${writer.inline('s^*')} at ${writer.inline(`${axis} = ${numberTex(result.marks.sStar.x)}`)}`] : []),
    `data from ${writer.inline(`${axis} = ${numberTex(result.marks.dataRange[0])}`)} to ${writer.inline(numberTex(result.marks.dataRange[1]))}`,
  ];
  const chi2 = `${writer.inline('\\chi^2')} is the sum of squared pulls (residual series $-$ data over the data's error on the side of the series) over the points with a non-zero error there; ${writer.inline('\\chi^2')}/point divides by that count.\n\n\\begin{center}\n${comparisonSummaryTex(result)}\n\\end{center}`;
  const kinks = result.kinks?.length
    ? tabular(['kink', 'uncertainty', writer.inline(quantityTex(result.quantity)), ...result.variants.map((v) => `distance ${variantTex(v)}`)], result.kinks.map((k) => [k.x, k.uncertainty, k.y, ...result.variants.map((v) => k.distance[v.key] ?? null)].map((v) => mathNumber(v, 6))))
    : result.kinks ? 'No kink found in the boundary.' : '';
  const notes = result.notes.length ? `\\begin{itemize}\n${result.notes.map((note) => `\\item ${textCell(note)}`).join('\n')}\n\\end{itemize}` : '';
  return [intro, heading, `Marks: ${marks.join('; ')}.`, chi2, kinks, notes].filter(Boolean).join('\n\n');
}

function inputToLatex(input: CellInput): string {
  const fields = Object.entries(input).filter(([key]) => key !== 'kind');
  return `\\begin{description}\n${fields.map(([key, v]) => `\\item[${escapeLatexText(key)}] \\texttt{${textCell(typeof v === 'string' ? v : JSON.stringify(v))}}`).join('\n')}\n\\end{description}`;
}

/**
 * A standalone LaTeX document: notes as text, inputs as descriptions, results as equations and
 * tables. Safe to compile for someone who did not write the notebook: all text is escaped and
 * formulas keep only allow-listed commands; what was removed is said at the top, in a comment and
 * in the document.
 */
export function toLatexDocument(document: NotebookDocument): string {
  const writer = new LatexWriter();
  const body = document.cells.map((cell) => {
    if (cell.input.kind === 'note') return noteToLatex(cell.input.text, writer);
    const heading = `\\subsection*{${escapeLatexText(cellKindTitles[cell.input.kind])}: \\texttt{${escapeLatexText(cell.label)}}}`;
    if (cell.input.kind === 'comparison') return [heading, inputToLatex(cell.input), comparisonToLatex(cell.input, cell.output, document, writer)].filter(Boolean).join('\n\n');
    return [heading, inputToLatex(cell.input), outputToLatex(cell.output, cell.input.kind, writer)].filter(Boolean).join('\n\n');
  });
  const removals = writer.report.empty ? null : writer.report.summary();
  return [
    '\\documentclass{article}',
    ...(removals ? [`% Export note: ${removals}`] : []),
    '\\usepackage{amsmath,amssymb,longtable}',
    '\\usepackage[utf8]{inputenc}',
    `\\title{${escapeLatexText(document.title)}}`,
    '\\date{}',
    '\\begin{document}',
    '\\maketitle',
    removals ? `\\noindent\\emph{Export note: ${escapeLatexText(removals)}}\n` : '',
    document.summary ? `${escapeLatexText(document.summary)}\n` : '',
    ...body.map((part) => `${part}\n`),
    '\\end{document}',
    '',
  ].join('\n');
}
