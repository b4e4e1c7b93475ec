import { asPolynomial, isObject } from './resultShapes';
import { polynomialTex } from './texFormat';

/** "phi1*phi2" → "\\phi_{1}\\phi_{2}", "phi1^2" → "\\phi_{1}^{2}". */
const operatorTex = (operator: string) => operator.replace(/phi(\d+)/g, '\\phi_{$1}').replace(/\^(\d+)/g, '^{$1}').replace(/\*/g, '');

/** The anomalous-dimension matrix of the quadratic operators as one typeset array, rows and columns labelled. */
export function quadraticMatrixTex(value: unknown): string | null {
  if (!isObject(value) || !Array.isArray(value.operators) || !Array.isArray(value.matrix)) return null;
  const operators = value.operators.map(String);
  const rows = value.matrix as unknown[];
  if (rows.length !== operators.length || !rows.every((row) => Array.isArray(row) && row.length === operators.length)) return null;
  const entries = rows.map((row) => (row as unknown[]).map((entry) => {
    const terms = asPolynomial(entry);
    return terms ? polynomialTex(terms) : null;
  }));
  if (entries.some((row) => row.some((entry) => entry === null))) return null;
  const header = `& ${operators.map(operatorTex).join(' & ')}`;
  const body = entries.map((row, i) => `${operatorTex(operators[i])} & ${row.join(' & ')}`).join(' \\\\ ');
  return `\\gamma_{(kl),(ij)} = \\begin{array}{c|${'c'.repeat(operators.length)}} ${header} \\\\ \\hline ${body} \\end{array}`;
}
