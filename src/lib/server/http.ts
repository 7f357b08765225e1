// Shared endpoint plumbing: one error body, zod parsing, guards.
import type { APIContext, APIRoute } from 'astro';
import { ZodError, type ZodType, type ZodTypeDef } from 'zod';
import { AppError, STATUS_BY_CODE, ForbiddenError, UnauthorizedError, ValidationError, type FieldErrors } from './errors';
import { can, type Permission } from '../domain/roles';
import type { SessionUser } from './session-user';
import { appErrorFromDatabase } from './db-errors';
import { JSON_BODY_MAX_BYTES, readJsonBody, readLimitedText, readMultipart } from './request-body';

export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store', ...headers },
  });
}

/**
 * Any thrown value as an AppError: zod issues are 400 with fields, database faults 503, unique
 * violations 409 (see db-errors.ts); unknown errors are logged and hidden behind a 500.
 */
export function asAppError(err: unknown): AppError {
  if (err instanceof ZodError) return validationFromZod(err);
  if (err instanceof AppError) return err;
  const fromDb = appErrorFromDatabase(err);
  if (fromDb) {
    if (fromDb.code === 'SERVICE_UNAVAILABLE') console.error('[bearline] database unavailable', err instanceof Error ? err.message : err);
    return fromDb;
  }
  console.error('[bearline] unhandled error', err);
  return new AppError('INTERNAL_SERVER_ERROR', 'Something went wrong on the server');
}

export interface ErrorBody {
  error: { code: string; message: string; fields?: FieldErrors };
}

/** The one place the error body {"error": {"code", "message", "fields"}} is built. */
export function errorBody(err: AppError): ErrorBody {
  const body: ErrorBody = { error: { code: err.code, message: err.message } };
  if (err.fields) body.error.fields = err.fields;
  return body;
}

export function errorResponse(thrown: unknown): Response {
  const err = asAppError(thrown);
  return json(errorBody(err), STATUS_BY_CODE[err.code], err.headers);
}

export function validationFromZod(err: ZodError, message = 'Some fields need attention'): ValidationError {
  const fields: FieldErrors = {};
  for (const issue of err.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_';
    (fields[key] ??= []).push(issue.message);
  }
  return new ValidationError(message, fields);
}

/** Wraps a handler so that thrown errors become the error body. */
export function handler(fn: (ctx: APIContext) => Promise<Response> | Response): APIRoute {
  return async (ctx) => {
    try {
      return await fn(ctx);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

/** Paths of the strings in `data` that hold a NUL byte (PostgreSQL text cannot store one). */
function nulPaths(data: unknown, path: string[] = [], out: string[] = [], depth = 0): string[] {
  if (typeof data === 'string') {
    if (data.includes('\u0000')) out.push(path.length ? path.join('.') : '_');
  } else if (data && typeof data === 'object' && depth < 32 && out.length < 20) {
    for (const [k, v] of Object.entries(data)) nulPaths(v, [...path, k], out, depth + 1);
  }
  return out;
}

/** Parses with a zod schema: 400 with fields on failure. Text with NUL bytes is refused first, whatever the schema. */
export function parseWith<T>(schema: ZodType<T, ZodTypeDef, unknown>, data: unknown): T {
  const nul = nulPaths(data);
  if (nul.length) {
    throw new ValidationError('Some fields need attention', Object.fromEntries(nul.map((p) => [p, ['Remove NUL characters from the text']])));
  }
  const result = schema.safeParse(data);
  if (!result.success) throw validationFromZod(result.error);
  return result.data;
}

export function parseQuery<T>(schema: ZodType<T, ZodTypeDef, unknown>, url: URL): T {
  return parseWith(schema, Object.fromEntries(url.searchParams));
}

export interface BodyOptions {
  /** Largest body accepted (default JSON_BODY_MAX_BYTES, 1 MB); counted while it streams in. */
  maxBytes?: number;
}

/**
 * Reads a JSON or form body (url-encoded, or multipart without files) of at most 1 MB unless
 * `maxBytes` says otherwise: 413 before parsing when it is larger, whoever sends it.
 */
export async function readBody(request: Request, opts: BodyOptions = {}): Promise<Record<string, unknown>> {
  const maxBytes = opts.maxBytes ?? JSON_BODY_MAX_BYTES;
  const type = (request.headers.get('content-type') ?? '').toLowerCase();
  if (type.includes('application/json')) {
    const body = await readJsonBody(request, maxBytes);
    if (body === null || typeof body !== 'object' || Array.isArray(body)) throw new ValidationError('The request body is not a JSON object');
    return body as Record<string, unknown>;
  }
  if (type.includes('application/x-www-form-urlencoded')) {
    return Object.fromEntries(new URLSearchParams(await readLimitedText(request, maxBytes)));
  }
  if (type.includes('multipart/form-data')) {
    const { fields } = await readMultipart(request, { maxFiles: 0, maxFileBytes: 0, maxTotalBytes: maxBytes, maxFieldBytes: maxBytes }, async () => undefined);
    return fields;
  }
  throw new AppError('UNSUPPORTED_MEDIA_TYPE', 'Send JSON (application/json) or a form');
}

export async function parseBody<T>(schema: ZodType<T, ZodTypeDef, unknown>, request: Request, opts?: BodyOptions): Promise<T> {
  return parseWith(schema, await readBody(request, opts));
}

export function requireUser(locals: App.Locals): SessionUser {
  if (!locals.user) throw new UnauthorizedError();
  return locals.user;
}

/** The signed-in user when their role has `permission` (or, given a list, any one of them). */
export function requirePermission(locals: App.Locals, permission: Permission | readonly Permission[]): SessionUser {
  const user = requireUser(locals);
  const wanted: readonly Permission[] = typeof permission === 'string' ? [permission] : permission;
  if (!wanted.some((p) => can(user.role, p))) throw new ForbiddenError();
  return user;
}

export function clientIp(ctx: Pick<APIContext, 'clientAddress' | 'request'>): string {
  try {
    return ctx.clientAddress;
  } catch {
    return 'unknown';
  }
}
