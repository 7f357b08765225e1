// The state behind useQuery / useSubmit: only the latest answer is published, nothing after the
// island is gone, failures keep the API's error shape (code, message, field errors).
import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiError, checkWith } from '../../src/lib/client/api';
import { QueryRunner, Submitter, fieldError, type QueryState, type SubmitState } from '../../src/components/ui/api-state';
import { z } from 'zod';

/** A promise settled from outside, to finish loads in any order. */
function deferred<T>() {
  let resolve!: (v: T) => void;
  let reject!: (e: unknown) => void;
  const promise = new Promise<T>((res, rej) => {
    resolve = res;
    reject = rej;
  });
  return { promise, resolve, reject };
}

function recorder<S>() {
  const states: S[] = [];
  return { states, publish: (s: S) => void states.push(s), last: () => states[states.length - 1] };
}

describe('QueryRunner', () => {
  it('publishes loading, then the answer', async () => {
    const r = recorder<QueryState<number>>();
    const runner = new QueryRunner<number>(r.publish);
    await runner.run(async () => 42);
    expect(r.states).toEqual([
      { data: null, error: null, loading: true },
      { data: 42, error: null, loading: false },
    ]);
  });

  it('drops an answer that arrives after a newer load started (stale response)', async () => {
    const r = recorder<QueryState<string>>();
    const runner = new QueryRunner<string>(r.publish);
    const slow = deferred<string>();
    const fast = deferred<string>();
    const first = runner.run(() => slow.promise);
    const second = runner.run(() => fast.promise);
    fast.resolve('new');
    await second;
    slow.resolve('old');
    await first;
    expect(r.last()).toEqual({ data: 'new', error: null, loading: false });
    expect(r.states.some((s) => s.data === 'old')).toBe(false);
  });

  it('aborts the signal of the load it replaces, and drops its failure', async () => {
    const r = recorder<QueryState<string>>();
    const runner = new QueryRunner<string>(r.publish);
    let firstSignal: AbortSignal | null = null;
    const slow = deferred<string>();
    const first = runner.run((signal) => {
      firstSignal = signal;
      return slow.promise;
    });
    await runner.run(async () => 'second');
    expect(firstSignal!.aborted).toBe(true);
    slow.reject(new ApiError(0, 'NETWORK', 'aborted'));
    await first;
    expect(r.last()).toEqual({ data: 'second', error: null, loading: false });
  });

  it('publishes nothing after stop() (the island unmounted)', async () => {
    const r = recorder<QueryState<number>>();
    const runner = new QueryRunner<number>(r.publish);
    const slow = deferred<number>();
    const done = runner.run(() => slow.promise);
    const before = r.states.length;
    runner.stop();
    slow.resolve(1);
    await done;
    expect(r.states.length).toBe(before);
  });

  it('keeps the API error with its fields, and the last answer unless told not to', async () => {
    const r = recorder<QueryState<number>>();
    const runner = new QueryRunner<number>(r.publish);
    await runner.run(async () => 7);
    const refused = new ApiError(400, 'BAD_REQUEST', 'Invalid query', { channel: ['Must be a whole number'] });
    await runner.run(async () => Promise.reject(refused));
    expect(r.last()).toEqual({ data: 7, error: refused, loading: false });
    expect(fieldError(r.last().error, 'channel')).toBe('Must be a whole number');

    await runner.run(async () => Promise.reject(refused), { keepOnError: false });
    expect(r.last().data).toBeNull();
  });

  it('keeps the old answer and error while loading, clears the error on success', async () => {
    const r = recorder<QueryState<number>>();
    const runner = new QueryRunner<number>(r.publish);
    await runner.run(async () => 1);
    await runner.run(async () => Promise.reject(new ApiError(503, 'UNAVAILABLE', 'Down')));
    const next = deferred<number>();
    const done = runner.run(() => next.promise);
    expect(r.last()).toMatchObject({ data: 1, loading: true, error: { code: 'UNAVAILABLE' } });
    next.resolve(2);
    await done;
    expect(r.last()).toEqual({ data: 2, error: null, loading: false });
  });

  it('turns a failure that is not an API answer into the given message', async () => {
    const r = recorder<QueryState<number>>();
    const runner = new QueryRunner<number>(r.publish);
    await runner.run(async () => Promise.reject(new TypeError('x is undefined')), { failed: 'Could not load customers' });
    expect(r.last().error).toBeInstanceOf(ApiError);
    expect(r.last().error?.message).toBe('Could not load customers');
  });

  it('calls onSuccess only for the answer that is still wanted', async () => {
    const runner = new QueryRunner<string>(() => undefined);
    const seen: string[] = [];
    const slow = deferred<string>();
    const first = runner.run(() => slow.promise, { onSuccess: (d) => seen.push(d) });
    await runner.run(async () => 'b', { onSuccess: (d) => seen.push(d) });
    slow.resolve('a');
    await first;
    expect(seen).toEqual(['b']);
  });

  it('reset() empties the state and makes a load under way stale; setData changes the answer in place', async () => {
    const r = recorder<QueryState<number>>();
    const runner = new QueryRunner<number>(r.publish);
    await runner.run(async () => 1);
    runner.setData((n) => (n ?? 0) + 1);
    expect(r.last().data).toBe(2);
    const slow = deferred<number>();
    const done = runner.run(() => slow.promise);
    runner.reset();
    slow.resolve(3);
    await done;
    expect(r.last()).toEqual({ data: null, error: null, loading: false });
  });

  it('reset({ keepData }) stops loading but keeps the last answer on show', async () => {
    const r = recorder<QueryState<number>>();
    const runner = new QueryRunner<number>(r.publish);
    await runner.run(async () => 5);
    const slow = deferred<number>();
    const done = runner.run(() => slow.promise);
    runner.reset({ keepData: true });
    slow.resolve(6);
    await done;
    expect(r.last()).toEqual({ data: 5, error: null, loading: false });
  });
});

