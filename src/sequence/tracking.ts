// Tracking domains between consecutive frames of a movie by overlap linking: a domain of frame t
// is linked to every domain of frame t-1 of the same phase that shares at least `minOverlap`
// pixels with it (same pixel index in both label images; on periodic frames those indices are
// already torus positions, so linking is periodic by construction). Domains left without any
// overlap may be linked by nearest-neighbour distance of their centroids (Crocker & Grier 1996,
// J. Colloid Interface Sci. 179:298) within `maxDisplacement`. From the links come the events of
// each frame (nucleation, annihilation, splitting, merging) and persistent track ids.
// Only the previous frame's labels are kept. Browser-safe: no node:* imports.
import type { Boundary } from "../topology/options";
import type { Cell } from "../topology/rows";
import { OverlapCounter } from "./tracking-overlap";
import { linkByDistance } from "./tracking-distance";

export interface TrackingOptions {
  /**
   * Sides of the frames, as analyzed. Overlap needs no boundary (pixel indices are torus
   * positions already); it sets minimum-image distances for `maxDisplacement`. @default 'open'
   */
  boundary?: Boundary;
  /**
   * Nearest-neighbour fallback for fast-moving small domains, in pixels: a domain with no
   * same-phase overlap in the previous frame is linked to the nearest same-phase previous domain
   * that has no overlap partner either, if their centroids are at most this far apart
   * (minimum-image distance on periodic axes). Pairs are taken nearest first, one link per
   * domain. 0 links by overlap only. @default 0
   */
  maxDisplacement?: number;
  /** Shared pixels needed for an overlap link. @default 1 */
  minOverlap?: number;
  /**
   * Length of one pixel in the unit of the domains' centroids (the `pixelSize` the frames were
   * analyzed with); centroids are divided by it to compare with `maxDisplacement`. @default 1
   */
  pixelSize?: number;
}

export interface ResolvedTrackingOptions {
  boundary: Boundary;
  maxDisplacement: number;
  minOverlap: number;
  pixelSize: number;
}

/** The per-domain columns the tracker reads; row i is label id i + 1 (a DomainTable fits). */
export interface TrackedDomains {
  count: number;
  /** 1 up, 0 down. */
  phase: ArrayLike<number>;
  /** Area in the table's unit^2 (only the largest area of each track is reported). */
  area: ArrayLike<number>;
  /** Centroid in the table's unit (only read when `maxDisplacement` > 0). */
  centroidX: ArrayLike<number>;
  centroidY: ArrayLike<number>;
}

export interface FrameInfo {
  /** Frame number (strictly increasing along the movie). */
  frame: number;
  /** Applied field of the frame, if known. */
  field?: number;
}

/** Events of one phase between the previous frame and this one. */
export interface PhaseEvents {
  /** Domains of the phase in this frame and in the previous one. */
  domains: number;
  previousDomains: number;
  /** Current domains without a predecessor. */
  nucleated: number;
  /** Previous domains without a successor. */
  annihilated: number;
  /** Previous domains with >= 2 successors, and the number of those successors (pieces). */
  split: number;
  splitPieces: number;
  /** Current domains with >= 2 predecessors, and the number of those predecessors. */
  merged: number;
  mergedPredecessors: number;
  /** Current domains with exactly one predecessor that has exactly one successor. */
  continued: number;
  /** Links made by the `maxDisplacement` fallback (counted among the links above). */
  linkedByDistance: number;
}

export interface SplitEvent {
  phase: "up" | "down";
  /** Track of the splitting domain (it continues on its largest-overlap piece, if any). */
  trackId: number;
  /** Tracks of the pieces in this frame. */
  pieces: number[];
}

export interface MergeEvent {
  phase: "up" | "down";
  /** Track of the merged domain (that of its largest predecessor, if that passed its id on). */
  trackId: number;
  /** Tracks of the predecessors. */
  from: number[];
}

export interface FrameEvents {
  frame: number;
  field: number;
  /** False for the first frame of a movie: there is no previous frame and every count is 0. */
  linked: boolean;
  up: PhaseEvents;
  down: PhaseEvents;
  /** Track id of each domain of this frame (entry i for label id i + 1). */
  trackIds: Int32Array;
  splits: SplitEvent[];
  merges: MergeEvent[];
}

export type TrackEnd = "annihilated" | "merged" | "still-present";
export type TrackStart = "first-frame" | "nucleated" | "split";

