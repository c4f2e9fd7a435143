// An ordered worker pool: jobs go out to a fixed set of workers (worker_threads in Node, Web
// Workers in browsers, or in-thread stand-ins), results come back in job order, and at most
// `maxInFlight` jobs are dispatched or waiting to be delivered, so memory stays bounded however
// long the movie. Browser-safe: the caller supplies the workers.

/** What the pool needs of a worker. Messages are `{id, job}` out and `{id, ok, result | message}` back. */
export interface PoolWorker {
  post(message: unknown, transfer?: Transferable[]): void;
  onMessage(handler: (message: unknown) => void): void;
  onError(handler: (error: Error) => void): void;
  terminate(): void | Promise<unknown>;
}

export interface OrderedPoolOptions {
  /** Number of workers. @default 1 */
  workers?: number;
  /**
   * Jobs posted to one worker before it has answered the first of them (the next one waits in
   * its queue, so the worker goes on without waiting for this thread). @default 2
   */
  perWorker?: number;
  /** Jobs dispatched or finished but not yet delivered, at most. @default (perWorker + 1) x workers */
  maxInFlight?: number;
  /** Stops dispatching; the iteration ends after the jobs already delivered. */
  signal?: AbortSignal;
}

export interface PoolOutcome<J, R> {
  /** Position of the job in the input order (0-based). */
  index: number;
  job: J;
  result?: R;
  /** Set when the job failed (the worker threw, or died). */
  error?: Error;
}

interface Reply {
  id: number;
  ok: boolean;
  result?: unknown;
  message?: string;
}

/**
 * Runs `jobs` on workers made by `spawn` and yields their outcomes in job order. A failed job is
 * yielded with `error` set and does not stop the run (the caller decides what is fatal). Workers
 * are terminated when the iteration ends, also when the caller breaks out of it.
 */
