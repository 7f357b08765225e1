// The two ways islands talk to the API: useQuery reads (loading / error / data, only the latest
// answer counts, nothing lands after the island is gone, refetch), useSubmit writes (pending, the
// API's error with its field errors). The logic lives in api-state.ts.
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import type { ApiError, FieldErrors } from '../../lib/client/api';
import {
  QueryRunner,
  Submitter,
  idleQuery,
  idleSubmit,
  type Load,
  type QueryOptions,
  type QueryState,
  type SubmitOptions,
  type SubmitResult,
  type SubmitState,
} from './api-state';

export type { Load, QueryOptions, QueryState, SubmitOptions, SubmitResult, SubmitState };

export interface Query<T> extends QueryState<T> {
  /** Field errors of the last failure (a 400 on query parameters). */
  fields: FieldErrors;
  /** Asks the same question again (after a write changed the answer). */
  refetch: () => void;
  /** Changes the answer in place, without asking the server. */
  setData: (update: (data: T | null) => T | null) => void;
}

/**
 * Loads whenever `key` changes (null: nothing to ask, state back to empty unless `keepWhenIdle`). `load` and `options`
 * are read when the load starts, so they may be new functions on every render; put everything the
 * answer depends on into `key`. `options.poll` asks again while the answer says something is under way.
 */
export function useQuery<T>(key: string | null, load: Load<T>, options: QueryOptions<T> = {}): Query<T> {
  const [state, setState] = useState<QueryState<T>>(() => idleQuery(key !== null));
  const [runner] = useState(() => new QueryRunner<T>(setState, idleQuery(key !== null)));
  const latest = useRef({ key, load, options });
  // Declared before the effect that loads, so that it sees this render's functions.
  useEffect(() => {
    latest.current = { key, load, options };
  });
  const start = useCallback(() => {
    const opts = latest.current.options;
    // A poll asks again with the load of the latest render.
    return runner.run((signal) => latest.current.load(signal), { ...opts, onSuccess: (data) => latest.current.options.onSuccess?.(data) });
  }, [runner]);
  useEffect(() => {
    if (key === null) {
      runner.reset({ keepData: latest.current.options.keepWhenIdle });
      return;
    }
    void start();
    return () => runner.stop();
  }, [key, runner, start]);
  const refetch = useCallback(() => {
    if (latest.current.key !== null) void start();
  }, [start]);
  const setData = useCallback((update: (data: T | null) => T | null) => runner.setData(update), [runner]);
  return { ...state, fields: state.error?.fields ?? {}, refetch, setData };
}

export interface Submit extends SubmitState {
  /** Field errors of the last failure, keyed like the request body (`customer.name`). */
  fields: FieldErrors;
  /** Runs the form's check, then `send`; resolves to the answer or the failure (also kept in `error`). */
  submit: <T>(send: () => Promise<T>, options?: SubmitOptions) => Promise<SubmitResult<T>>;
  /** Shows a problem found outside a send, or clears it with null. */
  fail: (error: ApiError | null) => void;
}

/** One form's writes. `defaults` apply to every submit (e.g. `{ failed: 'Could not save' }`). */
export function useSubmit(defaults: SubmitOptions = {}): Submit {
  const [state, setState] = useState<SubmitState>(idleSubmit);
  const [submitter] = useState(() => new Submitter(setState));
  useEffect(() => {
    submitter.start();
    return () => submitter.stop();
  }, [submitter]);
  const failed = defaults.failed;
  const checkMessage = defaults.checkMessage;
  const actions = useMemo(
    () => ({
      submit: <T>(send: () => Promise<T>, options: SubmitOptions = {}) => submitter.submit(send, { failed, checkMessage, ...options }),
      fail: (error: ApiError | null) => submitter.fail(error),
    }),
    [submitter, failed, checkMessage],
  );
  return { ...state, fields: state.error?.fields ?? {}, ...actions };
}
