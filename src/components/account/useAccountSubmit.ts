import { checkWith } from '../../lib/client/api';
import { useSubmit } from '../ui/use-api';

type Schema = Parameters<typeof checkWith>[0];

/**
 * An account form's submit: checks the body with the endpoint's schema, sends it, and keeps the
 * server's field errors for the inputs. Resolves to the answer, or null when something needs attention.
 */
export function useAccountSubmit<T>(schema: Schema, send: (body: Record<string, string>) => Promise<T>) {
  const { pending, error, fields, submit } = useSubmit();
  // A problem with the link itself has no input to sit beside: show it above the form.
  const { token, ...inputFields } = fields;
  return {
    busy: pending,
    fields: inputFields,
    error: error ? (token?.join(' ') ?? error.message) : null,
    submit: async (body: Record<string, string>): Promise<T | null> => {
      const result = await submit(() => send(body), { check: () => checkWith(schema, body) });
      return result.ok ? result.data : null;
    },
  };
}
