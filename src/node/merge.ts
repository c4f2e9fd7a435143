// `domtopo merge`: the shards of one movie run (each `analyze --shard K/N`) into the tables of
// one unbroken run. Refuses shards whose run records disagree (naming the entry) and sets of
// shards that do not tile the movie (naming the missing, repeated or overlapping frames).
// Tables are concatenated in frame order. With tracking, each cut is replayed: the running
// tracker (every frame before the cut) is continued with the shard's own tracker
// (DomainTracker.append), which gives the event cells of the shard's first frame and the track
// ids, births, lifetimes and ends of an unsharded run; those cells are rewritten and tracks.csv
// is written from the stitched tracker. Every file appears whole (atomic writes), run.json last.
import { closeSync, existsSync, openSync, readFileSync, readSync, readdirSync, statSync } from "node:fs";
import { join, resolve } from "node:path";
import { AtomicWriter, writeFileAtomic, writeTrackTable } from "./atomic";
import { SHARD_FILES } from "./run";
import { decodeBoundaryFrame, type FrameRange } from "./shard";
import { csvLine } from "../topology/rows";
import { resolveFrameOptions, type FrameOptions } from "../topology/options";
import { DomainTracker, eventRow, trackHeader, trackRows, type FrameEvents } from "../sequence/tracking";

export interface MergeConfig {
  /** Shard folders (each with the run.json of a finished shard), or folders holding shard-K-of-N folders. */
  shards: string[];
  out: string;
}

export interface MergeSummary {
  frames: number;
  shards: Array<{ folder: string; start: number; end: number }>;
  failed: Array<{ frame: number; where: string; message: string }>;
  tracks: number;
  seconds: number;
}

/** Entries of run.json that differ between shards by nature; every other one must agree. */
const PER_SHARD = ["finished", "timings", "failures", "shard"];

interface ShardRecord {
  folder: string;
  record: Record<string, unknown> & {
    frames: number; outputs: string[]; failures: MergeSummary["failed"];
    shard: { index: number | null; count: number | null; start: number; end: number; files: typeof SHARD_FILES | null };
  };
}

/** The shard folders named by the arguments (a folder of shard-K-of-N folders gives those). */
export function shardFolders(args: string[]): string[] {
  const out: string[] = [];
  for (const arg of args) {
    const dir = resolve(arg);
    if (!existsSync(dir) || !statSync(dir).isDirectory()) throw new Error(`${arg}: no such folder`);
    const inner = readdirSync(dir).filter((n) => /^shard-\d+-of-\d+$/.test(n)).sort((a, b) => {
      const [, ka, na] = /^shard-(\d+)-of-(\d+)$/.exec(a)!.map(Number);
      const [, kb, nb] = /^shard-(\d+)-of-(\d+)$/.exec(b)!.map(Number);
      return na! - nb! || ka! - kb!;
    });
    // A run folder that holds its shards (and maybe their merge) stands for the shards.
    if (inner.length === 0 || isShard(dir)) {
      if (existsSync(join(dir, "run.json")) || existsSync(join(dir, "run.progress.json"))) { out.push(dir); continue; }
    }
    if (inner.length === 0) throw new Error(`${arg}: neither a shard folder (no run.json) nor a folder of shard-K-of-N folders`);
    out.push(...inner.map((n) => join(dir, n)));
  }
  return out;
}

function isShard(dir: string): boolean {
  try {
    return Boolean(JSON.parse(readFileSync(join(dir, "run.json"), "utf8")).shard);
  } catch {
    return existsSync(join(dir, "run.progress.json"));
  }
}

function readRecord(folder: string): ShardRecord {
  const path = join(folder, "run.json");
  if (!existsSync(path)) {
    throw new Error(existsSync(join(folder, "run.progress.json"))
      ? `${folder}: the shard did not finish (run.progress.json, no run.json); continue it with analyze --resume`
      : `${folder}: no run.json`);
  }
  let record: ShardRecord["record"];
  try { record = JSON.parse(readFileSync(path, "utf8")); } catch (err) {
    throw new Error(`${path}: unreadable (${(err as Error).message})`);
  }
  if (record.command !== "analyze") throw new Error(`${path}: not the record of an analyze run (command ${JSON.stringify(record.command)})`);
  if (!record.shard || typeof record.shard.start !== "number" || typeof record.shard.end !== "number") {
    throw new Error(`${path}: not a shard (no shard entry with its frames); run analyze with --shard K/N`);
  }
  return { folder, record };
}

