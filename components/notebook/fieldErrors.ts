import { cellInput, cellLabel, type CellInput } from '../../shared/notebook';

export type FieldErrors = Record<string, string>;

/** Messages keyed by the dotted path of the field they belong to ("model.N", "d", "label"). */
export function cellFieldErrors(label: string, input: unknown): FieldErrors {
  const errors: FieldErrors = {};
  const labelCheck = cellLabel.safeParse(label);
  if (!labelCheck.success) errors.label = labelCheck.error.issues[0]?.message ?? 'Check the label';
  const inputCheck = cellInput.safeParse(input);
  if (!inputCheck.success) {
    for (const issue of inputCheck.error.issues) {
      const path = issue.path.map(String).join('.') || 'input';
      errors[path] ??= friendlyMessage(issue.code, issue.message);
    }
  }
  return errors;
}

function friendlyMessage(code: string, message: string): string {
  if (code === 'invalid_type' && /number/.test(message)) return 'Enter a whole number';
  if (code === 'invalid_type') return 'Fill in this field';
  if (code === 'too_small' && /string/.test(message)) return 'Fill in this field';
  return message;
}

export const isValidCell = (label: string, input: CellInput) => Object.keys(cellFieldErrors(label, input)).length === 0;

/** Text of a whole-number field as the number the schema expects; anything else stays NaN so the field shows its message. */
export function wholeNumber(text: string): number {
  return /^\s*-?\d+\s*$/.test(text) ? Number(text) : Number.NaN;
}
