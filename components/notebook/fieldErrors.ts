import { cellInput, cellLabel, type CellInput } from '../../shared/notebook';

export type FieldErrors = Record<string, string>;

/** What a cell's fields are checked against beyond its own input: the d of each model & parameters cell, by label. */
export interface FieldContext {
  setupDimensions?: ReadonlyMap<string, string | undefined>;
}

interface Issue {
  code: string;
  message: string;
  origin?: string;
  minimum?: unknown;
  maximum?: unknown;
}

/** Messages keyed by the dotted path of the field they belong to ("model.N", "d", "label"). */
export function cellFieldErrors(label: string, input: unknown, context: FieldContext = {}): FieldErrors {
  const errors: FieldErrors = {};
  const labelCheck = cellLabel.safeParse(label);
  if (!labelCheck.success) errors.label = labelCheck.error.issues[0]?.message ?? 'Check the label';
  const inputCheck = cellInput.safeParse(input);
  if (!inputCheck.success) {
    for (const issue of inputCheck.error.issues) {
      const path = issue.path.map(String).join('.') || 'input';
      errors[path] ??= friendlyMessage(issue as Issue);
    }
  }
  if (isScan(input)) Object.assign(errors, { ...scanWindowErrors(input, context), ...errors });
  return errors;
}

/** The validator's own wording ("Too small: expected number to be >=2") never reaches a field. */
const RAW_VALIDATOR_TEXT = /^(Too (small|big)|Invalid|Expected|Unrecognized)|expected /i;

function friendlyMessage(issue: Issue): string {
  if (issue.code === 'invalid_type') return /number/.test(issue.message) ? 'Enter a whole number' : 'Fill in this field';
  if (!RAW_VALIDATOR_TEXT.test(issue.message)) return issue.message;
  const unit = issue.origin === 'string' ? ' characters' : issue.origin === 'array' ? ' choices' : '';
  if (issue.code === 'too_small') return issue.origin === 'string' && issue.minimum === 1 ? 'Fill in this field' : `At least ${issue.minimum}${unit}`;
  if (issue.code === 'too_big') return `At most ${issue.maximum}${unit}`;
  return 'Check this field';
}

export const isValidCell = (label: string, input: CellInput, context: FieldContext = {}) => Object.keys(cellFieldErrors(label, input, context)).length === 0;

/** Text of a whole-number field as the number the schema expects; anything else stays NaN so the field shows its message. */
export function wholeNumber(text: string): number {
  return /^\s*-?\d+\s*$/.test(text) ? Number(text) : Number.NaN;
}

type ScanInput = Extract<CellInput, { kind: 'scan' }>;

const isScan = (input: unknown): input is ScanInput => typeof input === 'object' && input !== null && (input as { kind?: unknown }).kind === 'scan';

const DECIMAL = /^\s*([+-]?)(\d*)(?:\.(\d*))?\s*$/;

/** A decimal text as an exact integer over 10^scale; null for anything else. */
function exactDecimal(text: string | undefined): { units: bigint; scale: number } | null {
  const match = text === undefined ? null : DECIMAL.exec(text);
  if (!match || (match[2] === '' && !match[3])) return null;
  const fraction = match[3] ?? '';
  const units = BigInt(`${match[2] || '0'}${fraction}`);
  return { units: match[1] === '-' ? -units : units, scale: fraction.length };
}

/** The sign of 2·s − d, exactly (ε = 2s − d, docs/physics.md §3). */
function signOfEpsilon(s: { units: bigint; scale: number }, d: { units: bigint; scale: number }): number {
  const scale = Math.max(s.scale, d.scale);
  const twice = 2n * s.units * 10n ** BigInt(scale - s.scale);
  const dimension = d.units * 10n ** BigInt(scale - d.scale);
  return twice === dimension ? 0 : twice > dimension ? 1 : -1;
}

/** d/2 written as a decimal: halving a terminating decimal terminates. */
function halfOf(d: { units: bigint; scale: number }): string {
  const units = (d.units * 5n).toString().padStart(d.scale + 2, '0');
  const cut = units.length - (d.scale + 1);
  return `${units.slice(0, cut)}.${units.slice(cut)}`.replace(/\.?0+$/, '');
}

/** The long-range window (d/2, 2] of s for a decimal d below 4, written out; null when there is none to state. */
export function longRangeWindow(dText: string | undefined): string | null {
  const d = exactDecimal(dText);
  if (!d || d.units <= 0n || signOfEpsilon({ units: 2n, scale: 0 }, d) <= 0) return null;
  return `(${halfOf(d)}, 2]`;
}

/**
 * A scan's range must lie in the long-range window d/2 < s ≤ 2 of its model & parameters cell
 * (docs/physics.md §3: at s ≤ d/2 the model is mean-field and ε = 2s − d ≤ 0 leaves no expansion).
 */
export function scanWindowErrors(input: Pick<ScanInput, 'uses' | 'from' | 'to'>, context: FieldContext): FieldErrors {
  const dText = context.setupDimensions?.get(input.uses);
  const d = exactDecimal(dText);
  if (!d || d.units <= 0n) return {};
  if (signOfEpsilon({ units: 2n, scale: 0 }, d) <= 0) {
    return { from: `With d = ${dText?.trim()} no s is left in (d/2, 2]: the long-range window needs d < 4` };
  }
  const half = halfOf(d);
  const errors: FieldErrors = {};
  const outside = `s must lie in (d/2, 2] = (${half}, 2]: at s ≤ ${half} the model is mean-field, with no ε-expansion`;
  const from = exactDecimal(input.from);
  const to = exactDecimal(input.to);
  if (from && signOfEpsilon(from, d) <= 0) errors.from = outside;
  if (to && signOfEpsilon(to, d) <= 0) errors.to = outside;
  return errors;
}
