import { useCallback, useMemo, useState } from 'react';
import type { FieldErrors } from '../../lib/client/api';
import { useSubmit, type SubmitOptions, type SubmitResult } from '../ui/use-api';
import { withoutFields } from './form-parts';

export interface MapForm {
  pending: boolean;
  /** Field errors of the last send or check, less those of fields changed since. */
  errors: FieldErrors;
  /** The form's message above the fields (null: nothing to say). */
  message: string | null;
  /** Someone saved the record first (409): offer to load the latest version. */
  stale: boolean;
  /** A field changed: its old messages (and those of the fields checked with it) no longer apply. */
  clear: (keys: readonly string[]) => void;
  submit: <T>(send: () => Promise<T>, options?: SubmitOptions) => Promise<SubmitResult<T>>;
}

/** The map's upkeep forms' writes (useSubmit), with errors that go as their fields are changed. */
export function useMapForm(failed: string): MapForm {
  const s = useSubmit({ failed });
  const [cleared, setCleared] = useState<readonly string[]>([]);
  const fields = s.fields;
  const errors = useMemo(() => withoutFields(fields, cleared), [fields, cleared]);
  const clear = useCallback((keys: readonly string[]) => setCleared((c) => [...c, ...keys]), []);
  const send = s.submit;
  const submit = useCallback(
    <T>(run: () => Promise<T>, options?: SubmitOptions) => {
      setCleared([]);
      return send(run, options);
    },
    [send],
  );
  return { pending: s.pending, errors, message: s.error?.message ?? null, stale: s.error?.status === 409, clear, submit };
}
