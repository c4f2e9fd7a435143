// Messages between the page and its analysis workers. A job carries either the bytes of a
// one-frame file (the worker decodes them) or a frame already read from a stack; the reply
// carries the table rows and, for the frame on view, its images as RGBA (buffers transferred).
import type { Cell, FrameOptions } from "../src/index";

export interface FrameData {
  width: number;
  height: number;
  data: Uint8Array | Uint16Array | Int16Array | Uint32Array | Int32Array | Float32Array | Float64Array | Int8Array;
}

export interface FrameJob {
  /** Frame number in the page's list (0-based). */
  index: number;
  /** File name, and page / frame inside it for stacks ("stack.tif page 3"). */
  where: string;
  /** Bytes of a one-frame file (PNG, TIFF, .npy), decoded in the worker. */
  bytes?: Uint8Array;
  /** A frame read from a stack in the page. */
  frame?: FrameData;
  /** The page could not read this frame of a stack: the worker reports it as the frame's failure. */
  fail?: string;
  options: FrameOptions;
  /** Also return the images of this frame (raw, overlay, spectrum). */
  view?: { overlayScale: number };
  /** Buffers moved to the worker (read by the pool). */
  transfer?: ArrayBuffer[];
}

export interface RgbaImage {
  width: number;
  height: number;
  rgba: Uint8ClampedArray;
}

export interface FrameViews {
  raw: RgbaImage;
  overlay: RgbaImage;
  /** Log power spectrum with the ring at q*, when the frame has one. */
  spectrum?: RgbaImage;
  spectrumNote?: string;
}

export interface FrameReply {
  index: number;
  where: string;
  width: number;
  height: number;
  row: Array<[string, Cell]>;
  domainRows: Cell[][];
  views?: FrameViews;
}
