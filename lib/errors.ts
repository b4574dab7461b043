/** The one error type the app raises on purpose. Its code decides the HTTP status and what the user reads. */
export type AppErrorCode =
  | 'unauthenticated'
  | 'forbidden'
  | 'not_found'
  | 'invalid'
  | 'conflict'
  | 'throttled'
  | 'unsupported';

const STATUS: Record<AppErrorCode, number> = {
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  invalid: 400,
  conflict: 409,
  throttled: 429,
  unsupported: 415,
};

const DEFAULT_MESSAGE: Record<AppErrorCode, string> = {
  unauthenticated: 'Please sign in.',
  forbidden: 'Your role in this organization does not allow that.',
  not_found: 'Not found.',
  invalid: 'Some input is not valid.',
  conflict: 'That conflicts with existing data.',
  throttled: 'Too many attempts. Wait a few minutes and try again.',
  unsupported: 'Unsupported request.',
};

export class AppError extends Error {
  readonly code: AppErrorCode;
  readonly fields?: Record<string, string[]>;
  constructor(code: AppErrorCode, message?: string, fields?: Record<string, string[]>) {
    super(message ?? DEFAULT_MESSAGE[code]);
    this.code = code;
    this.fields = fields;
  }
  get status() {
    return STATUS[this.code];
  }
}

export function isAppError(e: unknown): e is AppError {
  return e instanceof AppError;
}
