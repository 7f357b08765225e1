// Shared endpoint plumbing: one error body, zod parsing, guards.
import type { APIContext, APIRoute } from 'astro';
import { ZodError, type ZodType, type ZodTypeDef } from 'zod';
import { AppError, STATUS_BY_CODE, ForbiddenError, UnauthorizedError, ValidationError, type FieldErrors } from './errors';
import { can, type Permission } from '../domain/roles';
import type { SessionUser } from './session-user';

export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store', ...headers },
  });
}

/** Any thrown value as an AppError; unknown errors are logged and hidden. */
export function asAppError(err: unknown): AppError {
  if (err instanceof ZodError) return validationFromZod(err);
  if (err instanceof AppError) return err;
  console.error('[bearline] unhandled error', err);
  return new AppError('INTERNAL_SERVER_ERROR', 'Something went wrong on the server');
}

export function errorResponse(thrown: unknown): Response {
  const err = asAppError(thrown);
  const body: { error: { code: string; message: string; fields?: FieldErrors } } = {
    error: { code: err.code, message: err.message },
  };
  if (err.fields) body.error.fields = err.fields;
  return json(body, STATUS_BY_CODE[err.code], err.headers);
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

export function parseWith<T>(schema: ZodType<T, ZodTypeDef, unknown>, data: unknown): T {
  const result = schema.safeParse(data);
  if (!result.success) throw validationFromZod(result.error);
  return result.data;
}

export function parseQuery<T>(schema: ZodType<T, ZodTypeDef, unknown>, url: URL): T {
  return parseWith(schema, Object.fromEntries(url.searchParams));
}

/** Reads a JSON or form body (url-encoded or multipart without files). */
export async function readBody(request: Request): Promise<Record<string, unknown>> {
  const type = request.headers.get('content-type') ?? '';
  if (type.includes('application/json')) {
    try {
      const body = await request.json();
      if (body === null || typeof body !== 'object' || Array.isArray(body)) throw new Error();
      return body as Record<string, unknown>;
    } catch {
      throw new ValidationError('The request body is not a JSON object');
    }
  }
  if (type.includes('application/x-www-form-urlencoded') || type.includes('multipart/form-data')) {
    const form = await request.formData();
    return Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === 'string'));
  }
  throw new AppError('UNSUPPORTED_MEDIA_TYPE', 'Send JSON (application/json) or a form');
}

export async function parseBody<T>(schema: ZodType<T, ZodTypeDef, unknown>, request: Request): Promise<T> {
  return parseWith(schema, await readBody(request));
}

export function requireUser(locals: App.Locals): SessionUser {
  if (!locals.user) throw new UnauthorizedError();
  return locals.user;
}

export function requirePermission(locals: App.Locals, permission: Permission): SessionUser {
  const user = requireUser(locals);
  if (!can(user.role, permission)) throw new ForbiddenError();
  return user;
}

export function clientIp(ctx: Pick<APIContext, 'clientAddress' | 'request'>): string {
  try {
    return ctx.clientAddress;
  } catch {
    return 'unknown';
  }
}
