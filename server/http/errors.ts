import { errorStatus, type ErrorCode, type ApiErrorBody } from '../../shared/api/errors';
import type { RowProblem } from '../../shared/notebook/datasets';

/** Problems listed in one reply; the count says how many there were in all. */
export const MAX_LISTED_PROBLEMS = 50;

/** The one error type services throw; the error middleware maps `code` to an HTTP status. */
export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: Record<string, string>,
    /** Rows of a table that could not be read (invalid_table), by line number. */
    readonly table?: { problems: RowProblem[]; problemCount: number },
  ) {
    super(message);
  }

  get status(): number {
    return errorStatus[this.code];
  }

  toBody(): ApiErrorBody {
    return {
      error: {
        code: this.code,
        message: this.message,
        ...(this.fields ? { fields: this.fields } : {}),
        ...(this.table ? { problems: this.table.problems.slice(0, MAX_LISTED_PROBLEMS), problemCount: this.table.problemCount } : {}),
      },
    };
  }
}
