// worker_threads entry for `domtopo analyze --workers N`: reads its frames itself (so decoding
// runs in parallel too), analyzes them and posts the rows back, moving the label buffers.
import { parentPort, workerData } from "node:worker_threads";
import { openFrameFiles } from "../io/node-source";
import type { FrameSource } from "../io/source";
import type { Frame } from "../types";
import { AnalyzerCache, runFrameJob, transferablesOf, type FrameJobOptions } from "../sequence/job";

export interface FileFrameJob {
  files: string[];
  index: number;
  options: FrameJobOptions;
  /** File of the background reference frame (its first frame), when the options divide or subtract one. */
  backgroundFile?: string;
}

const cache = new AnalyzerCache();
let source: FrameSource | undefined;
let sourceKey = "";
let reference: { file: string; frame: Frame } | undefined;

async function referenceFrame(file: string): Promise<Frame> {
  if (!reference || reference.file !== file) {
    reference = { file, frame: await openFrameFiles(file).read(0) };
  }
  return reference.frame;
}

export async function handleFileJob(job: FileFrameJob) {
  const key = job.files.join("\n");
  if (!source || key !== sourceKey) {
    source = openFrameFiles(job.files);
    sourceKey = key;
  }
  const where = source.describe(job.index);
  const frame = await source.read(job.index);
  const ref = job.backgroundFile ? await referenceFrame(job.backgroundFile) : undefined;
  return runFrameJob(cache, frame, job.index, where, job.options, ref);
}

// Only in threads started by the pool (workerData marks them), never in a host's own workers.
if (parentPort && (workerData as { domtopoWorker?: boolean } | null)?.domtopoWorker) {
  const port = parentPort;
  // The pool may post the next job before this one is answered: jobs run one after another, in
  // the order they came.
  let last: Promise<unknown> = Promise.resolve();
  port.on("message", (message: { id: number; job: FileFrameJob }) => {
    last = last.then(() => handleFileJob(message.job)).then(
      (result) => port.postMessage({ id: message.id, ok: true, result }, transferablesOf(result)),
      (err: Error) => port.postMessage({ id: message.id, ok: false, message: err?.message ?? String(err) }),
    );
  });
}
