import type { z } from 'zod';
import { ApiError } from '../../hooks/api/client';

export interface FormErrors {
  fields: Record<string, string>;
  message?: string;
}

/** Check input with the same schema the server uses, so most mistakes show before a round trip. */
export function checkLocally<S extends z.ZodType>(schema: S, input: unknown): { data?: z.output<S>; errors: FormErrors } {
  const result = schema.safeParse(input);
  if (result.success) return { data: result.data, errors: { fields: {} } };
  const fields: Record<string, string> = {};
  for (const issue of result.error.issues) fields[String(issue.path[0] ?? '_')] ??= issue.message;
  return { errors: { fields } };
}

export function errorsFromServer(error: unknown): FormErrors {
  if (error instanceof ApiError) return { fields: error.fields, message: error.message };
  return { fields: {}, message: 'Something unexpected went wrong. Try again.' };
}
