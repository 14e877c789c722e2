export type ErrorCode =
  | 'VALIDATION_FAILED'
  | 'UNAUTHENTICATED'
  | 'FORBIDDEN'
  | 'NOT_FOUND'
  | 'CONFLICT'
  | 'UNPROCESSABLE'
  | 'CSRF_INVALID'
  | 'PAYLOAD_TOO_LARGE'
  | 'SERVICE_UNAVAILABLE'
  | 'INTERNAL';

export interface FieldError {
  field: string;
  message: string;
}

/** The one error type services throw; the error middleware turns it into `{ error: { code, message, fields? } }`. */
export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    readonly status: number,
    message: string,
    readonly fields?: FieldError[],
  ) {
    super(message);
    this.name = 'AppError';
  }

  static notFound(what: string) {
    return new AppError('NOT_FOUND', 404, `${what} not found`);
  }
  static forbidden(message = 'Your role cannot do this') {
    return new AppError('FORBIDDEN', 403, message);
  }
  static conflict(message: string, fields?: FieldError[]) {
    return new AppError('CONFLICT', 409, message, fields);
  }
  static unprocessable(message: string, fields?: FieldError[]) {
    return new AppError('UNPROCESSABLE', 422, message, fields);
  }
}
