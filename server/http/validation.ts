import type { z } from 'zod';
import { AppError } from './errors';

/** Parse with a zod schema; failures become one 400 with a message per field. */
export function parseInput<S extends z.ZodType>(schema: S, value: unknown): z.output<S> {
  const result = schema.safeParse(value ?? {});
  if (result.success) return result.data;
  const fields: Record<string, string> = {};
  for (const issue of result.error.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_';
    if (issue.code === 'unrecognized_keys') {
      for (const unknownKey of issue.keys) fields[unknownKey] ??= 'Unknown field';
      continue;
    }
    fields[key] ??= issue.message;
  }
  const summary = Object.entries(fields)
    .map(([key, message]) => (key === '_' ? message : `${key}: ${message}`))
    .join('; ');
  throw new AppError('validation_failed', `Some fields need attention: ${summary}`, fields);
}