/** One row per track. */
export interface TrackRow {
  trackId: number;
  phase: "up" | "down";
  /** How the track began: in the first frame, by nucleation, or as a new piece of a split. */
  bornBy: TrackStart;
  birthFrame: number;
  birthField: number;
  /** Last frame the track existed in, and its field (a bubble's collapse field). */
  endFrame: number;
  endField: number;
  /** First frame the track was gone in, and its field; NaN while still present. */
  goneFrame: number;
  goneField: number;
  /** Frames the track existed in. */
  lifetime: number;
  /** Largest area in the domains' unit^2. */
  maxArea: number;
  endedBy: TrackEnd;
}

const END_CODES: TrackEnd[] = ["still-present", "annihilated", "merged"];
const START_CODES: TrackStart[] = ["first-frame", "nucleated", "split"];

function checkNonNegative(what: string, value: unknown, integer: boolean): number {
  if (typeof value !== "number" || !Number.isFinite(value) || value < 0 || (integer && !Number.isInteger(value))) {
    throw new Error(`${what}: expected ${integer ? "a whole number" : "a finite number"} >= 0, got ${String(value)}`);
  }
  return value;
}

export function resolveTrackingOptions(options: TrackingOptions = {}): ResolvedTrackingOptions {
  if (options === null || typeof options !== "object") {
    throw new Error(`tracking options: expected an object, got ${String(options)}`);
  }
  const known = ["boundary", "maxDisplacement", "minOverlap", "pixelSize"];
  for (const key of Object.keys(options)) {
    if (!known.includes(key)) {
      throw new Error(`tracking options.${key}: unknown option (known: ${known.join(", ")})`);
    }
  }
  const boundary = options.boundary ?? "open";
  if (!["open", "periodic", "periodic-x", "periodic-y"].includes(boundary)) {
    throw new Error(`tracking options.boundary: expected one of "open", "periodic", "periodic-x", "periodic-y", got ${String(boundary)}`);
  }
  const maxDisplacement = checkNonNegative("tracking options.maxDisplacement", options.maxDisplacement ?? 0, false);
  const minOverlap = checkNonNegative("tracking options.minOverlap", options.minOverlap ?? 1, true);
  if (minOverlap < 1) throw new Error(`tracking options.minOverlap: expected a whole number >= 1, got ${minOverlap}`);
  const pixelSize = options.pixelSize ?? 1;
  if (typeof pixelSize !== "number" || !Number.isFinite(pixelSize) || pixelSize <= 0) {
    throw new Error(`tracking options.pixelSize: expected a finite number > 0, got ${String(pixelSize)}`);
  }
  return { boundary, maxDisplacement, minOverlap, pixelSize };
}

/** Growable per-track columns (struct of arrays). */
const TRACK_KEYS = ["phase", "bornBy", "endedBy", "lifetime", "birthFrame", "birthField", "endFrame",
  "endField", "goneFrame", "goneField", "maxArea"] as const;

class TrackColumns {
  count = 0;
  phase = new Uint8Array(256);
  bornBy = new Uint8Array(256);
  endedBy = new Uint8Array(256);
  lifetime = new Int32Array(256);
  birthFrame = new Float64Array(256);
  birthField = new Float64Array(256);
  endFrame = new Float64Array(256);
  endField = new Float64Array(256);
  goneFrame = new Float64Array(256);
  goneField = new Float64Array(256);
  maxArea = new Float64Array(256);

  /** Opens a track; returns its id (1-based). */
  open(phase: number, bornBy: number, frame: number, field: number): number {
    if (this.count === this.phase.length) this.grow();
    const t = this.count++;
    this.phase[t] = phase;
    this.bornBy[t] = bornBy;
    this.endedBy[t] = 0;
    this.lifetime[t] = 0;
    this.birthFrame[t] = frame;
    this.birthField[t] = field;
    this.goneFrame[t] = NaN;
    this.goneField[t] = NaN;
    this.maxArea[t] = 0;
    return t + 1;
  }

  private grow(): void {
    const n = Math.max(64, this.phase.length * 2);
    for (const key of ["phase", "bornBy", "endedBy", "lifetime", "birthFrame", "birthField", "endFrame",
      "endField", "goneFrame", "goneField", "maxArea"] as const) {
      const old = this[key];
      const next = new (old.constructor as new (n: number) => typeof old)(n);
      next.set(old as never);
      (this as Record<typeof key, typeof old>)[key] = next;
    }
  }
}

function emptyEvents(): PhaseEvents {
  return {
    domains: 0, previousDomains: 0, nucleated: 0, annihilated: 0, split: 0, splitPieces: 0,
    merged: 0, mergedPredecessors: 0, continued: 0, linkedByDistance: 0,
  };
}

