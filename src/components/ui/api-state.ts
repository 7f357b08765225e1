// What useQuery and useSubmit keep, as plain objects the hooks hand their state setter to: a load
// whose answer arrives after a newer load (or after the island went away) never reaches the state.
import { asApiError, localCheckError, type ApiError, type FieldErrors } from '../../lib/client/api';

export interface QueryState<T> {
  /** The last answer; kept while a new one loads (and after a failure unless `keepOnError` is false). */
  data: T | null;
  error: ApiError | null;
  loading: boolean;
}

export interface QueryOptions<T> {
  /** The message when the failure is not an answer of the API (a fault in the browser). */
  failed?: string;
  /** False: a failure drops the last answer (a result that belongs to the inputs that failed). */
  keepOnError?: boolean;
  /** True: when there is nothing to ask (key null), keep showing the last answer instead of emptying. */
  keepWhenIdle?: boolean;
  /** Called with an answer that is still wanted, before it is published. */
  onSuccess?: (data: T) => void;
  /**
   * Asks again `everyMs` after each answer for which `while` holds (a job under way). A failure, an
   * answer for which it no longer holds, a newer load, `reset()` or `stop()` ends the polling.
   */
  poll?: { everyMs: number; while: (data: T) => boolean };
}

export type Load<T> = (signal: AbortSignal) => Promise<T>;

export const idleQuery = <T>(loading = false): QueryState<T> => ({ data: null, error: null, loading });

/**
 * Runs one load at a time: starting another, `reset()` or `stop()` makes every earlier answer stale
 * (its AbortSignal fires, and its result or failure is dropped).
 */
export class QueryRunner<T> {
  private generation = 0;
  private controller: AbortController | null = null;
  private pollTimer: ReturnType<typeof setTimeout> | null = null;
  private state: QueryState<T>;

  constructor(
    private readonly publish: (state: QueryState<T>) => void,
    initial: QueryState<T> = idleQuery(),
  ) {
    this.state = initial;
  }

  get current(): QueryState<T> {
    return this.state;
  }

  private set(next: QueryState<T>) {
    this.state = next;
    this.publish(next);
  }

  private invalidate(): number {
    this.controller?.abort();
    this.controller = null;
    if (this.pollTimer !== null) clearTimeout(this.pollTimer);
    this.pollTimer = null;
    return ++this.generation;
  }

  /** Starts `load`; resolves once it has settled (published, or dropped as stale). */
  async run(load: Load<T>, options: QueryOptions<T> = {}): Promise<void> {
    const generation = this.invalidate();
    const controller = new AbortController();
    this.controller = controller;
    const keep = options.keepOnError ?? true;
    this.set({ ...this.state, loading: true });
    let data: T;
    try {
      data = await load(controller.signal);
    } catch (e) {
      if (generation !== this.generation) return;
      this.controller = null;
      this.set({ data: keep ? this.state.data : null, error: asApiError(e, options.failed ?? 'Could not load'), loading: false });
      return;
    }
    if (generation !== this.generation) return;
    this.controller = null;
    options.onSuccess?.(data);
    this.set({ data, error: null, loading: false });
    const poll = options.poll;
    if (poll && generation === this.generation && poll.while(data)) {
      this.pollTimer = setTimeout(() => {
        this.pollTimer = null;
        void this.run(load, options);
      }, poll.everyMs);
    }
  }

  /** Back to nothing asked: drops any load under way, and the answer unless `keepData`. */
  reset(options: { keepData?: boolean } = {}): void {
    this.invalidate();
    this.set(options.keepData ? { ...this.state, loading: false } : idleQuery());
  }

  /** The island is going away: drops any load under way without publishing. */
  stop(): void {
    this.invalidate();
  }

  /** Replaces the answer in place (after a local change the server confirmed). */
  setData(update: (data: T | null) => T | null): void {
    this.set({ ...this.state, data: update(this.state.data) });
  }
}

export interface SubmitState {
  pending: boolean;
  /** The last failure: an API answer (with its field errors), a lost connection, or the form's own check. */
  error: ApiError | null;
}

export type SubmitResult<T> = { ok: true; data: T } | { ok: false; error: ApiError };

export interface SubmitOptions {
  /** The form's own check before sending (e.g. `() => checkWith(schema, body)`); field errors stop the send. */
  check?: () => FieldErrors | null;
  /** The message when the form's own check refuses the input. */
  checkMessage?: string;
  /** The message when the failure is not an answer of the API. */
  failed?: string;
}

export const idleSubmit: SubmitState = { pending: false, error: null };

/** Sends writes and keeps pending/error; after `stop()` (the island went away) nothing is published. */
export class Submitter {
  private stopped = false;
  private running = 0;
  private state: SubmitState = idleSubmit;

  constructor(private readonly publish: (state: SubmitState) => void) {}

  get current(): SubmitState {
    return this.state;
  }

  private set(next: SubmitState) {
    this.state = next;
    if (!this.stopped) this.publish(next);
  }

  async submit<T>(send: () => Promise<T>, options: SubmitOptions = {}): Promise<SubmitResult<T>> {
    const fields = options.check?.() ?? null;
    if (fields && Object.keys(fields).length > 0) {
      const error = localCheckError(fields, options.checkMessage);
      this.set({ pending: this.running > 0, error });
      return { ok: false, error };
    }
    this.running += 1;
    this.set({ pending: true, error: null });
    try {
      const data = await send();
      this.running -= 1;
      this.set({ pending: this.running > 0, error: null });
      return { ok: true, data };
    } catch (e) {
      this.running -= 1;
      const error = asApiError(e, options.failed ?? 'Something went wrong. Try again.');
      this.set({ pending: this.running > 0, error });
      return { ok: false, error };
    }
  }

  /** Shows a problem found outside a send (or clears it with null). */
  fail(error: ApiError | null): void {
    this.set({ ...this.state, error });
  }

  stop(): void {
    this.stopped = true;
  }

  /** The island is back (React may mount an island twice in development). */
  start(): void {
    this.stopped = false;
  }
}

/** The first message for a field, for the input it belongs to. */
export const fieldError = (error: ApiError | null, field: string): string | undefined => error?.fields[field]?.[0];
