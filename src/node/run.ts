// `domtopo analyze` over a whole movie: frames read and analyzed by a pool of worker threads,
// rows written in frame order as CSV and NDJSON, a JSON run record (inputs with sizes and content
// hashes, options, version, timings), checkpoints so that `--resume` continues an interrupted run
// without losing or duplicating rows, and failed frames reported by index and file.
// A run may cover one contiguous range of the frames (a shard, see shard.ts and merge.ts): then
// its record names the range, and with tracking it also leaves the first and last frame's labels
// and domain columns and its tracker at the end, for merging the shards exactly.
import { createHash } from "node:crypto";
import * as nodeCrypto from "node:crypto";
import * as nodeFs from "node:fs";
import { Worker } from "node:worker_threads";
import { availableParallelism } from "node:os";
import {
  closeSync, existsSync, fstatSync, fsyncSync, ftruncateSync, mkdirSync, openSync, readFileSync,
  renameSync, statSync, unlinkSync, writeSync,
} from "node:fs";
import { join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { openFrameFiles, listFrameFiles } from "../io/node-source";
import { runOrdered, inThreadWorker, type PoolWorker } from "../sequence/pool";
import type { FrameJobOptions, FrameJobResult } from "../sequence/job";
import { handleFileJob, type FileFrameJob } from "./worker";
import { csvLine, domainHeader, type Cell } from "../topology/rows";
import { writeFileAtomic, writeTrackTable } from "./atomic";
import { resolveFrameOptions } from "../topology/options";
import { VERSION } from "../version";
import type { FieldValues } from "../io/fields";
import { DomainTracker, createTracker, eventRow, trackHeader, trackRows, type TrackingOptions } from "../sequence/tracking";
import { encodeBoundaryFrame, shardRange, type BoundaryFrame, type FrameRange, type ShardSpec } from "./shard";

export interface RunConfig {
  /** Frame files, folders or patterns (see listFrameFiles). */
  inputs: string[];
  out: string;
  options: FrameJobOptions;
  /** Field per frame (its count must match the frames). */
  fields?: FieldValues;
  /** Number of worker threads; 1 runs in this thread. @default available cores */
  workers?: number;
  /** Continue an interrupted run in `out`. @default false */
  resume?: boolean;
  /** A failed frame stops the run. @default false */
  strict?: boolean;
  /**
   * Frames between checkpoints. @default 25, and at least a second apart (a checkpoint syncs
   * the tables to disk); given, every that many frames.
   */
  checkpointEvery?: number;
  signal?: AbortSignal;
  onProgress?: (done: number, total: number) => void;
  onFrameError?: (index: number, where: string, message: string) => void;
  /** Called in frame order with every analyzed frame (e.g. for tracking). */
  onResult?: (result: FrameJobResult) => Array<[string, Cell]> | void;
  /** Stop after this many frames (for tests of interrupted runs). */
  stopAfter?: number;
  /** Track domains between consecutive frames (events per frame, DIR/tracks.csv). */
  tracking?: TrackingOptions;
  /** File whose first frame is the background reference for `options.preprocess.background`. */
  backgroundFile?: string;
  /** Write DIR/overlays/frame-NNNNN.png for every `every`-th frame. */
  overlay?: { every: number; scale: number };
  /** Write DIR/spectra/frame-NNNNN.png (log power spectrum, ring marked) for every `every`-th frame. */
  spectra?: { every: number };
  /**
   * Analyze only frames [start, end) of the movie (`end` exclusive), as one shard of a sharded
   * run; frame numbers, fields and sources stay those of the whole movie. @default every frame
   */
  range?: FrameRange;
  /** This run is shard `index` of `count` (0-based); sets `range` by `shardRange` unless given. */
  shard?: ShardSpec;
}

export interface RunSummary {
  frames: number;
  analyzed: number;
  failed: Array<{ frame: number; where: string; message: string }>;
  seconds: number;
  framesPerSecond: number;
  workers: number;
  resumedAt: number;
  completed: boolean;
  /** Frames [start, end) this run covered (the whole movie unless sharded). */
  range: FrameRange;
}

/** Files a sharded run with tracking leaves for the merge (beside its tables). */
export const SHARD_FILES = {
  /** Label image and domain columns of the shard's first analyzed frame. */
  first: "shard.first-frame.bin",
  /** The same of its last analyzed frame. */
  last: "shard.last-frame.bin",
  /** DomainTracker.snapshot() after its last frame (its tracker began fresh on its first frame). */
  tracker: "shard.tracker.bin",
} as const;

const OUTPUTS = ["frames.csv", "frames.ndjson", "domains.csv"] as const;
type OutputName = (typeof OUTPUTS)[number];

interface Checkpoint {
  signature: string;
  framesDone: number;
  bytes: Record<string, number>;
  failed: RunSummary["failed"];
  headerDone: boolean;
}

/**
 * SHA-256 of a file, read in 1 MiB blocks, as raw bytes. Self-contained (its modules come as
 * arguments): the hashing thread runs this same function from its source text.
 */
function sha256Digest(path: string, fs: typeof import("node:fs"), crypto: typeof import("node:crypto")): Uint8Array {
  const h = crypto.createHash("sha256");
  const fd = fs.openSync(path, "r");
  try {
    const buf = new Uint8Array(1 << 20);
    for (;;) {
      const n = fs.readSync(fd, buf, 0, buf.length, null);
      if (n === 0) break;
      h.update(buf.subarray(0, n));
    }
  } finally {
    fs.closeSync(fd);
  }
  return h.digest();
}

/** SHA-256 of a file (hex). */
export function fileSha256(path: string): string {
  return Buffer.from(sha256Digest(path, nodeFs, nodeCrypto)).toString("hex");
}

// The inputs' SHA-256 hashes are computed by a thread of their own while the first frames are
// analyzed (a long movie's hash takes seconds); a checkpoint or the run record waits for them.
const HASH_THREAD = `
const { workerData } = require("node:worker_threads");
const sha256Digest = ${sha256Digest.toString()};
const status = new Int32Array(workerData.shared, 0, 1);
const out = new Uint8Array(workerData.shared, 4);
try {
  const fs = require("node:fs"), crypto = require("node:crypto");
  workerData.paths.forEach((path, k) => out.set(sha256Digest(path, fs, crypto), 32 * k));
  Atomics.store(status, 0, 1);
} catch {
  Atomics.store(status, 0, 2);
}
Atomics.notify(status, 0);
`;

/**
 * SHA-256 of each file from a worker thread; `wait()` blocks until they are known. Where the
 * thread failed (a file it could not read), or gave no answer in time, the files are hashed
 * in this thread, so that a read error is thrown here with its file named.
 */
export class BackgroundHashes {
  /** Whether the hashes came from the thread (else from this one). */
  fromThread = false;
  private readonly status: Int32Array;
  private readonly digests: Uint8Array;
  private hashes: string[] | undefined;
  private readonly patienceMs: number;
  constructor(private readonly paths: string[], bytes: number) {
    const shared = new SharedArrayBuffer(4 + 32 * paths.length);
    this.status = new Int32Array(shared, 0, 1);
    this.digests = new Uint8Array(shared, 4);
    // (at 20 MB/s, and 30 s on top: far beyond a disk's pace, so only a stuck thread is waited out)
    this.patienceMs = 30_000 + bytes / 20_000;
    const w = new Worker(HASH_THREAD, { eval: true, workerData: { paths, shared } });
    w.unref();
    w.on("error", () => { Atomics.store(this.status, 0, 2); });
  }
  wait(): string[] {
    if (this.hashes) return this.hashes;
    const until = performance.now() + this.patienceMs;
    while (Atomics.load(this.status, 0) === 0 && performance.now() < until) Atomics.wait(this.status, 0, 0, 200);
    this.fromThread = Atomics.load(this.status, 0) === 1;
    this.hashes = this.fromThread
      ? this.paths.map((_p, k) => Buffer.from(this.digests.subarray(32 * k, 32 * k + 32)).toString("hex"))
      : this.paths.map(fileSha256);
    return this.hashes;
  }
}

class PartialFile {
  private fd: number;
  private position = 0;
  constructor(readonly path: string, keepBytes: number | undefined) {
    if (keepBytes === undefined) {
      this.fd = openSync(path, "w");
    } else {
      this.fd = openSync(path, "r+");
      const size = fstatSync(this.fd).size;
      if (size < keepBytes) throw new Error(`${path}: shorter (${size} bytes) than its checkpoint (${keepBytes}); cannot resume`);
      ftruncateSync(this.fd, keepBytes); // drop rows written after the last checkpoint
      this.position = keepBytes;
    }
  }
  // Rows wait here until about 64 KB are pending (a few writes a second instead of one per
  // frame); sync, size and close write them first. A resume truncates to the last checkpoint
  // anyway, so rows pending at a crash are rows it writes again.
  private text = "";
  private chunks: Uint8Array[] = [];
  private pending = 0;
  write(text: string): void {
    this.text += text;
    if (this.text.length >= PENDING_BYTES) this.flushText();
  }
  writeBytes(bytes: Uint8Array): void {
    this.flushText();
    this.chunks.push(bytes);
    this.pending += bytes.length;
    if (this.pending >= PENDING_BYTES) this.flush();
  }
  private flushText(): void {
    if (this.text.length === 0) return;
    const b = Buffer.from(this.text, "utf8");
    this.text = "";
    this.chunks.push(b);
    this.pending += b.length;
    if (this.pending >= PENDING_BYTES) this.flush();
  }
  private flush(): void {
    const all = this.chunks.length === 1 ? this.chunks[0]! : Buffer.concat(this.chunks);
    this.chunks = [];
    this.pending = 0;
    let done = 0;
    while (done < all.length) done += writeSync(this.fd, all, done, all.length - done, this.position + done);
    this.position += all.length;
  }
  private flushAll(): void {
    this.flushText();
    if (this.chunks.length > 0) this.flush();
  }
  size(): number { this.flushAll(); return this.position; }
  sync(): void { this.flushAll(); fsyncSync(this.fd); }
  close(): void { this.flushAll(); closeSync(this.fd); }
}

const PENDING_BYTES = 1 << 16;

function workerThread(): PoolWorker {
  const w = new Worker(new URL("./worker.js", import.meta.url), { workerData: { domtopoWorker: true } });
  let stopping = false;
  return {
    post: (m, t) => w.postMessage(m, t as never),
    onMessage: (h) => { w.on("message", h); },
    onError: (h) => {
      w.on("error", h);
      w.on("exit", (code) => { if (!stopping && code !== 0) h(new Error(`worker thread exited with code ${code}`)); });
    },
    terminate: () => { stopping = true; return w.terminate(); },
  };
}

/** Runs the analysis of a movie into `config.out`. */
export async function runAnalysis(config: RunConfig): Promise<RunSummary> {
  const started = performance.now();
  const frameOptions = resolveFrameOptions(config.options.frame); // units and defaults for headers
  const files = listFrameFiles(config.inputs);
  const source = openFrameFiles(files);
  const total = source.count;
  if (config.fields && config.fields.values.length !== total) {
    throw new Error(`expected ${total} field values for ${total} frames, got ${config.fields.values.length} from ${config.fields.source}`);
  }
  const sharded = config.range !== undefined || config.shard !== undefined;
  const range = checkRange(config, total);
  const out = resolve(config.out);
  mkdirSync(out, { recursive: true });
  const sizes = files.map((path) => statSync(path).size);
  // A fresh run hashes its inputs in the background; a resumed one needs the hashes now (to
  // check that the inputs are those of the interrupted run).
  const hashing = config.resume ? undefined : new BackgroundHashes(files, sizes.reduce((a, b) => a + b, 0));
  let inputs: Array<{ path: string; bytes: number; sha256: string }> | undefined;
  const inputRecords = () => {
    if (!inputs) {
      const hashes = hashing ? hashing.wait() : files.map(fileSha256);
      inputs = files.map((path, k) => ({ path: resolve(path), bytes: sizes[k]!, sha256: hashes[k]! }));
    }
    return inputs;
  };
  const backgroundSha = config.backgroundFile ? fileSha256(config.backgroundFile) : null;
  const jobOptions: FrameJobOptions = {
    ...config.options,
    ...(config.tracking ? { tracking: true } : {}),
    ...(config.overlay ? { overlay: config.overlay } : {}),
    ...(config.spectra ? { spectra: config.spectra } : {}),
  };
  let signatureHex: string | undefined;
  const signature = () => (signatureHex ??= createHash("sha256").update(JSON.stringify({
    version: VERSION, inputs: inputRecords().map((i) => [i.path, i.bytes, i.sha256]), options: jobOptions,
    tracking: config.tracking ?? null, fields: config.fields ? Array.from(config.fields.values) : null,
    background: backgroundSha,
    ...(sharded ? { range, shard: config.shard ?? null } : {}),
  })).digest("hex"));
  const progressPath = join(out, "run.progress.json");
  const trackerPath = join(out, "run.tracker.bin");
  let checkpoint: Checkpoint | undefined;
  if (config.resume && existsSync(progressPath)) {
    checkpoint = JSON.parse(readFileSync(progressPath, "utf8")) as Checkpoint;
    if (checkpoint.signature !== signature()) {
      throw new Error(`${progressPath}: the interrupted run had other inputs, options or version; cannot resume (start again without --resume)`);
    }
  } else if (config.resume) {
    throw new Error(`${out}: no interrupted run to resume (no run.progress.json)`);
  }
  const wanted: OutputName[] = config.options.domains ? [...OUTPUTS] : ["frames.csv", "frames.ndjson"];
  const files_: Partial<Record<OutputName, PartialFile>> = {};
  for (const name of wanted) {
    files_[name] = new PartialFile(join(out, `${name}.partial`), checkpoint ? checkpoint.bytes[name] ?? 0 : undefined);
  }
  const failed: RunSummary["failed"] = checkpoint ? [...checkpoint.failed] : [];
  let headerDone = checkpoint?.headerDone ?? false;
  const startAt = checkpoint?.framesDone ?? range.start;
  let done = startAt;
  const fieldUnit = config.fields?.unit || "";
  const fieldName = config.fields ? `field${fieldUnit ? "_" + fieldUnit.replace(/[^A-Za-z0-9µ]+/g, "") : ""}` : undefined;
  if (!checkpoint && files_["domains.csv"]) {
    const lead = ["frame", "source", ...(fieldName ? [fieldName] : [])]; // (the names of leadOf's cells)
    files_["domains.csv"].write(csvLine([...lead, ...domainHeader(frameOptions.unit, frameOptions.skeleton !== "off")]));
  }

  let tracker: DomainTracker | undefined;
  const trackerFor = (w: number, h: number) => {
    if (!tracker) {
      tracker = createTracker(w, h, {
        boundary: config.options.frame.boundary, pixelSize: config.options.frame.pixelSize, ...config.tracking,
      });
      if (checkpoint && existsSync(trackerPath)) tracker.restore(readFileSync(trackerPath));
    }
    return tracker;
  };
  // The shard's last analyzed frame so far, written at each checkpoint (so a resumed shard has it).
  let lastBoundary: BoundaryFrame | undefined;
  const saveCheckpoint = () => {
    const bytes: Record<string, number> = {};
    for (const name of wanted) { files_[name]!.sync(); bytes[name] = files_[name]!.size(); }
    if (tracker) writeFileAtomic(trackerPath, tracker.snapshot());
    if (lastBoundary) { writeFileAtomic(join(out, SHARD_FILES.last), encodeBoundaryFrame(lastBoundary)); lastBoundary = undefined; }
    const cp: Checkpoint = { signature: signature(), framesDone: done, bytes, failed, headerDone };
    writeFileAtomic(progressPath, JSON.stringify(cp) + "\n");
  };

  // Worker threads run the built dist/worker.js; from the sources (tests) there is none: run in
  // this thread then.
  const threadsAvailable = existsSync(fileURLToPath(new URL("./worker.js", import.meta.url)));
  const workers = threadsAvailable
    ? Math.max(1, Math.min(config.workers ?? availableParallelism(), Math.max(1, range.end - startAt)))
    : 1;
  const end = config.stopAfter !== undefined ? Math.min(range.end, startAt + config.stopAfter) : range.end;
  // The cells that lead a frame's rows in every table: the frame, its source and (with fields) its field.
  const leadOf = (index: number, where: string): Array<[string, Cell]> => [
    ["frame", index], ["source", where], ...(fieldName ? [[fieldName, config.fields!.values[index]!] as [string, Cell]] : []),
  ];
  function* jobs(): Generator<FileFrameJob> {
    for (let index = startAt; index < end; index++) {
      // The worker writes the domain rows with their lead cells.
      const options = jobOptions.domains ? { ...jobOptions, domainLead: leadOf(index, source.describe(index)).map(([, v]) => v) } : jobOptions;
      yield { files, index, options, ...(config.backgroundFile ? { backgroundFile: config.backgroundFile } : {}) };
    }
  }
  const spawn = workers === 1 ? () => inThreadWorker(handleFileJob) : workerThread;
  const every = config.checkpointEvery ?? 25;
  const minGapMs = config.checkpointEvery === undefined ? 1000 : 0;
  let sinceCheckpoint = 0, lastCheckpoint = performance.now();
  try {
    for await (const o of runOrdered<FileFrameJob, FrameJobResult>(jobs(), spawn, { workers, signal: config.signal })) {
      const index = o.job.index;
      if (o.error) {
        const where = source.describe(index);
        // Reader errors already name the file (and frame); others get the frame's place in front.
        const file = where.replace(/ (page|frame) \d+$/, "");
        const message = o.error.message.includes(file) ? o.error.message : `${where}: ${o.error.message}`;
        failed.push({ frame: index, where, message });
        config.onFrameError?.(index, where, message);
        if (config.strict) throw new Error(`frame ${index} (${where}) failed: ${o.error.message}`);
      } else {
        const r = o.result!;
        const lead = leadOf(index, r.where);
        const extra = config.onResult?.(r) ?? [];
        if (config.tracking && r.tracking) {
          const t = r.tracking;
          const tk = trackerFor(r.width, r.height);
          const info = { frame: index, ...(config.fields ? { field: config.fields.values[index]! } : {}) };
          if (sharded) {
            lastBoundary = { ...info, width: r.width, height: r.height, labels: t.labels, count: t.count, phase: t.phase, area: t.area, centroidX: t.centroidX, centroidY: t.centroidY };
            if (tk.frameCount === 0) writeFileAtomic(join(out, SHARD_FILES.first), encodeBoundaryFrame(lastBoundary));
          }
          const events = tk.push(t.labels, t, info);
          extra.push(...eventRow(events));
        }
        if (r.spectrumPng) {
          writeFileAtomic(join(out, "spectra", `frame-${String(index).padStart(5, "0")}.png`), r.spectrumPng);
        }
        if (r.overlayPng) {
          writeFileAtomic(join(out, "overlays", `frame-${String(index).padStart(5, "0")}.png`), r.overlayPng);
        }
        const row = [...lead, ...r.row, ...extra];
        if (!headerDone) { files_["frames.csv"]!.write(csvLine(row.map(([k]) => k))); headerDone = true; }
        files_["frames.csv"]!.write(csvLine(row.map(([, v]) => v)));
        files_["frames.ndjson"]!.write(JSON.stringify(Object.fromEntries(row.map(([k, v]) =>
          [k, typeof v === "number" && !Number.isFinite(v) ? null : v]))) + "\n");
        if (files_["domains.csv"] && r.domainBytes) files_["domains.csv"].writeBytes(r.domainBytes);
      }
      done = index + 1;
      config.onProgress?.(done - range.start, range.end - range.start);
      if (++sinceCheckpoint >= every && performance.now() - lastCheckpoint >= minGapMs) {
        saveCheckpoint();
        sinceCheckpoint = 0;
        lastCheckpoint = performance.now();
      }
    }
    saveCheckpoint();
  } finally {
    for (const name of wanted) files_[name]!.close();
  }
  const completed = done === range.end;
  const seconds = (performance.now() - started) / 1000;
  const analyzed = done - startAt - failed.filter((f) => f.frame >= startAt).length;
  const summary: RunSummary = {
    frames: total, analyzed, failed, seconds, framesPerSecond: (done - startAt) / Math.max(seconds, 1e-9),
    workers, resumedAt: startAt, completed, range,
  };
  if (completed) {
    for (const name of wanted) renameSync(join(out, `${name}.partial`), join(out, name));
    if (config.tracking) {
      const unit = frameOptions.unit;
      // A resumed run with no frame left to analyze has its tracker only in the checkpoint.
      if (!tracker && existsSync(trackerPath)) tracker = DomainTracker.fromSnapshot(readFileSync(trackerPath));
      writeTrackTable(join(out, "tracks.csv"), csvLine(trackHeader(unit)), tracker?.trackCount ?? 0,
        (s, e) => trackRows(tracker!.trackSummary(s, e)).map((r) => csvLine(r)).join(""));
      if (sharded) {
        if (tracker) writeFileAtomic(join(out, SHARD_FILES.tracker), tracker.snapshot());
        else for (const f of Object.values(SHARD_FILES)) if (existsSync(join(out, f))) unlinkSync(join(out, f));
      }
      if (existsSync(trackerPath)) unlinkSync(trackerPath);
    }
    writeFileAtomic(join(out, "run.json"), JSON.stringify({
      tool: "domtopo", version: VERSION, command: "analyze", finished: new Date().toISOString(),
      inputs: inputRecords(), frames: total, options: jobOptions,
      background: config.backgroundFile ? { path: resolve(config.backgroundFile), sha256: backgroundSha } : null,
      field: config.fields ? { unit: config.fields.unit, source: config.fields.source } : null,
      outputs: [...wanted, ...(config.tracking ? ["tracks.csv"] : []), ...(config.overlay ? ["overlays/"] : []), ...(config.spectra ? ["spectra/"] : [])],
      tracking: config.tracking ?? null, failures: failed,
      timings: { seconds, framesPerSecond: summary.framesPerSecond, workers, resumedAtFrame: startAt },
      ...(sharded ? { shard: shardRecord(config.shard, range, Boolean(config.tracking && tracker)) } : {}),
    }, null, 2) + "\n");
    unlinkSync(progressPath);
  }
  return summary;
}

function checkRange(config: RunConfig, total: number): FrameRange {
  const fromShard = config.shard ? shardRange(config.shard.index, config.shard.count, total) : undefined;
  const range = config.range ?? fromShard ?? { start: 0, end: total };
  const { start, end } = range;
  if (!Number.isInteger(start) || !Number.isInteger(end) || start < 0 || end > total || start >= end) {
    throw new Error(`frame range ${start}..${end}: expected whole numbers with 0 <= start < end <= ${total} (end exclusive) for ${total} frames`);
  }
  if (fromShard && (fromShard.start !== start || fromShard.end !== end)) {
    throw new Error(`frame range ${start}..${end}: shard ${config.shard!.index} of ${config.shard!.count} covers frames ${fromShard.start}..${fromShard.end}`);
  }
  return { start, end };
}

/** The run record's `shard` entry: which shard, its frames [start, end), the files for the merge. */
function shardRecord(shard: ShardSpec | undefined, range: FrameRange, tracked: boolean) {
  return {
    index: shard?.index ?? null, count: shard?.count ?? null, start: range.start, end: range.end,
    files: tracked ? { ...SHARD_FILES } : null,
  };
}