function grownInt32(a: Int32Array<ArrayBuffer>, n: number): Int32Array<ArrayBuffer> {
  return a.length >= n ? a : new Int32Array(Math.max(n, 2 * a.length));
}
function grownUint8(a: Uint8Array<ArrayBuffer>, n: number): Uint8Array<ArrayBuffer> {
  return a.length >= n ? a : new Uint8Array(Math.max(n, 2 * a.length));
}
function grownFloat64(a: Float64Array<ArrayBuffer>, n: number): Float64Array<ArrayBuffer> {
  return a.length >= n ? a : new Float64Array(Math.max(n, 2 * a.length));
}

/**
 * Follows the domains of one movie frame by frame. Push each frame's label image and domains
 * table in order; the tracker keeps a copy of the last label image only (one Int32Array of
 * width x height, reused), plus per-track rows.
 *
 * Track ids: every domain of the first frame, every nucleated domain and every extra piece of a
 * split opens a new track. Otherwise ids pass along links greedily, larger predecessors first
 * (by area in the previous frame): each previous domain hands its id to the successor it shares
 * most pixels with among those still without an id. So a merge keeps the id of its largest
 * predecessor, and a split keeps the id on its largest-overlap piece (unless that piece already
 * took the id of a larger predecessor, when the next piece gets it). A previous domain whose id
 * is not handed on ends its track: `annihilated` with no successor, `merged` otherwise.
 */
export class DomainTracker {
  readonly width: number;
  readonly height: number;
  readonly options: ResolvedTrackingOptions;
  private readonly periodicX: boolean;
  private readonly periodicY: boolean;
  private readonly overlap = new OverlapCounter();
  private tracks = new TrackColumns();
  private frames = 0;
  private lastFrame = NaN;
  // The previous frame, indexed by label id (entry 0 unused). Its label image is held by the
  // overlap counter (in Wasm memory) where `prevHeld`; prevLabels is then a copy made when
  // asked for (`previousLabels`), stale while `prevStale`.
  private prevLabels: Int32Array;
  private prevHeld = false;
  private prevStale = false;
  private prevCount = 0;
  private prevPhase = new Uint8Array(1);
  private prevTrack = new Int32Array(1);
  private prevArea = new Float64Array(1);
  private prevX = new Float64Array(1);
  private prevY = new Float64Array(1);
  // The current frame's columns, swapped with the previous ones after each push.
  private curPhase = new Uint8Array(1);
  private curTrack = new Int32Array(1);
  private curArea = new Float64Array(1);
  private curX = new Float64Array(1);
  private curY = new Float64Array(1);
  // Link scratch (reused).
  private outDegree = new Int32Array(1);
  private inDegree = new Int32Array(1);

  constructor(width: number, height: number, options: TrackingOptions = {}) {
    for (const [what, v] of [["tracker width", width], ["tracker height", height]] as const) {
      if (typeof v !== "number" || !Number.isInteger(v) || v <= 0) {
        throw new Error(`${what}: expected a positive integer, got ${String(v)}`);
      }
    }
    if (width * height > 1 << 28) {
      throw new Error(`tracker: expected at most 2^28 pixels, got ${width} x ${height}`);
    }
    this.width = width;
    this.height = height;
    this.options = resolveTrackingOptions(options);
    const b = this.options.boundary;
    this.periodicX = b === "periodic" || b === "periodic-x";
    this.periodicY = b === "periodic" || b === "periodic-y";
    this.prevLabels = new Int32Array(width * height);
  }

  /** Frames pushed so far. */
  get frameCount(): number {
    return this.frames;
  }

  /** Tracks opened so far. */
  get trackCount(): number {
    return this.tracks.count;
  }

  /**
   * The tracker's state as bytes (previous frame and every track), for checkpoints of long runs;
   * `restore` on a tracker of the same shape and options continues exactly where this one was.
   */
  snapshot(): Uint8Array {
    const arrays: Array<[string, ArrayBufferView]> = [
      ["prevLabels", this.previousLabels()], ["prevPhase", this.prevPhase], ["prevTrack", this.prevTrack],
      ["prevArea", this.prevArea], ["prevX", this.prevX], ["prevY", this.prevY],
    ];
    const t = this.tracks;
    // The tracks' columns up to the last track (not the room grown for more).
    for (const key of TRACK_KEYS) arrays.push([`tracks.${key}`, t[key].subarray(0, t.count)]);
    const head = {
      width: this.width, height: this.height, options: this.options, frames: this.frames,
      lastFrame: Number.isNaN(this.lastFrame) ? null : this.lastFrame, prevCount: this.prevCount, trackCount: t.count,
      arrays: arrays.map(([name, a]) => [name, a.constructor.name, a.byteLength]),
    };
    const headBytes = new TextEncoder().encode(JSON.stringify(head));
    let total = 4 + headBytes.length;
    total = (total + 7) & ~7;
    const offsets: number[] = [];
    for (const [, a] of arrays) { offsets.push(total); total += (a.byteLength + 7) & ~7; }
    const out = new Uint8Array(total);
    new DataView(out.buffer).setUint32(0, headBytes.length, true);
    out.set(headBytes, 4);
    arrays.forEach(([, a], i) => out.set(new Uint8Array(a.buffer, a.byteOffset, a.byteLength), offsets[i]!));
    return out;
  }