/** Paths where two JSON values differ, e.g. `options.frame.threshold` or `inputs[2].sha256`. */
export function differences(a: unknown, b: unknown, path = "", out: string[] = []): string[] {
  if (out.length >= 8) return out;
  if (a !== null && b !== null && typeof a === "object" && typeof b === "object" && Array.isArray(a) === Array.isArray(b)) {
    if (Array.isArray(a) && Array.isArray(b)) {
      if (a.length !== b.length) { out.push(`${path || "(record)"} (${a.length} vs ${b.length} entries)`); return out; }
      a.forEach((v, i) => differences(v, b[i], `${path}[${i}]`, out));
      return out;
    }
    const ao = a as Record<string, unknown>, bo = b as Record<string, unknown>;
    for (const k of [...new Set([...Object.keys(ao), ...Object.keys(bo)])]) {
      differences(ao[k], bo[k], path ? `${path}.${k}` : k, out);
    }
    return out;
  }
  if (JSON.stringify(a) !== JSON.stringify(b)) out.push(path || "(record)");
  return out;
}

function valueAt(v: unknown, path: string): string {
  for (const part of path.replace(/\[(\d+)\]/g, ".$1").split(".")) {
    if (v === null || typeof v !== "object") return "nothing";
    v = (v as Record<string, unknown>)[part];
  }
  const text = v === undefined ? "nothing" : JSON.stringify(v);
  return text.length > 80 ? text.slice(0, 77) + "..." : text;
}

const frames = (r: FrameRange) => (r.end - r.start === 1 ? `frame ${r.start}` : `frames ${r.start} to ${r.end - 1}`);
const label = (s: ShardRecord) => {
  const sh = s.record.shard;
  return sh.index !== null && sh.count !== null ? `shard ${sh.index} of ${sh.count} (${s.folder})` : s.folder;
};

/** Checks that the shards agree and tile the movie; returns them in frame order. */
export function checkShards(folders: string[]): ShardRecord[] {
  if (folders.length === 0) throw new Error("merge: expected at least one shard folder");
  const shards = folders.map(readRecord);
  const strip = (r: ShardRecord["record"]) => Object.fromEntries(Object.entries(r).filter(([k]) => !PER_SHARD.includes(k)));
  const base = strip(shards[0]!.record);
  for (const s of shards.slice(1)) {
    const diff = differences(base, strip(s.record));
    if (diff.length > 0) {
      const first = diff[0]!;
      throw new Error(`shards disagree on ${diff.join(", ")}: ${shards[0]!.folder} has ${valueAt(base, first)}, ` +
        `${s.folder} has ${valueAt(strip(s.record), first)} (shards of one run need the same inputs, hashes, options and version)`);
    }
  }
  const total = shards[0]!.record.frames;
  const sorted = [...shards].sort((a, b) => a.record.shard.start - b.record.shard.start || a.record.shard.end - b.record.shard.end);
  const problems: string[] = [];
  let next = 0;
  let prev: ShardRecord | undefined;
  for (const s of sorted) {
    const { start, end } = s.record.shard;
    if (prev && prev.record.shard.start === start && prev.record.shard.end === end) {
      problems.push(`${frames({ start, end })} given twice: ${label(prev)} and ${label(s)}`);
    } else if (start < next) {
      problems.push(`${label(prev!)} and ${label(s)} overlap on ${frames({ start, end: Math.min(next, end) })}`);
    } else if (start > next) {
      problems.push(`${frames({ start: next, end: start })} in no shard${missingShards(sorted, next, start)}`);
    }
    if (end > next) next = end;
    prev = s;
  }
  if (next < total) problems.push(`${frames({ start: next, end: total })} in no shard${missingShards(sorted, next, total)}`);
  if (problems.length > 0) {
    throw new Error(`shards do not cover the ${total} frames exactly once: ${problems.join("; ")}`);
  }
  return sorted;
}