describe('QueryRunner polling (a job under way)', () => {
  afterEach(() => {
    vi.useRealTimers();
  });

  /** A job whose answers go 10 %, 60 %, done; counts the asks. */
  function job(failAt = -1) {
    const answers = [10, 60, 100];
    let asked = 0;
    const load = async () => {
      const n = asked++;
      if (n === failAt) throw new ApiError(503, 'UNAVAILABLE', 'Try again later');
      return { progress: answers[Math.min(n, answers.length - 1)] };
    };
    return { load, asked: () => asked };
  }
  const poll = { everyMs: 700, while: (j: { progress: number }) => j.progress < 100 };

  it('asks again every interval while the answer says it is under way, then stops', async () => {
    vi.useFakeTimers();
    const r = recorder<QueryState<{ progress: number }>>();
    const runner = new QueryRunner<{ progress: number }>(r.publish);
    const j = job();
    await runner.run(j.load, { poll });
    expect(r.last().data).toEqual({ progress: 10 });
    await vi.advanceTimersByTimeAsync(699);
    expect(j.asked()).toBe(1);
    await vi.advanceTimersByTimeAsync(1);
    expect(j.asked()).toBe(2);
    expect(r.last().data).toEqual({ progress: 60 });
    await vi.advanceTimersByTimeAsync(700);
    expect(r.last()).toEqual({ data: { progress: 100 }, error: null, loading: false });
    await vi.advanceTimersByTimeAsync(10_000);
    expect(j.asked()).toBe(3);
    expect(vi.getTimerCount()).toBe(0);
  });

  it('stops at a failure and keeps its error', async () => {
    vi.useFakeTimers();
    const r = recorder<QueryState<{ progress: number }>>();
    const runner = new QueryRunner<{ progress: number }>(r.publish);
    const j = job(1);
    await runner.run(j.load, { poll });
    await vi.advanceTimersByTimeAsync(700);
    expect(r.last().error?.message).toBe('Try again later');
    await vi.advanceTimersByTimeAsync(10_000);
    expect(j.asked()).toBe(2);
  });

  it('stops when the island goes away, is reset, or a newer load starts', async () => {
    vi.useFakeTimers();
    for (const end of ['stop', 'reset', 'newer'] as const) {
      const runner = new QueryRunner<{ progress: number }>(() => undefined);
      const j = job();
      await runner.run(j.load, { poll });
      if (end === 'stop') runner.stop();
      else if (end === 'reset') runner.reset();
      else await runner.run(async () => ({ progress: 100 }), { poll });
      await vi.advanceTimersByTimeAsync(10_000);
      expect(j.asked()).toBe(1);
      expect(vi.getTimerCount()).toBe(0);
    }
  });

  it('does not poll without the option', async () => {
    vi.useFakeTimers();
    const runner = new QueryRunner<{ progress: number }>(() => undefined);
    const j = job();
    await runner.run(j.load);
    await vi.advanceTimersByTimeAsync(10_000);
    expect(j.asked()).toBe(1);
  });
});

