// Frame sources: one numbering of frames over many inputs (PNG stills, APNG movies, TIFF stacks,
// .npy arrays), each decoded only when its frame is asked for. Browser-safe: inputs are bytes in
// memory; the Node file-system source lives in node-source.ts.

import type { Frame } from "../types";
import { isNpy, parseNpyHeader, readNpyFrame } from "./npy";
import { decodeApng, decodePng, inspectPng, isPng } from "./png";
import { isTiff, openTiff } from "./tiff";

/** A numbered sequence of frames (0-based), read one at a time. */
export interface FrameSource {
  /** Number of frames. */
  readonly count: number;
  /** Where frame `index` comes from, e.g. "stack.tif page 12" or "scan_007.png". */
  describe(index: number): string;
  /** Decodes frame `index`; rejects with an error naming the file and frame on bad input. */
  read(index: number): Promise<Frame>;
}

/** Input formats recognised by their first bytes. */
export type FrameFormat = "png" | "tiff" | "npy";

/** The format of an input from its magic bytes (not its name), or null when unknown. */
export function detectFormat(bytes: Uint8Array): FrameFormat | null {
  if (isPng(bytes)) return "png";
  if (isTiff(bytes)) return "tiff";
  if (isNpy(bytes)) return "npy";
  return null;
}

/** One input holding one or more frames (the building block of sources). */
export interface FrameContainer {
  /** Name used in descriptions and errors (file name or path). */
  readonly name: string;
  readonly count: number;
  /** How one of its frames is called: "page" for TIFF, "frame" otherwise. */
  readonly unit: "page" | "frame";
  /** Decodes frame `index` of this container (0-based). */
  read(index: number): Frame;
  /** Drops any cached decoded data. */
  release?(): void;
}

/** A source over containers in order; frame numbers run through them one after another. */
export function sourceFromContainers(containers: readonly FrameContainer[]): FrameSource {
  const starts: number[] = [];
  let total = 0;
  for (const c of containers) {
    starts.push(total);
    total += c.count;
  }
  let last: FrameContainer | null = null;
  const locate = (index: number): [FrameContainer, number] => {
    if (!Number.isInteger(index) || index < 0 || index >= total) {
      throw new RangeError(`frame ${index} is out of range (the source has ${total} frames)`);
    }
    // Binary search for the last container starting at or before index.
    let lo = 0;
    let hi = containers.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (starts[mid] <= index) lo = mid;
      else hi = mid - 1;
    }
    return [containers[lo], index - starts[lo]];
  };
  return {
    count: total,
    describe(index) {
      const [c, k] = locate(index);
      return c.count === 1 ? c.name : `${c.name} ${c.unit} ${k}`;
    },
    async read(index) {
      const [c, k] = locate(index);
      if (last !== null && last !== c) last.release?.();
      last = c;
      return c.read(k);
    },
  };
}

/** A named input held in memory. */
export interface NamedBytes {
  name: string;
  bytes: Uint8Array;
}

/** A container over one input in memory, its format found from its magic bytes. */
export function containerFromBytes(entry: NamedBytes): FrameContainer {
  const { name, bytes } = entry;
  const format = detectFormat(bytes);
  if (format === null) throw new Error(`${name}: not a PNG, TIFF or .npy file by its first bytes`);
  if (format === "png") {
    const info = inspectPng(bytes, name);
    if (!info.animated) return { name, count: 1, unit: "frame", read: () => decodePng(bytes, name) };
    let frames: Frame[] | null = null;
    return {
      name,
      count: info.frameCount,
      unit: "frame",
      read: (k) => (frames ??= decodeApng(bytes, name))[k],
      release: () => {
        frames = null;
      },
    };
  }
  if (format === "tiff") {
    const stack = openTiff(bytes, name);
    return { name, count: stack.count, unit: "page", read: (k) => stack.readPage(k) };
  }
  const header = parseNpyHeader(bytes, name);
  return { name, count: header.frameCount, unit: "frame", read: (k) => readNpyFrame(bytes, k, name, header) };
}

/**
 * A frame source over inputs in memory (PNG, APNG, TIFF, .npy; formats found by magic bytes),
 * frames numbered through the entries in the order given. Headers are read at once (so a bad
 * or unknown input fails here, naming it); pixels are decoded on `read`.
 */
export function sourceFromBytes(entries: readonly NamedBytes[]): FrameSource {
  return sourceFromContainers(entries.map(containerFromBytes));
}