  /** A tracker made from a `snapshot` alone (its shape and options are in it). */
  static fromSnapshot(bytes: Uint8Array): DomainTracker {
    const n = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength).getUint32(0, true);
    const head = JSON.parse(new TextDecoder().decode(bytes.subarray(4, 4 + n))) as {
      width: number; height: number; options: ResolvedTrackingOptions;
    };
    const t = new DomainTracker(head.width, head.height, head.options);
    t.restore(bytes);
    return t;
  }

  /** Restores a `snapshot` of a tracker of the same shape and options. */
  restore(bytes: Uint8Array): void {
    const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    const n = view.getUint32(0, true);
    const head = JSON.parse(new TextDecoder().decode(bytes.subarray(4, 4 + n))) as {
      width: number; height: number; options: ResolvedTrackingOptions; frames: number; lastFrame: number | null;
      prevCount: number; trackCount: number; arrays: Array<[string, string, number]>;
    };
    if (head.width !== this.width || head.height !== this.height || JSON.stringify(head.options) !== JSON.stringify(this.options)) {
      throw new Error(`tracker snapshot: made for ${head.width} x ${head.height} with other options; cannot restore`);
    }
    const kinds: Record<string, new (b: ArrayBuffer) => ArrayBufferView> = {
      Int32Array, Uint8Array, Float64Array,
    } as never;
    let off = (4 + n + 7) & ~7;
    const take = (kind: string, len: number) => {
      // A real copy (Node Buffers' slice shares memory), aligned for the typed array.
      const copy = Uint8Array.prototype.slice.call(bytes, off, off + len);
      off += (len + 7) & ~7;
      return new kinds[kind]!(copy.buffer);
    };
    const t = this.tracks;
    for (const [name, kind, len] of head.arrays) {
      const a = take(kind, len);
      if (name.startsWith("tracks.")) (t as unknown as Record<string, ArrayBufferView>)[name.slice(7)] = a;
      else (this as unknown as Record<string, ArrayBufferView>)[name] = a;
    }
    t.count = head.trackCount;
    this.prevHeld = false;
    this.prevStale = false;
    this.frames = head.frames;
    this.lastFrame = head.lastFrame ?? NaN;
    this.prevCount = head.prevCount;
  }

  /** Forgets every frame and track (to start another movie of the same shape). */
  reset(): void {
    this.tracks = new TrackColumns();
    this.frames = 0;
    this.lastFrame = NaN;
    this.prevCount = 0;
    this.prevHeld = false;
    this.prevStale = false;
  }

  /** The previous frame's label image (copied out of the overlap counter when it holds it). */
  private previousLabels(): Int32Array {
    if (this.prevStale) {
      this.overlap.copyHeld(this.prevLabels);
      this.prevStale = false;
    }
    return this.prevLabels;
  }

  /**
   * Links one frame to the previous one. `labels` is the frame's label image (ids 1..count, row
   * major, width x height; a view is fine: it is copied), `domains` its domains table.
   */
  push(labels: Int32Array, domains: TrackedDomains, info: FrameInfo): FrameEvents {
    const where = `tracker frame ${info && typeof info === "object" ? String(info.frame) : "?"}`;
    this.check(labels, domains, info, where);
    const K = domains.count;
    const frame = info.frame;
    const field = info.field ?? NaN;
    const ps = this.options.pixelSize;

    // Current columns, indexed by label id.
    this.curPhase = grownUint8(this.curPhase, K + 1);
    this.curTrack = grownInt32(this.curTrack, K + 1);
    this.curArea = grownFloat64(this.curArea, K + 1);
    this.curX = grownFloat64(this.curX, K + 1);
    this.curY = grownFloat64(this.curY, K + 1);
    const curPhase = this.curPhase, curTrack = this.curTrack, curArea = this.curArea;
    curPhase[0] = 255;
    for (let d = 1; d <= K; d++) {
      curPhase[d] = domains.phase[d - 1]! === 1 ? 1 : 0;
      curTrack[d] = 0;
      curArea[d] = domains.area[d - 1]!;
      this.curX[d] = domains.centroidX[d - 1]! / ps;
      this.curY[d] = domains.centroidY[d - 1]! / ps;
    }

    const events: FrameEvents = {
      frame, field, linked: this.frames > 0, up: emptyEvents(), down: emptyEvents(),
      trackIds: new Int32Array(K), splits: [], merges: [],
    };
    for (let d = 1; d <= K; d++) (curPhase[d] === 1 ? events.up : events.down).domains++;

    if (this.frames === 0) {
      let bad = -1;
      for (let i = 0; i < labels.length; i++) {
        const v = labels[i]!;
        if (v < 0 || v > K) { bad = i; break; }
      }
      if (bad >= 0) {
        throw new Error(`${where}: expected labels in 0..${K} (the domains' count), got ${labels[bad]} at pixel ${bad}`);
      }
      for (let d = 1; d <= K; d++) curTrack[d] = this.tracks.open(curPhase[d]!, 0, frame, field);
    } else {
      this.link(labels, K, frame, field, events, where);
    }

    // Tracks present in this frame.
    const tr = this.tracks;
    for (let d = 1; d <= K; d++) {
      const t = curTrack[d]! - 1;
      tr.lifetime[t]!++;
      tr.endFrame[t] = frame;
      tr.endField[t] = field;
      if (curArea[d]! > tr.maxArea[t]!) tr.maxArea[t] = curArea[d]!;
      events.trackIds[d - 1] = t + 1;
    }

    // This frame becomes the previous one: its labels stay in the overlap counter (the link
    // left them there; the first frame is handed to it), else they are copied.
    const held = this.frames === 0 ? this.overlap.hold(labels) : this.overlap.holds;
    if (held) {
      this.prevHeld = true;
      this.prevStale = true;
    } else {
      this.prevLabels.set(labels);
      this.prevHeld = false;
      this.prevStale = false;
    }
    this.prevCount = K;
    [this.prevPhase, this.curPhase] = [this.curPhase, this.prevPhase];
    [this.prevTrack, this.curTrack] = [this.curTrack, this.prevTrack];
    [this.prevArea, this.curArea] = [this.curArea, this.prevArea];
    [this.prevX, this.curX] = [this.curX, this.prevX];
    [this.prevY, this.curY] = [this.curY, this.prevY];
    this.frames++;
    this.lastFrame = frame;
    return events;
  }

  private check(labels: Int32Array, domains: TrackedDomains, info: FrameInfo, where: string): void {
    if (!(labels instanceof Int32Array)) {
      throw new Error(`${where}: expected labels as an Int32Array, got ${labels === null ? "null" : typeof labels === "object" ? (labels as object).constructor.name : typeof labels}`);
    }
    const n = this.width * this.height;
    if (labels.length !== n) {
      throw new Error(`${where}: expected ${this.width} x ${this.height} = ${n} labels, got ${labels.length}`);
    }
    if (domains === null || typeof domains !== "object") {
      throw new Error(`${where}: expected a domains table {count, phase, area, centroidX, centroidY}, got ${String(domains)}`);
    }
    const K = domains.count;
    if (typeof K !== "number" || !Number.isInteger(K) || K < 0) {
      throw new Error(`${where}: expected domains.count to be a whole number >= 0, got ${String(K)}`);
    }
    for (const col of ["phase", "area", "centroidX", "centroidY"] as const) {
      const c = domains[col];
      if (c === null || c === undefined || typeof c.length !== "number" || c.length < K) {
        throw new Error(`${where}: expected domains.${col} with ${K} entries, got ${c === undefined || c === null ? String(c) : c.length}`);
      }
    }
    if (info === null || typeof info !== "object" || typeof info.frame !== "number" || !Number.isFinite(info.frame)) {
      throw new Error(`${where}: expected info {frame: number, field?: number}, got ${info === null || typeof info !== "object" ? String(info) : `frame ${String(info.frame)}`}`);
    }
    if (info.field !== undefined && (typeof info.field !== "number" || Number.isNaN(info.field))) {
      throw new Error(`${where}: expected info.field to be a number, got ${String(info.field)}`);
    }
    if (this.frames > 0 && !(info.frame > this.lastFrame)) {
      throw new Error(`${where}: expected frames in increasing order, got frame ${info.frame} after frame ${this.lastFrame}`);
    }
  }

  private link(labels: Int32Array, K: number, frame: number, field: number, events: FrameEvents, where: string): void {
    const Kp = this.prevCount;
    const prevPhase = this.prevPhase, curPhase = this.curPhase;
    const prevTrack = this.prevTrack, curTrack = this.curTrack;
    const ov = this.overlap;
    if (this.prevHeld && ov.holds) ov.countNext(labels, prevPhase, curPhase, Kp, K, where);
    else ov.count(this.previousLabels(), labels, prevPhase, curPhase, Kp, K, where);

    // Links: overlap pairs with at least minOverlap pixels.
    const linkPrev: number[] = [], linkCur: number[] = [], linkPixels: number[] = [];
    const minOverlap = this.options.minOverlap;
    for (let e = 0; e < ov.pairs; e++) {
      if (ov.pairPixels[e]! < minOverlap) continue;
      linkPrev.push(ov.pairPrev[e]!);
      linkCur.push(ov.pairCur[e]!);
      linkPixels.push(ov.pairPixels[e]!);
    }
    this.outDegree = grownInt32(this.outDegree, Kp + 1);
    this.inDegree = grownInt32(this.inDegree, K + 1);
    const outDeg = this.outDegree, inDeg = this.inDegree;
    outDeg.fill(0, 0, Kp + 1);
    inDeg.fill(0, 0, K + 1);
    for (let e = 0; e < linkPrev.length; e++) {
      outDeg[linkPrev[e]!]!++;
      inDeg[linkCur[e]!]!++;
    }

    // Nearest-neighbour fallback between domains left without any overlap link.
    if (this.options.maxDisplacement > 0) {
      const pIds: number[] = [], pX: number[] = [], pY: number[] = [], pPh: number[] = [];
      const cIds: number[] = [], cX: number[] = [], cY: number[] = [], cPh: number[] = [];
      for (let a = 1; a <= Kp; a++) {
        if (outDeg[a] !== 0) continue;
        pIds.push(a); pX.push(this.prevX[a]!); pY.push(this.prevY[a]!); pPh.push(prevPhase[a]!);
      }
      for (let b = 1; b <= K; b++) {
        if (inDeg[b] !== 0) continue;
        cIds.push(b); cX.push(this.curX[b]!); cY.push(this.curY[b]!); cPh.push(curPhase[b]!);
      }
      const links = linkByDistance({
        width: this.width, height: this.height, periodicX: this.periodicX, periodicY: this.periodicY,
        maxDisplacement: this.options.maxDisplacement,
        prevIds: pIds, prevX: pX, prevY: pY, prevPhase: pPh,
        curIds: cIds, curX: cX, curY: cY, curPhase: cPh,
      });
      for (const [a, b] of links) {
        linkPrev.push(a);
        linkCur.push(b);
        linkPixels.push(0);
        outDeg[a]!++;
        inDeg[b]!++;
        (curPhase[b] === 1 ? events.up : events.down).linkedByDistance++;
      }
    }

    // Hand ids on: previous domains by decreasing area (then id), each to its unassigned
    // successor of largest overlap (then smaller id).
    const prevArea = this.prevArea;
    const order = Array.from(linkPrev.keys()).sort((p, q) => {
      const a = linkPrev[p]!, b = linkPrev[q]!;
      return prevArea[b]! - prevArea[a]! || a - b || linkPixels[q]! - linkPixels[p]! || linkCur[p]! - linkCur[q]!;
    });
    const tr = this.tracks;
    const passed = new Uint8Array(Kp + 1);
    for (const e of order) {
      const a = linkPrev[e]!, b = linkCur[e]!;
      if (passed[a] || curTrack[b] !== 0) continue;
      curTrack[b] = prevTrack[a]!;
      passed[a] = 1;
    }
    for (let b = 1; b <= K; b++) {
      if (curTrack[b] === 0) curTrack[b] = tr.open(curPhase[b]!, inDeg[b] === 0 ? 1 : 2, frame, field);
    }
    for (let a = 1; a <= Kp; a++) {
      const ev = prevPhase[a] === 1 ? events.up : events.down;
      ev.previousDomains++;
      if (outDeg[a] === 0) ev.annihilated++;
      else if (outDeg[a]! >= 2) { ev.split++; ev.splitPieces += outDeg[a]!; }
      if (!passed[a]) {
        const t = prevTrack[a]! - 1;
        tr.endedBy[t] = outDeg[a] === 0 ? 1 : 2;
        tr.goneFrame[t] = frame;
        tr.goneField[t] = field;
      }
    }
    for (let b = 1; b <= K; b++) {
      const ev = curPhase[b] === 1 ? events.up : events.down;
      if (inDeg[b] === 0) ev.nucleated++;
      else if (inDeg[b]! >= 2) { ev.merged++; ev.mergedPredecessors += inDeg[b]!; }
    }
    for (let e = 0; e < linkPrev.length; e++) {
      const a = linkPrev[e]!, b = linkCur[e]!;
      if (outDeg[a] === 1 && inDeg[b] === 1) (curPhase[b] === 1 ? events.up : events.down).continued++;
    }

    // Split and merge records, with track ids (links grouped by previous / current domain).
    const byPrev = new Map<number, number[]>(), byCur = new Map<number, number[]>();
    for (let e = 0; e < linkPrev.length; e++) {
      const a = linkPrev[e]!, b = linkCur[e]!;
      if (outDeg[a]! >= 2) (byPrev.get(a) ?? byPrev.set(a, []).get(a)!).push(curTrack[b]!);
      if (inDeg[b]! >= 2) (byCur.get(b) ?? byCur.set(b, []).get(b)!).push(prevTrack[a]!);
    }
    for (const [a, pieces] of [...byPrev].sort((p, q) => p[0] - q[0])) {
      events.splits.push({ phase: prevPhase[a] === 1 ? "up" : "down", trackId: prevTrack[a]!, pieces: pieces.sort((p, q) => p - q) });
    }
    for (const [b, from] of [...byCur].sort((p, q) => p[0] - q[0])) {
      events.merges.push({ phase: curPhase[b] === 1 ? "up" : "down", trackId: curTrack[b]!, from: from.sort((p, q) => p - q) });
    }
  }

  /**
   * Continues this tracker with `later`, a tracker of the same shape and options that began
   * fresh on `first` (the frame after this tracker's last one) and went on from there, as the
   * shards of one movie do. Returns the events of `first` as one unbroken tracker would have
   * given them, and leaves this tracker exactly as if it had pushed every frame `later` did.
   *
   * Why this is exact: which previous domain hands its id to which current one depends only on
   * the two frames (areas, overlaps, distances), never on the id values, and new tracks open in
   * label order within a frame. So `later`'s tracks 1..K (K = domains of `first`) are the
   * domains of `first` in label order and take the ids this tracker gives them when it pushes
   * `first`; its tracks past K are born after `first` and take the next free ids in the same
   * order. A continued track adds `later`'s lifetime less the frame counted twice (`first`),
   * keeps the larger area and takes its end from `later`.
   */
  append(later: DomainTracker, first: { labels: Int32Array; domains: TrackedDomains; info: FrameInfo }): FrameEvents {
    if (later.width !== this.width || later.height !== this.height || JSON.stringify(later.options) !== JSON.stringify(this.options)) {
      throw new Error(`tracker append: expected a tracker of ${this.width} x ${this.height} with the same options, got ${later.width} x ${later.height}${JSON.stringify(later.options) !== JSON.stringify(this.options) ? " with other options" : ""}`);
    }
    const K = first.domains.count;
    const lt = later.tracks;
    if (later.frames === 0) throw new Error("tracker append: the later tracker has seen no frame");
    const firstFrame = first.info.frame;
    for (let i = 0; i < K; i++) {
      if (i >= lt.count || lt.bornBy[i] !== 0 || lt.birthFrame[i] !== firstFrame) {
        throw new Error(`tracker append: the later tracker did not begin on frame ${firstFrame} with ${K} domains`);
      }
    }
    if (K < lt.count && lt.bornBy[K] === 0 && lt.birthFrame[K] === firstFrame) {
      throw new Error(`tracker append: the later tracker began on frame ${firstFrame} with more than ${K} domains`);
    }
    const framesBefore = this.frames;
    const events = this.push(first.labels, first.domains, first.info);
    const tr = this.tracks;
    const opened = tr.count;
    // Global id of each of later's tracks (entry i for its track i + 1).
    const ids = new Int32Array(lt.count);
    for (let i = 0; i < K; i++) ids[i] = events.trackIds[i]!;
    for (let i = K; i < lt.count; i++) ids[i] = opened + (i - K) + 1;
    for (let i = 0; i < K; i++) {
      const g = ids[i]! - 1;
      tr.lifetime[g] = tr.lifetime[g]! + lt.lifetime[i]! - 1;
      tr.endFrame[g] = lt.endFrame[i]!;
      tr.endField[g] = lt.endField[i]!;
      tr.goneFrame[g] = lt.goneFrame[i]!;
      tr.goneField[g] = lt.goneField[i]!;
      tr.endedBy[g] = lt.endedBy[i]!;
      if (lt.maxArea[i]! > tr.maxArea[g]!) tr.maxArea[g] = lt.maxArea[i]!;
    }
    for (let i = K; i < lt.count; i++) {
      const g = tr.open(lt.phase[i]!, lt.bornBy[i]!, lt.birthFrame[i]!, lt.birthField[i]!) - 1;
      tr.endedBy[g] = lt.endedBy[i]!;
      tr.lifetime[g] = lt.lifetime[i]!;
      tr.endFrame[g] = lt.endFrame[i]!;
      tr.endField[g] = lt.endField[i]!;
      tr.goneFrame[g] = lt.goneFrame[i]!;
      tr.goneField[g] = lt.goneField[i]!;
      tr.maxArea[g] = lt.maxArea[i]!;
    }
    // The previous frame is now later's last one, with global ids.
    const Kp = later.prevCount;
    this.prevLabels.set(later.previousLabels());
    this.prevHeld = false;
    this.prevStale = false;
    this.prevCount = Kp;
    this.prevPhase = later.prevPhase.slice(0, Kp + 1);
    this.prevArea = later.prevArea.slice(0, Kp + 1);
    this.prevX = later.prevX.slice(0, Kp + 1);
    this.prevY = later.prevY.slice(0, Kp + 1);
    this.prevTrack = new Int32Array(Kp + 1);
    for (let d = 1; d <= Kp; d++) this.prevTrack[d] = ids[later.prevTrack[d]! - 1]!;
    this.frames = framesBefore + later.frames;
    this.lastFrame = later.lastFrame;
    return events;
  }

  /** One row per track opened so far, in track-id order (the tracks start..end - 1 by index when given). */
  trackSummary(start = 0, end = this.tracks.count): TrackRow[] {
    const tr = this.tracks;
    const rows: TrackRow[] = [];
    for (let t = Math.max(0, start); t < Math.min(end, tr.count); t++) {
      rows.push({
        trackId: t + 1,
        phase: tr.phase[t] === 1 ? "up" : "down",
        bornBy: START_CODES[tr.bornBy[t]!]!,
        birthFrame: tr.birthFrame[t]!,
        birthField: tr.birthField[t]!,
        endFrame: tr.endFrame[t]!,
        endField: tr.endField[t]!,
        goneFrame: tr.goneFrame[t]!,
        goneField: tr.goneField[t]!,
        lifetime: tr.lifetime[t]!,
        maxArea: tr.maxArea[t]!,
        endedBy: END_CODES[tr.endedBy[t]!]!,
      });
    }
    return rows;
  }
}

