// Database errors as answers: an unreachable or stuck database is a 503, a duplicate a 409, a
// value PostgreSQL cannot hold a 400. Used by http.ts (the one place errors become answers)
// and by the middleware (pages). Error codes: PostgreSQL 15 manual, Appendix A.
import { AppError, type FieldErrors } from './errors';

export const DATABASE_UNAVAILABLE_MESSAGE = 'The database is not reachable; try again in a minute';

// Connection refused, reset, timed out, unknown host (Node's network errors).
const NETWORK_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'ENOTFOUND', 'EHOSTUNREACH', 'ENETUNREACH', 'EAI_AGAIN', 'EPIPE']);
// Class 08 connection exceptions, 53300 too many connections, 57P01–57P03 shutdown / cannot
// connect now, 57014 statement cancelled (statement_timeout).
const PG_UNAVAILABLE = new Set(['08000', '08001', '08003', '08004', '08006', '53300', '57P01', '57P02', '57P03', '57014']);

interface PgLike {
  code?: unknown;
  name?: unknown;
  message?: unknown;
  detail?: unknown;
  column?: unknown;
  errors?: unknown;
}

/** True when the error means the database cannot be reached or did not answer in time. */
export function isDatabaseUnavailable(err: unknown): boolean {
  if (!err || typeof err !== 'object') return false;
  const e = err as PgLike;
  if (typeof e.code === 'string' && (NETWORK_CODES.has(e.code) || PG_UNAVAILABLE.has(e.code))) return true;
  if (e.name === 'KnexTimeoutError') return true; // no pooled connection within acquireConnectionTimeout
  const message = typeof e.message === 'string' ? e.message : '';
  if (/timeout expired|Connection terminated|Query read timeout|connect ECONNREFUSED|Knex: Timeout acquiring a connection/i.test(message)) return true;
  if (Array.isArray(e.errors)) return e.errors.some(isDatabaseUnavailable); // AggregateError from a dual-stack connect
  return false;
}

/** "Key (lower(name))=(North) already exists." → { column: "name", value: "North" } */
function duplicateKey(detail: string): { column: string; value: string } | null {
  const m = /^Key \((.+?)\)=\((.*)\) already exists/.exec(detail);
  if (!m) return null;
  const column = m[1]!
    .replace(/^\w+\((.*)\)$/, '$1')
    .split(',')[0]!
    .trim();
  return { column, value: m[2]! };
}

/** A PostgreSQL or connection error as the answer it deserves, or null when it is a server fault. */
export function appErrorFromDatabase(err: unknown): AppError | null {
  if (isDatabaseUnavailable(err)) return new AppError('SERVICE_UNAVAILABLE', DATABASE_UNAVAILABLE_MESSAGE, undefined, { 'Retry-After': '30' });
  if (!err || typeof err !== 'object') return null;
  const e = err as PgLike;
  const code = typeof e.code === 'string' ? e.code : '';
  if (!/^[0-9A-Z]{5}$/.test(code)) return null;
  switch (code) {
    case '23505': {
      const key = typeof e.detail === 'string' ? duplicateKey(e.detail) : null;
      const fields: FieldErrors | undefined = key ? { [key.column]: ['Already taken'] } : undefined;
      return new AppError('CONFLICT', key ? `There is already one with ${key.column} "${key.value}"` : 'There is already one like this', fields);
    }
    case '23503':
      return new AppError('CONFLICT', 'Other records depend on this one, or it refers to one that does not exist');
    case '40001':
    case '40P01':
      return new AppError('CONFLICT', 'Someone else changed this at the same time; try again');
    case '22P05': // untranslatable character (NUL in text)
    case '22021': // character not in repertoire
      return new AppError('BAD_REQUEST', 'Text may not contain NUL or invalid characters');
    case '22008': // datetime field overflow
    case '22007': // invalid datetime format
      return new AppError('BAD_REQUEST', 'A date is outside the range that can be stored');
    case '22003': // numeric value out of range
      return new AppError('BAD_REQUEST', 'A number is too large');
    case '22P02': // invalid text representation
      return new AppError('BAD_REQUEST', 'A value has the wrong form');
    case '22001': // string data right truncation
      return new AppError('BAD_REQUEST', 'A text is too long');
    case '23514': // check violation
    case '23502': // not-null violation
      return new AppError('BAD_REQUEST', 'A value is not allowed here');
    default:
      return null;
  }
}
