import { useState } from 'react';
import { ApiError, type FieldErrors } from '../../lib/client/api';
import { checkWith } from '../../lib/client/planning-api';

type Schema = Parameters<typeof checkWith>[0];

export interface SubmitState {
  busy: boolean;
  fields: FieldErrors;
  error: string | null;
}

/**
 * Checks the body with the endpoint's schema, sends it, and keeps the server's field errors for
 * the inputs. Resolves to the answer, or null when something needs attention.
 */
export function useAccountSubmit<T>(schema: Schema, send: (body: Record<string, string>) => Promise<T>) {
  const [state, setState] = useState<SubmitState>({ busy: false, fields: {}, error: null });
  async function submit(body: Record<string, string>): Promise<T | null> {
    const local = checkWith(schema, body);
    if (local) {
      setState({ busy: false, fields: local, error: 'Some fields need attention' });
      return null;
    }
    setState({ busy: true, fields: {}, error: null });
    try {
      const answer = await send(body);
      setState({ busy: false, fields: {}, error: null });
      return answer;
    } catch (e) {
      const err = e instanceof ApiError ? e : null;
      const fields = err?.fields ?? {};
      // A problem with the link itself has no input to sit beside: show it above the form.
      const { token, ...inputFields } = fields;
      setState({ busy: false, fields: inputFields, error: token?.join(' ') ?? err?.message ?? 'Something went wrong. Try again.' });
      return null;
    }
  }
  return { ...state, submit };
}
