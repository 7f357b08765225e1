// Typed errors thrown by lib code; http.ts maps them to the error body.

export type ErrorCode =
  | 'BAD_REQUEST'
  | 'UNAUTHORIZED'
  | 'FORBIDDEN'
  | 'NOT_FOUND'
  | 'METHOD_NOT_ALLOWED'
  | 'CONFLICT'
  | 'PAYLOAD_TOO_LARGE'
  | 'UNSUPPORTED_MEDIA_TYPE'
  | 'UNPROCESSABLE_CONTENT'
  | 'TOO_MANY_REQUESTS'
  | 'SERVICE_UNAVAILABLE'
  | 'INTERNAL_SERVER_ERROR';

export const STATUS_BY_CODE: Record<ErrorCode, number> = {
  BAD_REQUEST: 400,
  UNAUTHORIZED: 401,
  FORBIDDEN: 403,
  NOT_FOUND: 404,
  METHOD_NOT_ALLOWED: 405,
  CONFLICT: 409,
  PAYLOAD_TOO_LARGE: 413,
  UNSUPPORTED_MEDIA_TYPE: 415,
  UNPROCESSABLE_CONTENT: 422,
  TOO_MANY_REQUESTS: 429,
  SERVICE_UNAVAILABLE: 503,
  INTERNAL_SERVER_ERROR: 500,
};

export type FieldErrors = Record<string, string[]>;

export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: FieldErrors,
    readonly headers?: Record<string, string>,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export class ValidationError extends AppError {
  constructor(message: string, fields?: FieldErrors) {
    super('BAD_REQUEST', message, fields);
  }
}
export class UnauthorizedError extends AppError {
  constructor(message = 'Sign in first') {
    super('UNAUTHORIZED', message);
  }
}
/** A disabled account that gave the right password. */
export class AccountDisabledError extends UnauthorizedError {
  constructor() {
    super('This account is disabled. Ask an admin to enable it.');
  }
}
export class ForbiddenError extends AppError {
  constructor(message = 'Your role does not allow this') {
    super('FORBIDDEN', message);
  }
}
export class NotFoundError extends AppError {
  constructor(message = 'Not found') {
    super('NOT_FOUND', message);
  }
}
export class ConflictError extends AppError {
  constructor(message: string) {
    super('CONFLICT', message);
  }
}
export class TooManyRequestsError extends AppError {
  constructor(message: string, retryAfterSeconds: number) {
    super('TOO_MANY_REQUESTS', message, undefined, { 'Retry-After': String(retryAfterSeconds) });
  }
}
