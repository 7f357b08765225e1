// The only place islands call fetch. Error bodies become ApiError.
import type { Role } from '../domain/roles';

export type FieldErrors = Record<string, string[]>;

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: FieldErrors = {},
  ) {
    super(message);
  }
}

export async function request<T>(method: string, url: string, body?: unknown): Promise<T> {
  const init: RequestInit = { method, headers: { Accept: 'application/json' }, credentials: 'same-origin' };
  if (body !== undefined) {
    init.body = JSON.stringify(body);
    (init.headers as Record<string, string>)['Content-Type'] = 'application/json';
  }
  let res: Response;
  try {
    res = await fetch(url, init);
  } catch {
    throw new ApiError(0, 'NETWORK', 'The server could not be reached. Check your connection and try again.');
  }
  if (res.status === 204) return undefined as T;
  const data = await res.json().catch(() => null);
  if (!res.ok) {
    const err = data?.error;
    throw new ApiError(res.status, err?.code ?? 'UNKNOWN', err?.message ?? `Request failed (${res.status})`, err?.fields ?? {});
  }
  return data as T;
}

export const get = <T>(url: string) => request<T>('GET', url);

export interface List<T> {
  items: T[];
  total: number;
}

export interface UserDto {
  id: string;
  email: string;
  name: string;
  role: Role;
  disabledAt: string | null;
  createdAt: string;
}

export const usersApi = {
  list: () => get<List<UserDto>>('/api/users'),
  create: (input: { email: string; name: string; role: Role; password: string }) => request<UserDto>('POST', '/api/users', input),
  update: (id: string, change: { role?: Role; disabled?: boolean; name?: string }) => request<UserDto>('PATCH', `/api/users/${id}`, change),
};
