/** Error codes shared by every engine layer; the job layer maps them to `{error:{code,message}}`. */
export type EngineErrorCode =
  | 'pole'
  | 'domain'
  | 'not-affine'
  | 'not-representable'
  | 'singular'
  | 'limit'
  | 'parse'
  | 'invalid';

export class EngineError extends Error {
  readonly code: EngineErrorCode;
  constructor(code: EngineErrorCode, message: string) {
    super(message);
    this.code = code;
    this.name = 'EngineError';
  }
}

export function fail(code: EngineErrorCode, message: string): never {
  throw new EngineError(code, message);
}
