import type { z } from 'zod';
import { AppError } from './errors';

/** A high surrogate not followed by a low one, or a low surrogate not preceded by a high one. */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

export const BROKEN_TEXT_MESSAGE = 'Contains a broken character (an unpaired UTF-16 surrogate); retype or re-paste this text';

/**
 * The first place in a parsed JSON value (or query) whose text is not well-formed Unicode: a string
 * value, or a field name, holding a lone UTF-16 surrogate. Such text cannot be stored or e-mailed
 * faithfully (UTF-8 has no encoding for it).
 */
export const findBrokenText = (value: unknown): string | undefined => findText(value, (text) => LONE_SURROGATE.test(text));

export const NUL_TEXT_MESSAGE = 'Contains a NUL character (U+0000), which text fields cannot hold; remove it';

/** The first place whose text holds U+0000: well-formed, but PostgreSQL's text type refuses it (a 500 otherwise). */
export const findNulText = (value: unknown): string | undefined => findText(value, (text) => text.includes('\u0000'));

/** The first string value or field name matching `bad`, as a dotted path. Walks iteratively, so nesting depth costs no stack. */
function findText(value: unknown, bad: (text: string) => boolean): string | undefined {
  const pending: { value: unknown; path: string[] }[] = [{ value, path: [] }];
  while (pending.length) {
    const { value: current, path } = pending.pop()!;
    if (typeof current === 'string') {
      if (bad(current)) return fieldName(path);
      continue;
    }
    if (typeof current !== 'object' || current === null) continue;
    for (const [key, child] of Object.entries(current)) {
      const childPath = [...path, key];
      if (bad(key)) return fieldName(childPath);
      pending.push({ value: child, path: childPath });
    }
  }
  return undefined;
}

const fieldName = (path: string[]) => (path.length ? path.join('.') : '_');

/** Parse with a zod schema; failures become one 400 with a message per field. */
export function parseInput<S extends z.ZodType>(schema: S, value: unknown): z.output<S> {
  const brokenField = findBrokenText(value);
  if (brokenField !== undefined) throw validationError(new Map([[brokenField, BROKEN_TEXT_MESSAGE]]));
  const nulField = findNulText(value);
  if (nulField !== undefined) throw validationError(new Map([[nulField, NUL_TEXT_MESSAGE]]));
  const result = schema.safeParse(value ?? {});
  if (result.success) return result.data;
  // A Map, not an object literal: field names such as "__proto__" are data here, never a prototype.
  const fields = new Map<string, string>();
  const note = (key: string, message: string) => {
    if (!fields.has(key)) fields.set(key, message);
  };
  for (const issue of result.error.issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const unknownKey of issue.keys) note([...issue.path.map(String), unknownKey].join('.'), 'Unknown field');
      continue;
    }
    note(issue.path.length ? issue.path.join('.') : '_', issue.message);
  }
  throw validationError(fields);
}

function validationError(fields: Map<string, string>): AppError {
  const summary = [...fields]
    .map(([key, message]) => (key === '_' ? message : `${key}: ${message}`))
    .join('; ');
  return new AppError('validation_failed', `Some fields need attention: ${summary}`, Object.fromEntries(fields));
}
