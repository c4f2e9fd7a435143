// Web Workers for the page: a PoolWorker adapter over `Worker` for the library's ordered pool
// (one run = one set of workers, ended when the run ends or is superseded), and a single
// long-lived worker for the frame on view.
import { runOrdered, type PoolOutcome, type PoolWorker } from "../src/index";
import type { FrameJob, FrameReply } from "./protocol";

function newWorker(): Worker {
  // Written out here so that the bundler finds the worker script and builds it with its imports.
  return new Worker(new URL("./worker.ts", import.meta.url), { type: "module", name: "domtopo-analysis" });
}

/** The pool's view of one Web Worker. */
export function webWorker(worker: Worker = newWorker()): PoolWorker {
  return {
    post: (message, transfer) => worker.postMessage(message, transfer ?? []),
    onMessage: (handler) => { worker.onmessage = (e) => handler(e.data); },
    onError: (handler) => {
      worker.onerror = (e) => { e.preventDefault(); handler(new Error(e.message || "the analysis worker stopped")); };
      worker.onmessageerror = () => handler(new Error("a reply of the analysis worker could not be read"));
    },
    terminate: () => worker.terminate(),
  };
}

/** Workers for this machine: the cores the browser reports, at most 4, at most one per frame. */
export function poolSize(frames: number): number {
  const cores = typeof navigator !== "undefined" && navigator.hardwareConcurrency ? navigator.hardwareConcurrency : 2;
  return Math.max(1, Math.min(4, cores, frames));
}

/**
 * Runs the jobs on a fresh pool and yields outcomes in frame order. `cancel()` ends the workers
 * at once (the page starts a new run whenever an option changes).
 */
export function startRun(jobs: Iterable<FrameJob> | AsyncIterable<FrameJob>, frames: number): {
  outcomes: AsyncGenerator<PoolOutcome<FrameJob, FrameReply>>;
  workers: number;
  cancel(): void;
} {
  const spawned: PoolWorker[] = [];
  const controller = new AbortController();
  const workers = poolSize(frames);
  const outcomes = runOrdered<FrameJob, FrameReply>(jobs, () => {
    const w = webWorker();
    spawned.push(w);
    return w;
  }, { workers, signal: controller.signal });
  return {
    outcomes, workers,
    cancel() {
      controller.abort();
      for (const w of spawned) void w.terminate();
    },
  };
}

/** One worker kept for the frame on view; a newer request makes older replies be dropped. */
export class ViewChannel {
  private worker: PoolWorker;
  private nextId = 1;
  private pending = new Map<number, { resolve: (r: FrameReply) => void; reject: (e: Error) => void }>();

  constructor() {
    this.worker = this.start();
  }

  private start(): PoolWorker {
    const w = webWorker();
    w.onMessage((raw) => {
      const m = raw as { id: number; ok: boolean; result?: FrameReply; message?: string };
      const p = this.pending.get(m.id);
      if (!p) return;
      this.pending.delete(m.id);
      if (m.ok) p.resolve(m.result!); else p.reject(new Error(m.message ?? "the analysis failed"));
    });
    w.onError((error) => {
      for (const p of this.pending.values()) p.reject(error);
      this.pending.clear();
      void w.terminate();
      this.worker = this.start();
    });
    return w;
  }

  request(job: FrameJob): Promise<FrameReply> {
    const id = this.nextId++;
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve, reject });
      this.worker.post({ id, job }, job.transfer);
    });
  }
}
