// Shards of one movie run: N contiguous frame ranges, as equal as possible, analyzed by separate
// processes (e.g. the tasks of a Slurm array job) and merged exactly afterwards (see merge.ts).
// Shards are numbered from 0, like SLURM_ARRAY_TASK_ID of `--array=0-(N-1)`.
// Also the small binary record of one frame's label image and domain columns that a shard
// leaves at each end of its range, for tracking across the cut.
import type { TrackingInput } from "../sequence/job";

/** Frames [start, end) of a movie: `end` is exclusive. */
export interface FrameRange {
  start: number;
  end: number;
}

export interface ShardSpec {
  /** 0-based shard number, below `count`. */
  index: number;
  count: number;
}

/**
 * Frames of shard `index` of `count` over a movie of `frames` frames: contiguous, in order,
 * sizes differing by at most one (the first shards get the shorter ranges). Every frame is in
 * exactly one shard. More shards than frames is an error (a shard would have no frame).
 */
export function shardRange(index: number, count: number, frames: number): FrameRange {
  if (!Number.isInteger(count) || count < 1) throw new Error(`shard count: expected a whole number >= 1, got ${count}`);
  if (!Number.isInteger(index) || index < 0 || index >= count) {
    throw new Error(`shard ${index} of ${count}: expected a shard number from 0 to ${count - 1} (shards are numbered from 0)`);
  }
  if (!Number.isInteger(frames) || frames < 1) throw new Error(`shards: expected a movie of at least one frame, got ${frames}`);
  if (count > frames) {
    throw new Error(`${count} shards for ${frames} frames: at most one shard per frame (use --shard K/${frames} or fewer)`);
  }
  return { start: Math.floor((index * frames) / count), end: Math.floor(((index + 1) * frames) / count) };
}

/** Parses `K/N` (0-based K), e.g. `0/4` ... `3/4`. */
export function parseShard(text: string): ShardSpec {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  if (!m) throw new Error(`--shard: expected K/N (shard K of N, K from 0 to N-1) or slurm, got ${JSON.stringify(text)}`);
  const index = Number(m[1]), count = Number(m[2]);
  if (count < 1) throw new Error(`--shard ${text}: expected N >= 1 shards`);
  if (index >= count) {
    throw new Error(`--shard ${text}: K must be below N (shards are numbered from 0 to ${count - 1})`);
  }
  return { index, count };
}

/**
 * The shard of this task of a Slurm array job: K = (SLURM_ARRAY_TASK_ID - SLURM_ARRAY_TASK_MIN)
 * / SLURM_ARRAY_TASK_STEP, N = SLURM_ARRAY_TASK_COUNT (MIN defaults to 0, STEP to 1). The array
 * must be one contiguous range such as `--array=0-3` or `--array=1-4`.
 */
export function shardFromSlurm(env: Record<string, string | undefined>): ShardSpec {
  const read = (name: string, fallback?: number): number => {
    const text = env[name];
    if (text === undefined || text.trim() === "") {
      if (fallback !== undefined) return fallback;
      throw new Error(`--shard slurm: ${name} is not set; run inside a Slurm array job (sbatch --array=0-3 ...) or give --shard K/N`);
    }
    const v = Number(text);
    if (!Number.isInteger(v) || v < 0) throw new Error(`--shard slurm: ${name} is ${JSON.stringify(text)}, expected a whole number >= 0`);
    return v;
  };
  const id = read("SLURM_ARRAY_TASK_ID");
  const count = read("SLURM_ARRAY_TASK_COUNT");
  const min = read("SLURM_ARRAY_TASK_MIN", 0);
  const step = Math.max(1, read("SLURM_ARRAY_TASK_STEP", 1));
  const offset = id - min;
  const index = offset / step;
  if (count < 1 || offset < 0 || !Number.isInteger(index) || index >= count) {
    throw new Error(`--shard slurm: task ${id} is not shard 0..${count - 1} of an array from ${min} in steps of ${step}; ` +
      `use one contiguous array such as --array=0-${Math.max(0, count - 1)}`);
  }
  return { index, count };
}

/** Folder of a shard inside a run folder: `shard-K-of-N`. */
export function shardFolderName(s: ShardSpec): string {
  return `shard-${s.index}-of-${s.count}`;
}

/** One frame as the tracker saw it: label image and the domain columns it reads. */
export interface BoundaryFrame extends TrackingInput {
  frame: number;
  field?: number;
  width: number;
  height: number;
}

const MAGIC = "domtopo-boundary-frame";

/** Bytes of a boundary frame: a JSON head (its length first, u32 LE), then the columns, 8-byte aligned. */
export function encodeBoundaryFrame(b: BoundaryFrame): Uint8Array {
  const K = b.count;
  const columns: ArrayBufferView[] = [
    b.labels, b.phase.subarray(0, K), b.area.subarray(0, K), b.centroidX.subarray(0, K), b.centroidY.subarray(0, K),
  ];
  const head = new TextEncoder().encode(JSON.stringify({
    magic: MAGIC, frame: b.frame, field: b.field ?? null, width: b.width, height: b.height, count: K,
  }));
  let total = (4 + head.length + 7) & ~7;
  const offsets = columns.map((c) => { const o = total; total += (c.byteLength + 7) & ~7; return o; });
  const out = new Uint8Array(total);
  new DataView(out.buffer).setUint32(0, head.length, true);
  out.set(head, 4);
  columns.forEach((c, i) => out.set(new Uint8Array(c.buffer, c.byteOffset, c.byteLength), offsets[i]!));
  return out;
}

export function decodeBoundaryFrame(bytes: Uint8Array, where: string): BoundaryFrame {
  const fail = (why: string): never => { throw new Error(`${where}: not a boundary frame (${why})`); };
  if (bytes.length < 8) fail("too short");
  const n = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength).getUint32(0, true);
  let head: { magic: string; frame: number; field: number | null; width: number; height: number; count: number };
  try {
    head = JSON.parse(new TextDecoder().decode(bytes.subarray(4, 4 + n)));
  } catch {
    return fail("unreadable head");
  }
  if (head.magic !== MAGIC) fail("wrong head");
  const K = head.count, N = head.width * head.height;
  let off = (4 + n + 7) & ~7;
  const take = <T>(kind: new (b: ArrayBuffer) => T, length: number, size: number): T => {
    const len = length * size;
    if (off + len > bytes.length) fail("cut short");
    const copy = Uint8Array.prototype.slice.call(bytes, off, off + len) as Uint8Array;
    off += (len + 7) & ~7;
    return new kind(copy.buffer as ArrayBuffer);
  };
  const labels = take(Int32Array, N, 4);
  const phase = take(Uint8Array, K, 1);
  const area = take(Float64Array, K, 8);
  const centroidX = take(Float64Array, K, 8);
  const centroidY = take(Float64Array, K, 8);
  return {
    frame: head.frame, ...(head.field === null ? {} : { field: head.field }), width: head.width, height: head.height,
    labels, count: K, phase, area, centroidX, centroidY,
  };
}
