import { useEffect, useState } from 'react';
import { ApiError, type FieldErrors } from '../../lib/client/api';

export interface QueryState<T> {
  data: T | null;
  error: string | null;
  fields: FieldErrors;
  loading: boolean;
}

/** Runs `load` whenever `key` changes (null = nothing to ask), keeping only the latest answer. */
export function useQueryResult<T>(key: string | null, load: () => Promise<T>): QueryState<T> {
  const [state, setState] = useState<QueryState<T>>({ data: null, error: null, fields: {}, loading: false });
  useEffect(() => {
    if (key === null) {
      setState({ data: null, error: null, fields: {}, loading: false });
      return;
    }
    let live = true;
    setState((s) => ({ ...s, loading: true }));
    load().then(
      (data) => live && setState({ data, error: null, fields: {}, loading: false }),
      (e: unknown) =>
        live &&
        setState({
          data: null,
          error: e instanceof ApiError ? e.message : 'Could not calculate',
          fields: e instanceof ApiError ? e.fields : {},
          loading: false,
        }),
    );
    return () => {
      live = false;
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key]);
  return state;
}
