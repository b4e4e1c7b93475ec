import { asPolynomial, isObject } from './resultShapes';
import { polynomialTex } from './texFormat';

/** "phi1*phi2" → "\\phi_{1}\\phi_{2}", "phi1^2" → "\\phi_{1}^{2}". */
const operatorTex = (operator: string) => operator.replace(/phi(\d+)/g, '\\phi_{$1}').replace(/\^(\d+)/g, '^{$1}').replace(/\*/g, '');

/** `lhs = ` a square array of coupling polynomials with rows and columns labelled, or null when the shape is not understood. */
function labelledMatrixTex(lhs: string, labels: unknown, matrix: unknown): string | null {
  if (!Array.isArray(labels) || !Array.isArray(matrix)) return null;
  const names = labels.map(String);
  const rows = matrix as unknown[];
  if (rows.length !== names.length || !rows.every((row) => Array.isArray(row) && row.length === names.length)) return null;
  const entries = rows.map((row) => (row as unknown[]).map((entry) => {
    const terms = asPolynomial(entry);
    return terms ? polynomialTex(terms) : null;
  }));
  if (entries.some((row) => row.some((entry) => entry === null))) return null;
  const header = `& ${names.map(operatorTex).join(' & ')}`;
  const body = entries.map((row, i) => `${operatorTex(names[i])} & ${row.join(' & ')}`).join(' \\\\ ');
  return `${lhs} = \\begin{array}{c|${'c'.repeat(names.length)}} ${header} \\\\ \\hline ${body} \\end{array}`;
}

/** The anomalous-dimension matrix of the quadratic operators as one typeset array, rows and columns labelled. */
export function quadraticMatrixTex(value: unknown): string | null {
  if (!isObject(value)) return null;
  return labelledMatrixTex('\\gamma_{(kl),(ij)}', value.operators, value.matrix);
}

/** The field anomalous-dimension matrix γ_φ (present when it is not ∝ δ_ab), rows and columns labelled by the fields. */
export function fieldMatrixTex(value: unknown): string | null {
  if (!isObject(value)) return null;
  return labelledMatrixTex('(\\gamma_{\\phi})_{ab}', value.fields, value.matrix);
}
