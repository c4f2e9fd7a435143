import { describe, it, expect } from "vitest";
import { runOrdered, inThreadWorker, type PoolWorker } from "../../src/sequence/pool";

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function collect<T>(it: AsyncIterable<T>): Promise<T[]> {
  const out: T[] = [];
  for await (const x of it) out.push(x);
  return out;
}

describe("the ordered worker pool", () => {
  it("delivers results in job order although workers finish out of order", async () => {
    const jobs = Array.from({ length: 20 }, (_, i) => i);
    const out = await collect(runOrdered<number, number>(jobs,
      () => inThreadWorker(async (j: number) => { await sleep((j * 7) % 5); return j * j; }), { workers: 3 }));
    expect(out.map((o) => o.index)).toEqual(jobs);
    expect(out.map((o) => o.result)).toEqual(jobs.map((j) => j * j));
  });

  it("never has more than maxInFlight jobs dispatched or waiting", async () => {
    let running = 0, peak = 0;
    const out = runOrdered<number, number>(Array.from({ length: 30 }, (_, i) => i),
      () => inThreadWorker(async (j: number) => {
        running++; peak = Math.max(peak, running);
        await sleep(j === 0 ? 20 : 1); // the first job is slow: the others must wait for it
        running--;
        return j;
      }), { workers: 2, maxInFlight: 4 });
    let delivered = 0;
    for await (const o of out) { expect(o.index).toBe(delivered++); }
    expect(delivered).toBe(30);
    expect(peak).toBeLessThanOrEqual(2);
  });

  it("reports a failing job with its index and goes on", async () => {
    const out = await collect(runOrdered<number, number>([1, 2, 3, 4],
      () => inThreadWorker((j: number) => { if (j === 3) throw new Error("frame 3 is corrupt"); return j; }), { workers: 2 }));
    expect(out.map((o) => o.result)).toEqual([1, 2, undefined, 4]);
    expect(out[2]!.error!.message).toBe("frame 3 is corrupt");
  });

  it("replaces a worker that dies and fails only its job", async () => {
    let spawned = 0;
    const spawn = (): PoolWorker => {
      spawned++;
      let onMsg: (m: unknown) => void = () => {};
      let onErr: (e: Error) => void = () => {};
      return {
        post(m) {
          const { id, job } = m as { id: number; job: number };
          setTimeout(() => (job === 5 ? onErr(new Error("worker exited")) : onMsg({ id, ok: true, result: job })), 1);
        },
        onMessage(h) { onMsg = h; },
        onError(h) { onErr = h; },
        terminate() {},
      };
    };
    const out = await collect(runOrdered<number, number>([4, 5, 6, 7], spawn, { workers: 2 }));
    expect(out.map((o) => o.result)).toEqual([4, undefined, 6, 7]);
    expect(out[1]!.error!.message).toBe("worker exited");
    expect(spawned).toBe(3);
  });

  it("stops dispatching when cancelled and terminates its workers", async () => {
    const ctl = new AbortController();
    let terminated = 0;
    const spawn = () => {
      const w = inThreadWorker(async (j: number) => { await sleep(1); return j; });
      return { ...w, terminate() { terminated++; } };
    };
    const seen: number[] = [];
    for await (const o of runOrdered<number, number>(Array.from({ length: 100 }, (_, i) => i), spawn, { workers: 2, signal: ctl.signal })) {
      seen.push(o.index);
      if (o.index === 4) ctl.abort();
    }
    expect(seen.length).toBeLessThan(10);
    expect(seen).toEqual(seen.map((_, i) => i));
    expect(terminated).toBe(2);
  });

  it("rejects a bad worker count", async () => {
    await expect(collect(runOrdered([1], () => inThreadWorker((j) => j), { workers: 0 })))
      .rejects.toThrow("workers: expected a whole number >= 1, got 0");
  });
});

describe("workers that cannot start", () => {
  it("gives up after repeated deaths and fails the remaining jobs instead of respawning forever", async () => {
    let spawned = 0;
    const spawn = (): PoolWorker => {
      spawned++;
      let onErr: (e: Error) => void = () => {};
      setTimeout(() => onErr(new Error("cannot find module worker.js")), 1);
      return { post() {}, onMessage() {}, onError(h) { onErr = h; }, terminate() {} };
    };
    const out: Array<{ index: number; error?: Error }> = [];
    for await (const o of runOrdered<number, number>(Array.from({ length: 20 }, (_, i) => i), spawn, { workers: 2 })) out.push(o);
    expect(out).toHaveLength(20);
    expect(out.every((o) => o.error !== undefined)).toBe(true);
    expect(out[19]!.error!.message).toMatch(/cannot find module worker\.js/);
    expect(spawned).toBeLessThanOrEqual(6);
  });
});

describe("jobs queued ahead in a worker", () => {
  it("posts the next job before the first is answered, runs them in order, and keeps job order", async () => {
    const posted: number[][] = [];
    const out = await collect(runOrdered<number, number>(Array.from({ length: 12 }, (_, i) => i), (slot) => {
      const w = inThreadWorker(async (j: number) => { await sleep(j % 3); return 10 * j; });
      posted[slot] = [];
      return { ...w, post(m, t) { posted[slot]!.push((m as { id: number }).id); w.post(m, t); } };
    }, { workers: 2, perWorker: 2 }));
    expect(out.map((o) => o.result)).toEqual(Array.from({ length: 12 }, (_, i) => 10 * i));
    // Both workers got two jobs at the start (before any answer): 0, 2 and 1, 3.
    expect(posted[0]!.slice(0, 2)).toEqual([0, 2]);
    expect(posted[1]!.slice(0, 2)).toEqual([1, 3]);
    expect(posted[0]!.length + posted[1]!.length).toBe(12);
  });

  it("runs a job queued behind a job whose worker died on a fresh worker", async () => {
    const spawn = (): PoolWorker => {
      let onMsg: (m: unknown) => void = () => {};
      let onErr: (e: Error) => void = () => {};
      const queue: Array<{ id: number; job: number }> = [];
      const next = () => {
        const e = queue[0];
        if (!e) return;
        setTimeout(() => {
          if (e.job === 1) { onErr(new Error("worker exited")); return; } // dies with job 3 queued behind
          queue.shift();
          onMsg({ id: e.id, ok: true, result: e.job });
          next();
        }, 2);
      };
      return {
        post(m) { queue.push(m as { id: number; job: number }); if (queue.length === 1) next(); },
        onMessage(h) { onMsg = h; },
        onError(h) { onErr = h; },
        terminate() { queue.length = 0; },
      };
    };
    const out = await collect(runOrdered<number, number>([0, 1, 2, 3, 4, 5], spawn, { workers: 2, perWorker: 2 }));
    expect(out.map((o) => o.result)).toEqual([0, undefined, 2, 3, 4, 5]);
    expect(out[1]!.error!.message).toBe("worker exited");
  });

  it("rejects a bad perWorker", async () => {
    await expect(collect(runOrdered([1], () => inThreadWorker((j) => j), { perWorker: 0 })))
      .rejects.toThrow("perWorker: expected a whole number >= 1, got 0");
  });
});
