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
  /** Jobs dispatched or finished but not yet delivered, at most. @default 2 x workers */
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
  const maxInFlight = options.maxInFlight ?? 2 * count;
  if (!Number.isInteger(maxInFlight) || maxInFlight < count) {
    throw new Error(`maxInFlight: expected a whole number >= workers (${count}), got ${String(maxInFlight)}`);
  }
  const iterator = (Symbol.asyncIterator in Object(jobs)
    ? (jobs as AsyncIterable<J>)[Symbol.asyncIterator]()
    : (jobs as Iterable<J>)[Symbol.iterator]()) as AsyncIterator<J> | Iterator<J>;

  const idle: number[] = [];
  const workers: Array<PoolWorker | undefined> = [];
  const busy = new Map<number, { index: number; job: J }>(); // slot -> job
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

  const finish = (slot: number, outcome: PoolOutcome<J, R>) => {
    deaths[slot] = 0;
    busy.delete(slot);
    done.set(outcome.index, outcome);
    idle.push(slot);
    notify();
  };

  const start = (slot: number) => {
    const w = spawn(slot);
    workers[slot] = w;
    w.onMessage((raw) => {
      const reply = raw as Reply;
      const current = busy.get(slot);
      if (!current || reply.id !== current.index) return;
      finish(slot, reply.ok
        ? { index: current.index, job: current.job, result: reply.result as R }
        : { index: current.index, job: current.job, error: new Error(reply.message ?? "worker failed") });
    });
    w.onError((err) => {
      if (closing || workers[slot] !== w) return; // terminated by us, or already replaced
      const current = busy.get(slot);
      void Promise.resolve(w.terminate()).catch(() => undefined);
      workers[slot] = undefined;
      if (current) {
        busy.delete(slot);
        done.set(current.index, { index: current.index, job: current.job, error: err });
      }
      lastDeath = err;
      if (++deaths[slot]! < MAX_DEATHS) {
        start(slot); // a fresh worker takes the slot
        idle.push(slot);
      }
      notify();
    });
  };

  for (let s = 0; s < count; s++) { start(s); idle.push(s); }

  const dispatch = async () => {
    if (deaths.every((d) => d >= MAX_DEATHS) && busy.size === 0) {
      // Every worker keeps dying: fail what is left instead of spawning forever.
      while (!exhausted && nextIndex - nextOut < maxInFlight) {
        const step = await iterator.next();
        if (step.done) { exhausted = true; break; }
        const index = nextIndex++;
        done.set(index, { index, job: step.value, error: new Error(`every worker failed: ${lastDeath?.message ?? "unknown error"}`) });
      }
      return;
    }
    while (!exhausted && idle.length > 0 && nextIndex - nextOut < maxInFlight && !options.signal?.aborted) {
      const step = await iterator.next();
      if (step.done) { exhausted = true; break; }
      const slot = idle.shift()!;
      const index = nextIndex++;
      busy.set(slot, { index, job: step.value });
      const transfer = transferablesOf(step.value);
      workers[slot]!.post({ id: index, job: step.value }, transfer);
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
      if (exhausted && busy.size === 0 && done.size === 0) return;
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
  return {
    post(message) {
      const { id, job } = message as { id: number; job: J };
      Promise.resolve()
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
