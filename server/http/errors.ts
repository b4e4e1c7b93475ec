import { errorStatus, type ErrorCode, type ApiErrorBody } from '../../shared/api/errors';

/** The one error type services throw; the error middleware maps `code` to an HTTP status. */
export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message);
  }

  get status(): number {
    return errorStatus[this.code];
  }

  toBody(): ApiErrorBody {
    return { error: { code: this.code, message: this.message, ...(this.fields ? { fields: this.fields } : {}) } };
  }
}