/** A tracker for one movie of frames of this shape (see DomainTracker). */
export function createTracker(width: number, height: number, options: TrackingOptions = {}): DomainTracker {
  return new DomainTracker(width, height, options);
}

/**
 * The per-frame event columns, in table order (after the frame's own columns). The first frame
 * of a movie has no previous frame: its cells are empty.
 */
export function eventRow(events: FrameEvents): Array<[string, Cell]> {
  const row: Array<[string, Cell]> = [];
  for (const [name, p] of [["up", events.up], ["down", events.down]] as const) {
    const v = (n: number): Cell => (events.linked ? n : "");
    row.push(
      [`${name}_nucleated`, v(p.nucleated)],
      [`${name}_annihilated`, v(p.annihilated)],
      [`${name}_split`, v(p.split)],
      [`${name}_split_pieces`, v(p.splitPieces)],
      [`${name}_merged`, v(p.merged)],
      [`${name}_merged_predecessors`, v(p.mergedPredecessors)],
      [`${name}_continued`, v(p.continued)],
    );
  }
  return row;
}

/** Header of the per-track table (areas in `unit`^2). */
export function trackHeader(unit = "px"): string[] {
  const u = unit.replace(/[^A-Za-z0-9µ]+/g, "");
  return [
    "track", "phase", "born_by", "birth_frame", "birth_field", "end_frame", "end_field",
    "gone_frame", "gone_field", "lifetime_frames", `max_area_${u}2`, "ended_by",
  ];
}

/** The per-track rows (same order as `trackHeader`); NaN fields become empty cells. */
export function trackRows(rows: TrackRow[]): Cell[][] {
  const num = (v: number): Cell => (Number.isNaN(v) ? "" : v);
  return rows.map((r) => [
    r.trackId, r.phase, r.bornBy, r.birthFrame, num(r.birthField), r.endFrame, num(r.endField),
    num(r.goneFrame), num(r.goneField), r.lifetime, r.maxArea, r.endedBy,
  ]);
}
