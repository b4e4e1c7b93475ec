import type { RowProblem } from '../notebook/datasets';
/** Error codes the API returns in `{ error: { code, message, fields? } }`. */
export const errorStatus = {
  validation_failed: 400,
  invalid_table: 400,
  malformed_json: 400,
  invalid_reset_token: 400,
  invalid_verification_token: 400,
  unsupported_encoding: 415,
  job_too_large: 422,
  email_not_verified: 403,
  unauthenticated: 401,
  wrong_credentials: 401,
  /** A signed-in person's current password did not match (account settings): not a sign-out. */
  wrong_password: 403,
  forbidden: 403,
  cross_site_request: 403,
  not_found: 404,
  email_taken: 409,
  conflict: 409,
  payload_too_large: 413,
  rate_limited: 429,
  queue_full: 429,
  internal: 500,
  mail_unavailable: 503,
} as const;

export type ErrorCode = keyof typeof errorStatus;

export interface ApiErrorBody {
  error: { code: ErrorCode; message: string; fields?: Record<string, string>; problems?: RowProblem[]; problemCount?: number };
}
