import { z } from 'zod';
import { cellInput, cellKindTitles, cellLabel, type CellInput } from './cells';

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

export function escapeLatexText(text: string): string {
  return text.replace(/[\\{}#$%&_^~]/g, (c) => LATEX_SPECIALS[c]);
}

/** Note text: prose is escaped, $…$ and $$…$$ pass through as mathematics. */
function noteToLatex(text: string): string {
  return text
    .split(/(\$\$[\s\S]+?\$\$|\$[^$\n]+?\$)/)
    .map((part) => (part.startsWith('$$') ? `\\[${part.slice(2, -2)}\\]` : part.startsWith('$') ? part : escapeLatexText(part)))
    .join('')
    .replace(/^#+\s*(.*)$/gm, '\\paragraph{$1}');
}

function coefficientTex(coefficient: unknown): string {
  if (typeof coefficient === 'string') return coefficient;
  if (coefficient && typeof coefficient === 'object' && 'latex' in coefficient) return String((coefficient as { latex: unknown }).latex);
  return escapeLatexText(JSON.stringify(coefficient));
}

function seriesToLatex(lowest: number, coeffs: unknown[], order?: number): string {
  const terms = coeffs.map((c, k) => {
    const power = lowest + k;
    const epsilon = power === 0 ? '' : power === 1 ? '\\,\\varepsilon' : `\\,\\varepsilon^{${power}}`;
    return `\\left(${coefficientTex(c)}\\right)${epsilon}`;
  });
  const remainder = `O(\\varepsilon^{${(order ?? lowest + coeffs.length - 1) + 1}})`;
  return `\\begin{multline*}\n${[...terms, remainder].join('\n + ')}\n\\end{multline*}`;
}

function outputToLatex(output: unknown): string {
  if (!output || typeof output !== 'object') return '';
  const value = output as Record<string, unknown>;
  if (typeof value.lowest === 'number' && Array.isArray(value.coeffs)) return seriesToLatex(value.lowest, value.coeffs, value.order as number | undefined);
  if (value.values && typeof value.values === 'object') {
    const rows = Object.entries(value.values as Record<string, unknown>).map(([name, v]) => `${escapeLatexText(name)} & ${escapeLatexText(String(v))} \\\\`);
    return `\\begin{tabular}{ll}\n\\hline\nquantity & value \\\\\n\\hline\n${rows.join('\n')}\n\\hline\n\\end{tabular}`;
  }
  if ('error' in value) return `\\emph{This cell failed: ${escapeLatexText(String((value.error as { message?: unknown })?.message ?? ''))}}`;
  return `\\begin{verbatim}\n${JSON.stringify(output, null, 2).slice(0, 20_000)}\n\\end{verbatim}`;
}

function inputToLatex(input: CellInput): string {
  const fields = Object.entries(input).filter(([key]) => key !== 'kind');
  return `\\begin{description}\n${fields.map(([key, v]) => `\\item[${escapeLatexText(key)}] \\texttt{${escapeLatexText(typeof v === 'string' ? v : JSON.stringify(v))}}`).join('\n')}\n\\end{description}`;
}

/** A standalone LaTeX document: notes as text, inputs as descriptions, results as equations and tables. */
export function toLatexDocument(document: NotebookDocument): string {
  const body = document.cells.map((cell) => {
    if (cell.input.kind === 'note') return noteToLatex(cell.input.text);
    const heading = `\\subsection*{${escapeLatexText(cellKindTitles[cell.input.kind])}: \\texttt{${escapeLatexText(cell.label)}}}`;
    return [heading, inputToLatex(cell.input), outputToLatex(cell.output)].filter(Boolean).join('\n\n');
  });
  return [
    '\\documentclass{article}',
    '\\usepackage{amsmath,amssymb}',
    '\\usepackage[utf8]{inputenc}',
    `\\title{${escapeLatexText(document.title)}}`,
    '\\date{}',
    '\\begin{document}',
    '\\maketitle',
    document.summary ? `${escapeLatexText(document.summary)}\n` : '',
    ...body.map((part) => `${part}\n`),
    '\\end{document}',
    '',
  ].join('\n');
}
