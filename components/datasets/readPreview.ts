import { extractPoints, previewOf, readTable, TableError, type ParsedTable } from '../../shared/notebook/datasetParsing';
import type { DatasetDescription, RowProblem, TablePreview } from '../../shared/notebook/datasets';
import type { HeaderChoice } from './draft';

export interface TableProblems {
  message: string;
  problems: RowProblem[];
  problemCount: number;
}

export type PreviewOutcome = { table: ParsedTable; preview: TablePreview } | TableProblems;
export type PointsOutcome = { rowCount: number; xRange: [string, string] } | TableProblems;

function problemsOf(error: unknown): TableProblems {
  if (error instanceof TableError) return { message: error.message, problems: error.problems, problemCount: error.problemCount };
  return { message: error instanceof Error ? error.message : 'The table cannot be read.', problems: [], problemCount: 0 };
}

/** The table read in the app exactly as the server will read it, or why it cannot be. */
export function readPreview(content: string | Uint8Array, header: HeaderChoice, fileName?: string): PreviewOutcome {
  try {
    const table = readTable(content, { ...(header === 'guess' ? {} : { header: header === 'yes' }), ...(fileName ? { fileName } : {}) });
    return { table, preview: previewOf(table) };
  } catch (error) {
    return problemsOf(error);
  }
}

/** The mapped columns checked cell by cell, as the server checks them before storing anything. */
export function checkPoints(table: ParsedTable, description: Pick<DatasetDescription, 'mapping' | 'shape'>): PointsOutcome {
  try {
    const { rowCount, xRange } = extractPoints(table, description);
    return { rowCount, xRange };
  } catch (error) {
    return problemsOf(error);
  }
}