/** " (shard 2 of 4 missing?)" when every shard given is of the same N. */
function missingShards(shards: ShardRecord[], start: number, end: number): string {
  const n = shards[0]!.record.shard.count;
  if (n === null || !shards.every((s) => s.record.shard.count === n)) return "";
  const total = shards[0]!.record.frames;
  const missing: number[] = [];
  for (let k = 0; k < n; k++) {
    const a = Math.floor((k * total) / n), b = Math.floor(((k + 1) * total) / n);
    if (a < end && b > start && !shards.some((s) => s.record.shard.index === k)) missing.push(k);
  }
  return missing.length ? ` (missing ${missing.map((k) => `shard ${k} of ${n}`).join(", ")})` : "";
}

/** The first `count` lines of a file (with their newlines) and the byte offset after them. */
function headLines(path: string, count: number): { lines: string[]; offset: number } {
  const fd = openSync(path, "r");
  try {
    const chunks: Buffer[] = [];
    let size = 0, found = 0;
    const block = Buffer.alloc(1 << 16);
    for (;;) {
      const n = readSync(fd, block, 0, block.length, size);
      if (n === 0) break;
      const piece = Buffer.from(block.subarray(0, n));
      chunks.push(piece);
      size += n;
      for (let i = 0; i < n && found < count; i++) if (piece[i] === 10) found++;
      if (found >= count) break;
    }
    const all = Buffer.concat(chunks);
    const lines: string[] = [];
    let at = 0;
    while (lines.length < count && at < all.length) {
      const nl = all.indexOf(10, at);
      if (nl < 0) throw new Error(`${path}: last line has no end (a table cut short?)`);
      lines.push(all.subarray(at, nl + 1).toString("utf8"));
      at = nl + 1;
    }
    return { lines, offset: at };
  } finally {
    closeSync(fd);
  }
}

/** Copies a file from `offset` to its end into `w`, in 1 MiB blocks. */
function copyRest(path: string, offset: number, w: AtomicWriter): void {
  const fd = openSync(path, "r");
  try {
    const block = new Uint8Array(1 << 20);
    let at = offset;
    for (;;) {
      const n = readSync(fd, block, 0, block.length, at);
      if (n === 0) break;
      w.write(block.subarray(0, n));
      at += n;
    }
  } finally {
    closeSync(fd);
  }
}

/** A frames.csv line whose last cells (the event columns, empty in a shard's first frame) get `events`. */
function withEventCells(line: string, events: ReturnType<typeof eventRow>, where: string): string {
  const blanks = ",".repeat(events.length) + "\n";
  if (!line.endsWith(blanks)) throw new Error(`${where}: expected the first frame's ${events.length} event cells to be empty`);
  return line.slice(0, line.length - blanks.length) + "," + csvLine(events.map(([, v]) => v));
}