export async function* runOrdered<J, R>(
  jobs: Iterable<J> | AsyncIterable<J>,
  spawn: (slot: number) => PoolWorker,
  options: OrderedPoolOptions = {},
): AsyncGenerator<PoolOutcome<J, R>> {
  const count = options.workers ?? 1;
  if (!Number.isInteger(count) || count < 1) {
    throw new Error(`workers: expected a whole number >= 1, got ${String(count)}`);
  }
  const perWorker = options.perWorker ?? 2;
  if (!Number.isInteger(perWorker) || perWorker < 1) {
    throw new Error(`perWorker: expected a whole number >= 1, got ${String(perWorker)}`);
  }
  const maxInFlight = options.maxInFlight ?? (perWorker + 1) * count;
  if (!Number.isInteger(maxInFlight) || maxInFlight < count) {
    throw new Error(`maxInFlight: expected a whole number >= workers (${count}), got ${String(maxInFlight)}`);
  }
  const iterator = (Symbol.asyncIterator in Object(jobs)
    ? (jobs as AsyncIterable<J>)[Symbol.asyncIterator]()
    : (jobs as Iterable<J>)[Symbol.iterator]()) as AsyncIterator<J> | Iterator<J>;

  const workers: Array<PoolWorker | undefined> = [];
  // Jobs posted to each slot's worker and not answered yet, oldest first (workers answer in
  // the order they were given jobs; the oldest is the one running).
  const queued: Array<Array<{ index: number; job: J }>> = Array.from({ length: count }, () => []);
  let pending = 0; // posted jobs not answered, over every slot
  // Jobs to post again before taking new ones from the input (queued behind a job whose worker died).
  const retry: Array<{ index: number; job: J }> = [];
  const done = new Map<number, PoolOutcome<J, R>>();
  let nextIndex = 0; // next job to take from the input
  let nextOut = 0; // next outcome to deliver
  let exhausted = false;
  let closing = false;
  // A slot whose workers die this many times in a row without finishing a job is given up, and
  // when every slot is given up the remaining jobs fail with the last error (no respawn loop).
  const MAX_DEATHS = 3;
  const deaths = new Array<number>(count).fill(0);
  let lastDeath: Error | undefined;
  let wake: (() => void) | undefined;
  const notify = () => { const w = wake; wake = undefined; w?.(); };

  const finish = (slot: number, at: number, outcome: PoolOutcome<J, R>) => {
    deaths[slot] = 0;
    queued[slot]!.splice(at, 1);
    pending--;
    done.set(outcome.index, outcome);
    notify();
  };

  const start = (slot: number) => {
    const w = spawn(slot);
    workers[slot] = w;
    w.onMessage((raw) => {
      if (workers[slot] !== w) return; // a replaced worker's late answer
      const reply = raw as Reply;
      const q = queued[slot]!;
      const at = q.findIndex((e) => e.index === reply.id);
      if (at < 0) return;
      const current = q[at]!;
      finish(slot, at, reply.ok
        ? { index: current.index, job: current.job, result: reply.result as R }
        : { index: current.index, job: current.job, error: new Error(reply.message ?? "worker failed") });
    });
    w.onError((err) => {
      if (closing || workers[slot] !== w) return; // terminated by us, or already replaced
      void Promise.resolve(w.terminate()).catch(() => undefined);
      workers[slot] = undefined;
      // The oldest job was running: it fails. Jobs queued behind it go out again (those that
      // moved buffers to the dead worker cannot, and fail too).
      const q = queued[slot]!.splice(0);
      pending -= q.length;
      q.forEach((e, k) => {
        if (k > 0 && !transferablesOf(e.job)?.length) retry.push(e);
        else done.set(e.index, { index: e.index, job: e.job, error: err });
      });
      retry.sort((a, b) => a.index - b.index);
      lastDeath = err;
      if (++deaths[slot]! < MAX_DEATHS) start(slot); // a fresh worker takes the slot
      notify();
    });
  };

  for (let s = 0; s < count; s++) start(s);

  /** The live slot with the fewest queued jobs, if it has room for another. */
  const freeSlot = (): number => {
    let best = -1;
    for (let s = 0; s < count; s++) {
      if (!workers[s] || queued[s]!.length >= perWorker) continue;
      if (best < 0 || queued[s]!.length < queued[best]!.length) best = s;
    }
    return best;
  };
  const post = (slot: number, e: { index: number; job: J }) => {
    queued[slot]!.push(e);
    pending++;
    workers[slot]!.post({ id: e.index, job: e.job }, transferablesOf(e.job));
  };

  const dispatch = async () => {
    if (deaths.every((d) => d >= MAX_DEATHS) && pending === 0) {
      // Every worker keeps dying: fail what is left instead of spawning forever.
      for (const e of retry.splice(0)) {
        done.set(e.index, { index: e.index, job: e.job, error: new Error(`every worker failed: ${lastDeath?.message ?? "unknown error"}`) });
      }
      while (!exhausted && nextIndex - nextOut < maxInFlight) {
        const step = await iterator.next();
        if (step.done) { exhausted = true; break; }
        const index = nextIndex++;
        done.set(index, { index, job: step.value, error: new Error(`every worker failed: ${lastDeath?.message ?? "unknown error"}`) });
      }
      return;
    }
    for (let slot = freeSlot(); slot >= 0 && retry.length > 0; slot = freeSlot()) post(slot, retry.shift()!);
    while (!exhausted && retry.length === 0 && freeSlot() >= 0 && nextIndex - nextOut < maxInFlight && !options.signal?.aborted) {
      const step = await iterator.next();
      if (step.done) { exhausted = true; break; }
      const slot = freeSlot();
      if (slot < 0) { retry.push({ index: nextIndex++, job: step.value }); break; } // (a worker died meanwhile)
      post(slot, { index: nextIndex++, job: step.value });
    }
    if (options.signal?.aborted) exhausted = true;
  };

  try {
    for (;;) {
      await dispatch();
      while (done.has(nextOut)) {
        const outcome = done.get(nextOut)!;
        done.delete(nextOut);
        nextOut++;
        yield outcome;
        await dispatch();
      }
      if (exhausted && pending === 0 && retry.length === 0 && done.size === 0) return;
      await new Promise<void>((resolve) => { wake = resolve; });
    }
  } finally {
    closing = true;
    await Promise.all(workers.map((w) => (w ? Promise.resolve(w.terminate()).catch(() => undefined) : undefined)));
  }
}

/** Jobs may carry `transfer: Transferable[]` to be moved rather than copied. */
function transferablesOf(job: unknown): Transferable[] | undefined {
  if (job && typeof job === "object" && Array.isArray((job as { transfer?: unknown }).transfer)) {
    return (job as { transfer: Transferable[] }).transfer;
  }
  return undefined;
}

/**
 * A stand-in worker that runs `handler` in this thread (asynchronously), for environments
 * without workers and for `workers: 1` runs that need no thread.
 */
export function inThreadWorker<J, R>(handler: (job: J) => R | Promise<R>): PoolWorker {
  let onMessage: ((m: unknown) => void) | undefined;
  // Jobs run one after another in the order posted, as in a worker thread.
  let last: Promise<unknown> = Promise.resolve();
  return {
    post(message) {
      const { id, job } = message as { id: number; job: J };
      last = last
        .then(() => handler(job))
        .then(
          (result) => onMessage?.({ id, ok: true, result }),
          (err: Error) => onMessage?.({ id, ok: false, message: err?.message ?? String(err) }),
        );
    },
    onMessage(h) { onMessage = h; },
    onError() { /* an in-thread handler reports failures as messages */ },
    terminate() { onMessage = undefined; },
  };
}
