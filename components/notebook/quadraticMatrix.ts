import { asPolynomial, isObject } from './resultShapes';
import { polynomialTex } from './texFormat';

/** "phi1*phi2" → "\\phi_{1}\\phi_{2}", "phi1^2" → "\\phi_{1}^{2}". */
export const operatorTex = (operator: string) => operator.replace(/phi(\d+)/g, '\\phi_{$1}').replace(/\^(\d+)/g, '^{$1}').replace(/\*/g, '');

/** Letters that stand for the distinct entries of a matrix too wide to print in place. */
const ENTRY_NAMES = 'abcdefghjkmnpqrstuvwxyz';
const entryName = (index: number) => (index < ENTRY_NAMES.length ? ENTRY_NAMES[index] : `m_{${index + 1}}`);

/**
 * `lhs = ` a square array of coupling polynomials with rows and columns labelled, or null when the shape is
 * not understood. A matrix with more than three rows or with sums as entries would run off a phone: its
 * distinct non-zero entries are then named a, b, c … and written out after it, each line breaking on its own.
 */
function labelledMatrixTex(lhs: string, labels: unknown, matrix: unknown, significant: number): string | null {
  if (!Array.isArray(labels) || !Array.isArray(matrix)) return null;
  const names = labels.map(String);
  const rows = matrix as unknown[];
  if (rows.length !== names.length || !rows.every((row) => Array.isArray(row) && row.length === names.length)) return null;
  const polynomials = rows.map((row) => (row as unknown[]).map((entry) => asPolynomial(entry)));
  if (polynomials.some((row) => row.some((entry) => entry === null))) return null;
  const entries = polynomials.map((row) => row.map((terms) => polynomialTex(terms!, significant)));
  const wide = names.length > 3 || polynomials.some((row) => row.some((terms) => terms!.filter((term) => !isZeroTex(polynomialTex([term]))).length > 1));
  // entries are told apart by every digit, so two that agree only at the display precision keep their own letters
  const exact = polynomials.map((row) => row.map((terms) => polynomialTex(terms!, Number.POSITIVE_INFINITY)));
  const distinct = [...new Set(exact.flat().filter((tex) => tex !== '0'))];
  const shownOf = new Map(exact.flat().map((tex, index) => [tex, entries.flat()[index]]));
  const cell = (i: number, j: number) => (wide && exact[i][j] !== '0' ? entryName(distinct.indexOf(exact[i][j])) : entries[i][j]);
  const header = `& ${names.map(operatorTex).join(' & ')}`;
  const body = entries.map((row, i) => `${operatorTex(names[i])} & ${row.map((_, j) => cell(i, j)).join(' & ')}`).join(' \\\\ ');
  const array = `${lhs} = \\begin{array}{c|${'c'.repeat(names.length)}} ${header} \\\\ \\hline ${body} \\end{array}`;
  if (!wide) return array;
  const definitions = distinct.map((tex, index) => `${entryName(index)} = ${shownOf.get(tex)}`).join(',\\quad\\allowbreak ');
  return `${array}\\quad\\allowbreak \\text{with}\\ ${definitions}`;
}

const isZeroTex = (tex: string) => tex === '0';

/** The anomalous-dimension matrix of the quadratic operators as one typeset array, rows and columns labelled. */
export function quadraticMatrixTex(value: unknown, significant = 10): string | null {
  if (!isObject(value)) return null;
  return labelledMatrixTex('\\gamma_{(kl),(ij)}', value.operators, value.matrix, significant);
}

/** The field anomalous-dimension matrix γ_φ (present when it is not ∝ δ_ab), rows and columns labelled by the fields. */
export function fieldMatrixTex(value: unknown, significant = 10): string | null {
  if (!isObject(value)) return null;
  return labelledMatrixTex('(\\gamma_{\\phi})_{ab}', value.fields, value.matrix, significant);
}