/** Merges finished shards into `config.out`. */
export function mergeShards(config: MergeConfig): MergeSummary {
  const started = performance.now();
  const shards = checkShards(shardFolders(config.shards));
  const base = shards[0]!.record;
  const outputs = base.outputs;
  const tables = outputs.filter((o) => ["frames.csv", "frames.ndjson", "domains.csv"].includes(o));
  for (const s of shards) {
    for (const t of [...tables, ...(base.tracking ? ["tracks.csv"] : [])]) {
      if (!existsSync(join(s.folder, t))) throw new Error(`${s.folder}: ${t} is missing`);
    }
  }

  // Tracking across every cut, before anything is written.
  const firstRowEvents = new Map<ShardRecord, ReturnType<typeof eventRow>>();
  let tracker: DomainTracker | undefined;
  if (base.tracking) {
    for (const s of shards) {
      const files = s.record.shard.files;
      if (!files) continue; // no frame of this shard was analyzed
      for (const f of Object.values(files)) {
        if (!existsSync(join(s.folder, f))) throw new Error(`${s.folder}: ${f} is missing (needed to track across the cut)`);
      }
      const later = DomainTracker.fromSnapshot(readFileSync(join(s.folder, files.tracker)));
      const firstPath = join(s.folder, files.first);
      const first = decodeBoundaryFrame(readFileSync(firstPath), firstPath);
      tracker ??= new DomainTracker(later.width, later.height, later.options);
      let events: FrameEvents;
      try {
        events = tracker.append(later, {
          labels: first.labels, domains: first, info: { frame: first.frame, ...(first.field !== undefined ? { field: first.field } : {}) },
        });
      } catch (err) {
        throw new Error(`${s.folder}: cannot continue the tracks across the cut at frame ${first.frame}: ${(err as Error).message}`);
      }
      firstRowEvents.set(s, eventRow(events));
    }
  }

  const out = resolve(config.out);
  const firstFrameOf = (s: ShardRecord) => {
    const files = s.record.shard.files;
    return files ? decodeBoundaryFrame(readFileSync(join(s.folder, files.first)), join(s.folder, files.first)).frame : undefined;
  };
  for (const name of tables) {
    const w = new AtomicWriter(join(out, name));
    try {
      let header: string | undefined;
      for (const s of shards) {
        const path = join(s.folder, name);
        const hasHeader = name !== "frames.ndjson";
        const events = name === "domains.csv" ? undefined : firstRowEvents.get(s);
        const { lines, offset } = headLines(path, (hasHeader ? 1 : 0) + (events ? 1 : 0));
        if (lines.length === 0) continue; // a shard whose every frame failed has no frame rows
        let at = 0;
        if (hasHeader) {
          const h = lines[at++]!;
          if (header === undefined) { header = h; w.write(h); } else if (h !== header) {
            throw new Error(`${path}: its header differs from that of ${join(shards[0]!.folder, name)}`);
          }
        }
        if (events) {
          const line = lines[at];
          if (line === undefined) throw new Error(`${path}: no row for the shard's first frame`);
          const frame = firstFrameOf(s);
          if (name === "frames.csv") {
            if (!line.startsWith(`${frame},`)) throw new Error(`${path}: expected the first row to be frame ${frame}`);
            const names = header!.trimEnd().split(",").slice(-events.length);
            if (names.join(",") !== events.map(([k]) => k).join(",")) throw new Error(`${path}: expected the event columns last`);
            w.write(withEventCells(line, events, path));
          } else {
            const row = JSON.parse(line) as Record<string, unknown>;
            if (row.frame !== frame) throw new Error(`${path}: expected the first row to be frame ${frame}`);
            for (const [k, v] of events) {
              if (!(k in row)) throw new Error(`${path}: no ${k} in the first row`);
              row[k] = v;
            }
            w.write(JSON.stringify(row) + "\n");
          }
        }
        copyRest(path, offset, w);
      }
      w.commit();
    } catch (err) {
      w.abort();
      throw err;
    }
  }
  let trackCount = 0;
  if (base.tracking) {
    const unit = resolveFrameOptions((base.options as { frame: FrameOptions }).frame).unit;
    trackCount = writeTrackTable(join(out, "tracks.csv"), csvLine(trackHeader(unit)), tracker?.trackCount ?? 0,
      (s, e) => trackRows(tracker!.trackSummary(s, e)).map((r) => csvLine(r)).join(""));
  }
  for (const folder of ["overlays", "spectra"]) {
    if (!outputs.includes(`${folder}/`)) continue;
    for (const s of shards) {
      const dir = join(s.folder, folder);
      if (!existsSync(dir)) continue;
      for (const f of readdirSync(dir).filter((n) => n.endsWith(".png")).sort()) {
        writeFileAtomic(join(out, folder, f), readFileSync(join(dir, f)));
      }
    }
  }
  const failed = shards.flatMap((s) => s.record.failures ?? []);
  const seconds = (performance.now() - started) / 1000;
  const agreed = Object.fromEntries(Object.entries(base).filter(([k]) => !PER_SHARD.includes(k)));
  const { tool, version, command, ...rest } = agreed;
  writeFileAtomic(join(out, "run.json"), JSON.stringify({
    tool, version, command, finished: new Date().toISOString(), ...rest, failures: failed,
    // Seconds of the shards summed (not wall time: shards may run at once), and of the merge.
    timings: {
      shardSeconds: shards.reduce((a, s) => a + ((s.record.timings as { seconds?: number } | undefined)?.seconds ?? 0), 0),
      mergeSeconds: seconds,
    },
    shards: shards.map((s) => ({
      folder: s.folder, index: s.record.shard.index, count: s.record.shard.count,
      start: s.record.shard.start, end: s.record.shard.end, finished: s.record.finished, timings: s.record.timings,
    })),
  }, null, 2) + "\n");
  return {
    frames: base.frames, shards: shards.map((s) => ({ folder: s.folder, start: s.record.shard.start, end: s.record.shard.end })),
    failed, tracks: trackCount, seconds,
  };
}