describe('Submitter', () => {
  it('is pending while sending and answers the data', async () => {
    const r = recorder<SubmitState>();
    const s = new Submitter(r.publish);
    const answer = deferred<{ id: string }>();
    const done = s.submit(() => answer.promise);
    expect(r.last()).toEqual({ pending: true, error: null });
    answer.resolve({ id: '5' });
    expect(await done).toEqual({ ok: true, data: { id: '5' } });
    expect(r.last()).toEqual({ pending: false, error: null });
  });

  it('keeps the API error shape with field errors', async () => {
    const r = recorder<SubmitState>();
    const s = new Submitter(r.publish);
    const refused = new ApiError(400, 'BAD_REQUEST', 'Invalid body', { 'customer.name': ['Required'] });
    const result = await s.submit(() => Promise.reject(refused));
    expect(result).toEqual({ ok: false, error: refused });
    expect(r.last()).toEqual({ pending: false, error: refused });
    expect(fieldError(r.last().error, 'customer.name')).toBe('Required');
  });

  it('does not send when the form check finds field errors, and says so like the server would', async () => {
    const r = recorder<SubmitState>();
    const s = new Submitter(r.publish);
    let sent = false;
    const schema = z.object({ email: z.string().email('Enter an e-mail address') });
    const result = await s.submit(
      async () => {
        sent = true;
      },
      { check: () => checkWith(schema, { email: 'nope' }) },
    );
    expect(sent).toBe(false);
    expect(result.ok).toBe(false);
    expect(r.last().error).toMatchObject({
      status: 400,
      code: 'BAD_REQUEST',
      message: 'Some fields need attention',
      fields: { email: ['Enter an e-mail address'] },
    });
  });

  it('names a lost connection or a browser fault in plain words', async () => {
    const s = new Submitter(() => undefined);
    const result = await s.submit(() => Promise.reject(new Error('boom')), { failed: 'Could not save the plan' });
    expect(result.ok === false && result.error.message).toBe('Could not save the plan');
  });

  it('publishes nothing after stop(), and again after start()', async () => {
    const r = recorder<SubmitState>();
    const s = new Submitter(r.publish);
    const answer = deferred<number>();
    const done = s.submit(() => answer.promise);
    const before = r.states.length;
    s.stop();
    answer.resolve(1);
    await done;
    expect(r.states.length).toBe(before);
    s.start();
    s.fail(new ApiError(409, 'CONFLICT', 'Changed meanwhile'));
    expect(r.last().error?.code).toBe('CONFLICT');
  });

  it('stays pending until the last of two overlapping sends settles', async () => {
    const r = recorder<SubmitState>();
    const s = new Submitter(r.publish);
    const a = deferred<number>();
    const b = deferred<number>();
    const first = s.submit(() => a.promise);
    const second = s.submit(() => b.promise);
    a.resolve(1);
    await first;
    expect(r.last().pending).toBe(true);
    b.resolve(2);
    await second;
    expect(r.last().pending).toBe(false);
  });
});
