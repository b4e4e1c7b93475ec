import { z } from 'zod';
import { cellInput, cellKindTitles, cellLabel, type CellInput } from './cells';
import { DATASET_LIMITS, exportedDataset } from './datasets';
import { FormulaFilter, withoutControlCharacters } from './latexSafety';
import { alignBody, epsilonPower, monomialTex, numberIn, seriesTerms, term, type Equation, type Term } from './latex/equations';
import { actionTex, modelName, parametersTex } from './latex/model';
import { isPlainDecimal, valueTex, type NumberStyle } from './latex/numbers';
import { plotPicture } from './latex/plots';
import { relationTex, unicodeToTexText } from './latex/text';
import { graphSection, isTrailGraph, simplePoleResidues } from './latex/trail';
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
  // the default (OT1) text fonts print ¡ ¿ — for < > and a dash for |; the math fonts have them
  '<': '\\ensuremath{<}', '>': '\\ensuremath{>}', '|': '\\ensuremath{|}',
};

/** Text that TeX prints as it is: every special character escaped, control characters dropped. */
export function escapeLatexText(text: string): string {
  return withoutControlCharacters(text).replace(/[\\{}#$%&_^~<>|]/g, (c) => LATEX_SPECIALS[c]);
}

export { monomialTex } from './latex/equations';

/** What the person exporting chose: digits of the series and values (all computed digits by default), and fractions for exact coefficients. */
export type LatexExportOptions = NumberStyle;

/** One export in progress: every formula goes through the safety filter, which records what it removed. */
class LatexWriter {
  private readonly formulas = new FormulaFilter();
  readonly report = this.formulas.report;

  constructor(readonly style: NumberStyle) {}

  /** Values in tables are decimals (a column of fractions and decimals reads badly), rounded as chosen. */
  get tableStyle(): NumberStyle {
    return { digits: this.style.digits };
  }

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

  /** Rows of an align* (checked as the body of KaTeX's aligned, which has the same syntax); an align* may break across pages. */
  align(body: string): string {
    if (!body.trim()) return '';
    const safe = this.formulas.safe(`\\begin{aligned}${body}\\end{aligned}`, true);
    if (safe === null || !safe.startsWith('\\begin{aligned}') || !safe.endsWith('\\end{aligned}')) return this.asText(body);
    return `\\begin{align*}\n${safe.slice('\\begin{aligned}'.length, -'\\end{aligned}'.length)}\n\\end{align*}`;
  }

  equations(equations: Equation[]): string {
    return this.align(alignBody(equations.filter((e) => e.terms.length > 0)));
  }

  private asText(math: string): string {
    return `\\begin{center}\\texttt{${escapeLatexText(math)}}\\end{center}`;
  }
}

/** Private-use marks for Markdown headings while the note is escaped: open with its level (U+E011…U+E016), close U+E001. */
const HEADING_CLOSE = '\uE001';
const headingOpen = (level: number) => String.fromCharCode(0xe010 + level);
const SECTION_BY_LEVEL = ['\\section*{', '\\subsection*{', '\\subsubsection*{', '\\paragraph{', '\\paragraph{', '\\paragraph{'];

/** Prose with $…$ and $$…$$: the prose is escaped, the mathematics goes through the formula filter. Math never crosses a heading's end. */
function proseToLatex(text: string, writer: LatexWriter): string {
  if (writer.formulasExhausted) return plainText(text);
  return text
    .split(/(\$\$[^\uE000-\uE01F]+?\$\$|\$[^$\n\uE000-\uE01F]+?\$)/)
    .map((part) => (part.startsWith('$$') ? writer.display(part.slice(2, -2)) : part.startsWith('$') ? writer.inline(part.slice(1, -1)) : markdownText(part)))
    .join('');
}

/** **bold**, *italic* and `code` of a note's prose (after escaping, so nothing typed becomes a command). */
function markdownText(text: string): string {
  return plainText(text)
    .replace(/\*\*([^*\n]+)\*\*/g, '\\textbf{$1}')
    .replace(/\*([^*\n]+)\*/g, '\\emph{$1}')
    .replace(/`([^`\n]+)`/g, '\\texttt{$1}');
}

/** Note text: Markdown headings become unnumbered sections by level (marked before escaping, so # survives and math inside stays math). */
function noteToLatex(text: string, writer: LatexWriter): string {
  const ownText = withoutControlCharacters(text).replace(/[\uE000-\uE01F]/g, '');
  const marked = ownText.replace(/^(#{1,6})[ \t]+(.*)$/gm, (_, hashes: string, title: string) => `${headingOpen(hashes.length)}${title}${HEADING_CLOSE}`);
  return proseToLatex(marked, writer).replace(/[\uE001\uE011-\uE016]/g, (mark) => (mark === HEADING_CLOSE ? '}' : SECTION_BY_LEVEL[mark.charCodeAt(0) - 0xe011]));
}

/** Engine or notebook text in a TeX paragraph: escaped, with Greek, scripts and symbols as TeX commands. */
const plainText = (value: unknown) => unicodeToTexText(escapeLatexText(value === null || value === undefined ? '--' : String(value)));

const QUANTITY_TEX: Record<string, string> = {
  nuInv: '1/\\nu', nu: '\\nu', eta: '\\eta', gamma: '\\gamma', alpha: '\\alpha', beta: '\\beta', delta: '\\delta',
  omega: '\\omega', Delta_phi: '\\Delta_{\\phi}', Delta_phi2: '\\Delta_{\\phi^2}', Delta_phi3: '\\Delta_{\\phi^3}', Delta_phi4: '\\Delta_{\\phi^4}',
};
/** Text inside a formula keeps letters, digits and plain punctuation only. */
const escapeMathText = (text: string) => String(text).replace(/[^A-Za-z0-9 .,:;+\-*/=()'"!?<>|[\]_]/g, '').replace(/_/g, '\\_');
const quantityTex = (name: string) => QUANTITY_TEX[name] ?? `\\mathrm{${escapeMathText(name)}}`;
const isRecord = (value: unknown): value is Record<string, unknown> => typeof value === 'object' && value !== null && !Array.isArray(value);
const records = (value: unknown) => (Array.isArray(value) ? value.filter(isRecord) : []);
const strings = (value: unknown) => (Array.isArray(value) ? value : []) as unknown[];

/** Σ coefficient × monomial (a flow result's polynomial) as signed terms. */
function polynomialTerms(terms: unknown, style: NumberStyle): Term[] {
  return records(terms).flatMap((t) => (typeof t.monomial === 'string' ? (term(t.coeff, monomialTex(t.monomial), style) ?? []) : []));
}

/** A booktabs table; `long` for tables that may run over a page. */
function table(header: string[], rows: string[][], align = 'l'.repeat(header.length), long = false): string {
  const body = ['\\toprule', `${header.join(' & ')} \\\\`, '\\midrule', ...rows.map((row) => `${row.join(' & ')} \\\\`), '\\bottomrule'];
  if (long) return [`\\begin{longtable}{${align}}`, body[0], body[1], body[2], '\\endhead', ...body.slice(3), '\\end{longtable}'].join('\n');
  return ['\\begin{center}', `\\begin{tabular}{${align}}`, ...body, '\\end{tabular}', '\\end{center}'].join('\n');
}

function itemize(items: string[]): string {
  return items.length ? `\\begin{itemize}\n${items.map((item) => `\\item ${item}`).join('\n')}\n\\end{itemize}` : '';
}

/** Engine text as a sentence: capital first letter, one full stop. */
const sentence = (text: string) => plainText(`${text.charAt(0).toUpperCase()}${text.slice(1).replace(/\.+$/, '')}.`);

/** Notices and caveats of a result, in words. */
function noticesText(value: Record<string, unknown>): string {
  const messages = records(value.notices).map((n) => n.message).filter((m): m is string => typeof m === 'string');
  return messages.length ? `\\paragraph{Notes.} ${messages.map(sentence).join(' ')}` : '';
}

function exponentsToLatex(value: Record<string, unknown>, writer: LatexWriter): string {
  const series = isRecord(value.series) ? value.series : {};
  const names = Object.keys(series).filter((name) => Array.isArray(series[name]));
  const heading = typeof value.eps === 'string'
    ? `At ${writer.inline(`\\varepsilon = ${numberIn(value.eps, { ...writer.style, exact: true })}`)}${typeof value.fixedPoint === 'string' ? ` at the fixed point ${plainText(value.fixedPoint)}` : ''}, the $\\varepsilon$-expansions are`
    : '';
  const equations = writer.equations(names.map((name) => ({ lhs: quantityTex(name), terms: seriesTerms(0, series[name] as unknown[], writer.style) })));
  return [heading, equations, exponentValuesTable(value, writer), relationsText(value, writer), noticesText(value)].filter(Boolean).join('\n\n');
}

/** Values at the physical ε with the Padé value beside them and where each value comes from. */
function exponentValuesTable(value: Record<string, unknown>, writer: LatexWriter): string {
  if (!isRecord(value.values)) return '';
  const pade = isRecord(value.pade) ? value.pade : {};
  const padeCell = (name: string) => {
    const first = records(pade[name])[0];
    return first && typeof first.value === 'string' && !first.flagged ? `$${valueTex(first.value, writer.tableStyle)}$ {\\footnotesize$[${first.L}/${first.M}]$}` : '--';
  };
  const rows = Object.entries(value.values).map(([name, v]) => [writer.inline(quantityTex(name)), `$${valueTex(v, writer.tableStyle)}$`, padeCell(name)]);
  return `Their values at the physical $\\varepsilon$ (truncated series, and the Pad\\'e approximant where it is regular):\n${table(['', 'value', "Pad\\'e"], rows, 'lll')}`;
}

/** A relation or convention of the engine as a formula, its remark in parentheses after it. */
function formulaWithRemark(relation: string, writer: LatexWriter): string {
  const { math, remark } = relationTex(relation);
  return `${writer.inline(math)}${remark ? ` (${plainText(remark)})` : ''}`;
}

/** The relations the engine used, each a formula with its remark (docs/physics.md §6). */
function relationsText(value: Record<string, unknown>, writer: LatexWriter): string {
  if (!isRecord(value.relations)) return '';
  const items = Object.values(value.relations)
    .filter((r): r is string => typeof r === 'string')
    .map((relation) => formulaWithRemark(relation, writer));
  return `\\paragraph{Relations used.}\n${itemize(items)}`;
}

function flowToLatex(value: Record<string, unknown>, writer: LatexWriter): string {
  const betas = isRecord(value.beta) ? Object.entries(value.beta).map(([coupling, terms]): Equation => ({ lhs: `\\beta_{${monomialTex(coupling)}}`, terms: polynomialTerms(terms, writer.style) })) : [];
  const anomalous = (['gamma_phi', 'gamma_phi2'] as const)
    .filter((name) => Array.isArray(value[name]))
    .map((name): Equation => {
      const terms = polynomialTerms(value[name], writer.style);
      return { lhs: name === 'gamma_phi' ? '\\gamma_{\\phi}' : '\\gamma_{\\phi^2}', terms: terms.length ? terms : [{ negative: false, body: '0' }] };
    });
  const convention = typeof value.convention === 'string' ? `Conventions: ${value.convention.split('; ').map((part) => formulaWithRemark(part, writer)).join('; ')}.` : '';
  const checks = strings(value.checks).length ? `\\paragraph{Checks passed.}\n${itemize(strings(value.checks).map(plainText))}` : '';
  return [convention, writer.equations([...betas, ...anomalous]), quadraticMatrixText(value, writer), checks].filter(Boolean).join('\n\n');
}

/** "phi1*phi2" → "\phi_1\phi_2", "phi1^2" → "\phi_1^2". */
const operatorTex = (operator: string) => operator.replace(/phi(\d+)/g, '\\phi_{$1}').replace(/\^(\d+)/g, '^{$1}').replace(/\*/g, '').replace(/[^\\A-Za-z0-9_{}^ +-]/g, '');

/** The non-zero entries of the quadratic-operator matrix γ_{(kl),(ij)}, one equation each. */
function quadraticMatrixText(value: Record<string, unknown>, writer: LatexWriter): string {
  const block = isRecord(value.gamma_quadratic) ? value.gamma_quadratic : null;
  if (!block || !Array.isArray(block.operators) || !Array.isArray(block.matrix)) return '';
  const operators = block.operators.map(String);
  const entries = block.matrix.flatMap((row, k) => strings(row).map((entry, ij): Equation => ({ lhs: `\\gamma_{${operatorTex(operators[k])},\\,${operatorTex(operators[ij])}}`, terms: polynomialTerms(entry, writer.style) })));
  const nonZero = entries.filter((e) => e.terms.length > 0);
  const convention = typeof block.convention === 'string' ? ` Conventions: ${block.convention.split('; ').map((part) => formulaWithRemark(part, writer)).join('; ')}.` : '';
  return `\\paragraph{Quadratic operators.} The non-zero entries of the anomalous-dimension matrix of the operators ${operators.map((o) => writer.inline(operatorTex(o))).join(', ')} (${entries.length - nonZero.length} entries vanish).${convention}\n${writer.equations(nonZero)}`;
}

function fixedPointsToLatex(value: Record<string, unknown>, writer: LatexWriter): string {
  const eps = typeof value.eps === 'string' ? numberIn(value.eps, { ...writer.style, exact: true }) : null;
  const points = records(value.fixedPoints).map((point) => fixedPointText(point, eps, writer));
  return [eps ? `The fixed points, as $\\varepsilon$-series and at ${writer.inline(`\\varepsilon = ${eps}`)}:` : '', ...points].filter(Boolean).join('\n\n');
}

function fixedPointText(point: Record<string, unknown>, eps: string | null, writer: LatexWriter): string {
  const couplings = isRecord(point.couplings) ? Object.entries(point.couplings).filter(([, c]) => isRecord(c)) as [string, Record<string, unknown>][] : [];
  const stability = isRecord(point.stability) ? point.stability : {};
  const at = eps ? `\\big|_{\\varepsilon = ${eps}}` : '';
  const equations: Equation[] = [
    ...couplings.filter(([, c]) => strings(c.series).length).map(([name, c]) => ({ lhs: `${monomialTex(name)}_*`, terms: seriesTerms(0, strings(c.series), writer.style) })),
    ...couplings.filter(([, c]) => c.value !== undefined).map(([name, c]) => ({ lhs: `${monomialTex(name)}_*${at}`, terms: valueTerms(c.value, writer.style) })),
    ...strings(stability.series).map((s, i) => ({ lhs: `\\lambda_{${i + 1}}`, terms: seriesTerms(0, strings(s), writer.style) })),
    ...strings(stability.values).map((v, i) => ({ lhs: `\\lambda_{${i + 1}}${at}`, terms: valueTerms(v, writer.style) })),
  ];
  const verdict = point.stable === true ? 'IR-stable' : point.stable === false ? 'not IR-stable' : '';
  const status = typeof point.status === 'string' && point.status !== 'real' ? `, ${plainText(point.status)} at the physical $\\varepsilon$` : '';
  const caveats = records(point.caveats).map((c) => sentence(String(c.message)));
  const intro = `\\paragraph{${plainText(point.name)}} (${verdict}${status}). Couplings ${writer.inline('g_*')} and the eigenvalues ${writer.inline('\\lambda_i')} of ${writer.inline('\\partial\\beta_i/\\partial g_j')}:`;
  return [intro, writer.equations(equations), quadraticOperatorsTable(point, writer), caveats.join(' ')].filter(Boolean).join('\n\n');
}

/** One value as a single term (complex values keep their parentheses). */
const valueTerms = (value: unknown, style: NumberStyle): Term[] => [term(value, '', style) ?? { negative: false, body: '0' }];

function quadraticOperatorsTable(point: Record<string, unknown>, writer: LatexWriter): string {
  const operators = records(point.quadraticOperators);
  if (!operators.length) return '';
  const rows = operators.map((op, index) => [String(index + 1), plainText(op.name), String(op.multiplicity ?? '--'), isRecord(op.values) ? `$${valueTex(op.values.Delta, writer.tableStyle)}$` : '--']);
  const series = operators.map((op, index): Equation => ({ lhs: `\\Delta_{${index + 1}}`, terms: isRecord(op.series) ? seriesTerms(0, strings(op.series.Delta), writer.style) : [] }));
  return [table(['$k$', 'quadratic operators', 'multiplicity', '$\\Delta_k$'], rows, 'rlrl'), writer.equations(series)].join('\n\n');
}

/** Scan results: a figure per quantity (series and Padé against s), marks, and the table of values. */
function scanToLatex(value: Record<string, unknown>, writer: LatexWriter, label: string): string {
  const quantities = strings(value.quantities).map(String);
  const points = records(value.points);
  const given = isRecord(value.marks) ? value.marks : {};
  const mark = (name: string, at: unknown, note: unknown) => (typeof at === 'string' ? [`${writer.inline(`${name} = ${numberIn(at, writer.tableStyle)}`)}${typeof note === 'string' ? ` (${plainText(note)})` : ''}`] : []);
  const marks = [...mark('s = d/2', given.meanFieldEnd, given.meanFieldEndNote), ...mark('s^*', given.sStar, given.sStarSource)];
  const flagged = points.some((point) => point.flagged);
  const rows = points.map((point) => [
    `$${valueTex(String(point.s), writer.tableStyle)}$`,
    ...quantities.map((q) => (isRecord(point.values) && point.values[q] != null ? `$${valueTex(point.values[q], writer.tableStyle)}$` : '--')),
    ...(flagged ? [point.flagged ? plainText(point.regime) : ''] : []),
  ]);
  const fixedPoint = typeof value.fixedPoint === 'string' ? ` at the fixed point ${plainText(value.fixedPoint)}` : '';
  return [
    `Along the scan${fixedPoint}${typeof value.d === 'string' ? `, ${writer.inline(`d = ${numberIn(value.d, { ...writer.style, exact: true })}`)}` : ''}, Figure~\\ref{fig:${label}} shows the series and their Pad\\'e approximants.${marks.length ? ` Marks: ${marks.join('; ')}.` : ''}`,
    scanFigure(value, quantities, points, label),
    noticesText(value),
    table(['$s$', ...quantities.map((q) => writer.inline(quantityTex(q))), ...(flagged ? ['outside window'] : [])], rows, 'l'.repeat(rows[0]?.length ?? 1), true),
  ].filter(Boolean).join('\n\n');
}

function scanFigure(value: Record<string, unknown>, quantities: string[], points: Record<string, unknown>[], label: string): string {
  const given = isRecord(value.marks) ? value.marks : {};
  const marks = typeof given.sStar === 'string' ? [{ x: Number(given.sStar), label: '$s^*$' }] : [];
  const column = (source: 'values' | 'pade', q: string) => points.flatMap((p) => (isRecord(p[source]) && typeof p[source][q] === 'string' && isPlainDecimal(p[source][q] as string) ? [{ x: Number(p.s), y: Number(p[source][q]) }] : []));
  const pictures = quantities.map((q) => plotPicture({
    xLabel: '$s$',
    yLabel: `$${quantityTex(q)}$`,
    curves: [{ label: 'truncated $\\varepsilon$-series', points: column('values', q) }, { label: "Pad\\'e approximant", points: column('pade', q), dashed: true }].filter((c) => c.points.length > 1),
    marks,
  })).filter(Boolean);
  if (!pictures.length) return '';
  const names = quantities.map((q) => `$${quantityTex(q)}$`).join(' and ');
  return `\\begin{figure}[htbp]\n\\centering\n${pictures.join('\\hfill\n')}\n\\caption{${names} against $s$ at fixed $d$.}\n\\label{fig:${label}}\n\\end{figure}`;
}

/** "s/2", "2*s-eps" → "s/2", "2s - \varepsilon". */
const expressionTex = (text: string) => text.replace(/[^A-Za-z0-9 +\-*/^().]/g, '').replace(/\beps\b/g, '\\varepsilon ').replace(/(\d)\*([A-Za-z\\])/g, '$1$2').replace(/\*/g, '\\,').replace(/\bgamma\b/g, '\\Gamma');

function integralToLatex(input: Extract<CellInput, { kind: 'integral' }>, output: Record<string, unknown>, writer: LatexWriter): string {
  const what = input.form === 'bubble' && input.a && input.b
    ? `The bubble integral with propagator powers ${writer.inline(`a = ${expressionTex(input.a)}`)} and ${writer.inline(`b = ${expressionTex(input.b)}`)}`
    : `The Laurent expansion of ${writer.inline(expressionTex(input.expr ?? ''))}`;
  const where = `${writer.inline(`d = ${expressionTex(input.d)}`)}, to order ${writer.inline(epsilonPower(input.order) || '1')}`;
  const series = typeof output.lowest === 'number' && Array.isArray(output.coeffs) ? writer.equations([{ lhs: 'I', terms: seriesTerms(output.lowest, output.coeffs, writer.style, output.order as number | undefined) }]) : '';
  return [`${what} in ${where}:`, series].filter(Boolean).join('\n\n');
}

function setupToLatex(input: Extract<CellInput, { kind: 'setup' }>, writer: LatexWriter): string {
  return [
    `We study ${modelName(input.model)} with the action`,
    writer.display(actionTex(input.model)),
    `with ${writer.inline(parametersTex(input, writer.style))}, at ${input.loops} loop${input.loops === 1 ? '' : 's'} with ${input.digits} significant digits. The coupling is ${writer.inline('u = \\lambda\\mu^{-\\varepsilon}/\\big((4\\pi)^{d/2}\\,\\Gamma(s)\\big)')}, renormalised by minimal subtraction at fixed ${writer.inline('s')}.`,
  ].join('\n');
}

/** What a result cell was asked, in one sentence (inputs are never dumped as JSON). */
function inputSentence(input: CellInput): string {
  const uses = 'uses' in input && typeof input.uses === 'string' ? ` (from \\texttt{${escapeLatexText(input.uses)}})` : '';
  if (input.kind === 'scan') return `From $s = ${escapeMathText(input.from)}$ to $s = ${escapeMathText(input.to)}$ in ${input.points} points${uses}.`;
  if (input.kind === 'exponents' && input.fixedPoint) return `At the fixed point ${plainText(input.fixedPoint)}${uses}.`;
  return '';
}

/** A cell's result by its kind (the job contract's result of that kind; readers tolerate earlier-shaped results). */
function outputToLatex(cell: NotebookDocument['cells'][number], writer: LatexWriter): string {
  const { input, output } = cell;
  if (!isRecord(output)) return input.kind === 'setup' ? '' : '\\emph{Not computed.}';
  if ('error' in output) return `\\emph{This cell failed: ${plainText(isRecord(output.error) ? output.error.message : '')}}`;
  if (input.kind === 'integral') return integralToLatex(input, output, writer);
  if (input.kind === 'exponents') return exponentsToLatex(output, writer);
  if (input.kind === 'flow') return flowToLatex(output, writer);
  if (input.kind === 'fixedpoints') return fixedPointsToLatex(output, writer);
  if (input.kind === 'scan') return scanToLatex(output, writer, cell.label);
  return itemize(Object.entries(output).slice(0, 50).map(([key, v]) => `${plainText(key)}: ${plainText(typeof v === 'string' || typeof v === 'number' ? v : '(structured result, see the JSON export)')}`));
}
type ComparisonCell = Extract<CellInput, { kind: 'comparison' }>;

function modelText(model: Extract<CellInput, { kind: 'setup' }>['model']): string {
  if (model.preset === 'custom') return `a ${model.fields}-field model with potential \\texttt{${plainText(model.potential)}}`;
  return `the ${model.preset === 'on' ? 'O' : 'cubic'}(${plainText(model.N)}) model`;
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
  const source = dataset.source.trim() ? ` Source: ${plainText(dataset.source)}.` : '';
  return `Data: \\emph{${plainText(dataset.name)}} (dataset \\texttt{${escapeLatexText(dataset.label)}}, ${dataset.points.x.length} points).${source}`;
}

const mathNumber = (value: string | null | undefined, digits?: number) => {
  const tex = numberTex(value, digits);
  return tex === '--' ? '--' : `$${tex}$`;
};

/** A comparison result exactly as the job contract has it (an earlier-shaped one is exported as plain fields). */
function isComparisonResult(output: unknown): output is CompareResult {
  return CompareResult.safeParse(output).success;
}

/** A tabular ruled with \\hline, ruled as booktabs: top, middle and bottom rules. */
function withBooktabsRules(tabular: string): string {
  const rules = tabular.split('\\hline').length - 1;
  let seen = 0;
  return tabular.replace(/\\hline/g, () => {
    seen += 1;
    return seen === 1 ? '\\toprule' : seen === rules ? '\\bottomrule' : '\\midrule';
  });
}

/** A comparison: the setup of its series, the dataset with its source, the χ² summary per variant, marks, kinks and notes. */
function comparisonToLatex(input: ComparisonCell, output: unknown, document: NotebookDocument, writer: LatexWriter): string {
  const intro = [comparisonSetupText(input, document, writer), comparisonDatasetText(input, document)].join(' ');
  if (!isComparisonResult(output)) return [intro, outputToLatex({ label: input.uses, input, output }, writer)].filter(Boolean).join('\n\n');
  const result = output;
  const axis = result.xAxis === 's' ? 's' : '\\Delta_{\\phi}';
  const heading = `${writer.inline(quantityTex(result.quantity))} against ${writer.inline(axis)} at ${writer.inline(`d = ${numberTex(result.d)}`)}${result.fixedPoint ? `, fixed point ${plainText(result.fixedPoint)}` : ''}.`;
  const marks = [
    `${writer.inline(`s = d/2`)} at ${writer.inline(`${axis} = ${numberTex(result.marks.meanFieldEnd.x)}`)}`,
    ...(result.marks.sStar ? [`${writer.inline('s^*')} at ${writer.inline(`${axis} = ${numberTex(result.marks.sStar.x)}`)}`] : []),
    `data from ${writer.inline(`${axis} = ${numberTex(result.marks.dataRange[0])}`)} to ${writer.inline(numberTex(result.marks.dataRange[1]))}`,
  ];
  const chi2 = `${writer.inline('\\chi^2')} is the sum of squared pulls (residual series $-$ data over the data's error on the side of the series) over the points with a non-zero error there; ${writer.inline('\\chi^2')}/point divides by that count.\n\n\\begin{center}\n${withBooktabsRules(comparisonSummaryTex(result))}\n\\end{center}`;
  const kinks = result.kinks?.length
    ? [
        table(['kink', writer.inline(axis), 'uncertainty', writer.inline(quantityTex(result.quantity))], result.kinks.map((k, i) => [String(i + 1), ...[k.x, k.uncertainty, k.y].map((v) => mathNumber(v, 6))]), 'rlll'),
        `Distance of each series from the kink${result.kinks.length === 1 ? '' : 's'}:`,
        table(['series', ...result.kinks.map((_, i) => `kink ${i + 1}`)], result.variants.map((v) => [variantTex(v), ...result.kinks!.map((k) => mathNumber(k.distance[v.key] ?? null, 6))]), `l${'l'.repeat(result.kinks.length)}`),
      ].join('\n\n')
    : result.kinks ? 'No kink found in the boundary.' : '';
  const notes = result.notes.length ? `\\begin{itemize}\n${result.notes.map((note) => `\\item ${plainText(note)}`).join('\n')}\n\\end{itemize}` : '';
  return [intro, heading, `Marks: ${marks.join('; ')}.`, chi2, kinks, notes].filter(Boolean).join('\n\n');
}


/** The derivation trail of every flow cell, graph by graph, and how the pole parts give β and γ_{φ²}. */
function trailAppendix(document: NotebookDocument, writer: LatexWriter): string {
  const flows = document.cells.filter((cell) => cell.input.kind === 'flow' && isRecord(cell.output) && Array.isArray(cell.output.trail));
  if (!flows.length) return '';
  const math = { inline: (tex: string) => writer.inline(tex), align: (body: string) => writer.align(body) };
  const parts = flows.map((cell) => {
    const graphs = strings((cell.output as Record<string, unknown>).trail).filter(isTrailGraph);
    const sections = graphs.map((graph) => graphSection(graph, writer.style, math, plainText, sentence));
    return [`\\section*{Derivation trail of \\texttt{${escapeLatexText(cell.label)}}}`, TRAIL_INTRO, ...sections, assemblyText(graphs, writer)].join('\n\n');
  });
  return ['\\appendix', ...parts].join('\n\n');
}

/** Significant digits of a decimal string. */
const digitsOf = (text: string) => text.replace(/[eE].*$/, '').replace(/[-+.]/g, '').replace(/^0+/, '').length;

const TRAIL_INTRO =
  'For each graph: its dimensionally regularised integral $I$ in terms of the one-loop function $G(a,b)$, its Laurent series, the pole parts $K I_{\\gamma}$ of its divergent subgraphs, the subtracted integral $\\bar I$ and its pole part $K\\bar I$. The weight is the graph\'s tensor factor with sign and symmetry factor, projected on the couplings.';

/** Simple-pole residues a₁ per loop order and the β and γ_{φ²} coefficients they give (§1: β = −εg + Σ_L L a₁⁽ᴸ⁾, γ_{φ²} = (g·∂) z₁). */
function assemblyText(graphs: Parameters<typeof simplePoleResidues>[0], writer: LatexWriter): string {
  // the trail's residues are rounded in their last digit: their products and sums keep one digit fewer
  const digits = Math.max(2, ...graphs.flatMap((g) => g.pole.coeffs.map(digitsOf))) - 1;
  const rows = (fn: string, name: (onto: string) => string): Equation[] =>
    simplePoleResidues(graphs, fn).map((r) => ({
      lhs: `${r.loops}\\,${name(r.onto)}\\big|_{${monomialTex(r.monomial)}}`,
      terms: valueTerms(r.value.times(r.loops).toSignificantDigits(digits).toString(), writer.style),
    }));
  const equations = [...rows('vertex', (onto) => `a_1^{(${escapeMathText(onto)})}`), ...rows('massInsertion', () => 'z_1')];
  if (!equations.length) return '';
  return [
    '\\subsection*{From pole parts to $\\beta$ and $\\gamma_{\\phi^2}$}',
    `Each graph contributes ${writer.inline('-w_G\\,r_G')} to the simple-pole residue of its function, with ${writer.inline('w_G')} its projected weight and ${writer.inline('r_G')} the coefficient of ${writer.inline('1/\\varepsilon')} in ${writer.inline('K\\bar I_G')}. With ${writer.inline('u_0 = Z_\\phi^{-2}\\big(u + \\sum_k a_k/\\varepsilon^k\\big)')} and ${writer.inline('Z_\\phi = 1')} for ${writer.inline('s < 2')}, the ${writer.inline('L')}-loop residues give ${writer.inline('\\beta = -\\varepsilon u + \\sum_L L\\,a_1^{(L)}')} and ${writer.inline('\\gamma_{\\phi^2} = \\sum_L L\\,z_1^{(L)}')}: the coefficients below are those of the RG functions above.`,
    writer.equations(equations),
  ].join('\n\n');
}

const PREAMBLE = [
  '\\documentclass[10pt]{article}',
  '\\usepackage[a4paper,margin=2.5cm]{geometry}',
  '\\usepackage{amsmath,amssymb,booktabs,longtable}',
  '\\usepackage[utf8]{inputenc}',
  '\\allowdisplaybreaks',
  '\\setlength{\\parindent}{0pt}',
  '\\setlength{\\parskip}{0.5\\baselineskip}',
  // the default bullet comes from the TS1 text font, which the base fonts only have as a bitmap
  '\\renewcommand{\\labelitemi}{$\\bullet$}',
];

/** How the numbers of this export are written, for the reader. */
function numbersNote(style: NumberStyle): string {
  const digits = style.digits ? `rounded to ${style.digits} significant digits` : 'given to all computed digits';
  const exact = style.exact ? '; a fraction stands for a coefficient whose computed digits are those of a rational with a denominator of at most 1000' : '';
  return `\\noindent{\\small Numbers are ${digits}${exact}.}`;
}

/** A cell's heading: its kind in words, its label at the right. */
const cellHeading = (cell: NotebookDocument['cells'][number]) =>
  `\\subsection*{${escapeLatexText(cellKindTitles[cell.input.kind])}\\hfill{\\normalfont\\small\\texttt{${escapeLatexText(cell.label)}}}}`;

function cellToLatex(cell: NotebookDocument['cells'][number], document: NotebookDocument, writer: LatexWriter): string {
  if (cell.input.kind === 'note') return noteToLatex(cell.input.text, writer);
  if (cell.input.kind === 'setup') return [cellHeading(cell), setupToLatex(cell.input, writer)].join('\n\n');
  if (cell.input.kind === 'comparison') return [cellHeading(cell), comparisonToLatex(cell.input, cell.output, document, writer)].join('\n\n');
  return [cellHeading(cell), inputSentence(cell.input), outputToLatex(cell, writer)].filter(Boolean).join('\n\n');
}

/**
 * A LaTeX document ready for a paper: the model as its action, results as equations that break to fit
 * the page, tables in booktabs style, scans as figures, the relations used, and the derivation trail as
 * an appendix. Needs amsmath, amssymb, booktabs, longtable and geometry (TeX Live's latex-base and
 * latex-recommended). Safe to compile for someone who did not write the notebook: all text is escaped and
 * formulas keep only allow-listed commands; what was removed is said at the top, in a comment and in the document.
 */
export function toLatexDocument(document: NotebookDocument, options: LatexExportOptions = { exact: true }): string {
  const writer = new LatexWriter(options);
  const body = document.cells.map((cell) => cellToLatex(cell, document, writer));
  const appendix = trailAppendix(document, writer);
  const removals = writer.report.empty ? null : writer.report.summary();
  return [
    ...PREAMBLE.slice(0, 1),
    ...(removals ? [`% Export note: ${removals}`] : []),
    ...PREAMBLE.slice(1),
    `\\title{${plainText(document.title)}}`,
    '\\date{}',
    '\\begin{document}',
    '\\maketitle',
    removals ? `\\noindent\\emph{Export note: ${escapeLatexText(removals)}}\n` : '',
    document.summary ? `\\begin{abstract}\n${plainText(document.summary)}\n\\end{abstract}\n` : '',
    `${numbersNote(options)}\n`,
    ...body.map((part) => `${part}\n`),
    appendix,
    '\\end{document}',
    '',
  ].join('\n');
}
