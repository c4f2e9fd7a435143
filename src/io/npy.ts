// NumPy .npy arrays, per the format description in numpy.lib.format (NEP 1, "A simple file
// format for NumPy arrays"): magic "\x93NUMPY", major and minor version bytes, a little-endian
// header length (2 bytes in version 1.0, 4 bytes in 2.0 and 3.0), then an ASCII (1.0, 2.0) or
// UTF-8 (3.0) Python dict literal with 'descr', 'fortran_order' and 'shape', padded with spaces
// and ended by '\n'; the raw array data follows.
//
// A 2-D array (height, width) is one frame; a 3-D array (frames, height, width) is a stack.
// Samples: u1 -> Uint8Array, b1 -> Uint8Array (0 / 1), u2 -> Uint16Array, and i1, i2, u4, i4,
// f4, f8 -> Float32Array (f8 and 32-bit integers are rounded to float precision; NaN kept).

import type { Frame } from "../types";
import type { ByteReader } from "./bytes";
import { memoryReader } from "./bytes";

/** Largest frame decoded (2^28 pixels, 16384 x 16384): guards against corrupt headers. */
const MAX_PIXELS = 1 << 28;

const MAGIC = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59]; // \x93 N U M P Y

/** Element kinds this reader converts. */
export type NpyDtype = "u1" | "i1" | "b1" | "u2" | "i2" | "u4" | "i4" | "f4" | "f8";

const ITEM_SIZE: Record<NpyDtype, number> = { u1: 1, i1: 1, b1: 1, u2: 2, i2: 2, u4: 4, i4: 4, f4: 4, f8: 8 };

/** The parsed header of a .npy file and where its data starts. */
export interface NpyHeader {
  /** Format version, e.g. `[1, 0]`. */
  version: [number, number];
  /** The 'descr' string as stored, e.g. `"<f4"`. */
  descr: string;
  dtype: NpyDtype;
  /** Byte order of multi-byte elements. */
  littleEndian: boolean;
  fortranOrder: boolean;
  shape: number[];
  /** Byte offset of the first element. */
  dataOffset: number;
  /** Frames (1 for a 2-D array). */
  frameCount: number;
  width: number;
  height: number;
  /** Bytes per element. */
  itemSize: number;
}

/** True when the bytes start with the .npy magic string. */
export function isNpy(bytes: Uint8Array): boolean {
  if (bytes.length < 6) return false;
  for (let i = 0; i < 6; i++) if (bytes[i] !== MAGIC[i]) return false;
  return true;
}

function dictEntry(dict: string, key: string): string | undefined {
  const match = new RegExp(`['"]${key}['"]\\s*:\\s*`).exec(dict);
  if (match === null) return undefined;
  return dict.slice(match.index + match[0].length);
}

/**
 * Parses the header of a .npy file. Reads only the header bytes, so `input` may be a reader over
 * a file of any size. Throws, naming the file, on a bad magic string, version or dict.
 */
export function parseNpyHeader(input: Uint8Array | ByteReader, name = "npy"): NpyHeader {
  const reader = input instanceof Uint8Array ? memoryReader(input) : input;
  const start = reader.read(0, 12).slice();
  if (start.length < 10 || !isNpy(start)) throw new Error(`${name}: not a NumPy .npy file (bad magic string)`);
  const major = start[6];
  const minor = start[7];
  let headerLength: number;
  let dictStart: number;
  if (major === 1) {
    headerLength = start[8] | (start[9] << 8);
    dictStart = 10;
  } else if (major === 2 || major === 3) {
    if (start.length < 12) throw new Error(`${name}: file is truncated (header of ${start.length} bytes)`);
    headerLength = (start[8] | (start[9] << 8) | (start[10] << 16) | (start[11] << 24)) >>> 0;
    dictStart = 12;
  } else {
    throw new Error(`${name}: unsupported .npy format version ${major}.${minor} (this reader knows 1.0, 2.0 and 3.0)`);
  }
  const dataOffset = dictStart + headerLength;
  if (dataOffset > reader.size) {
    throw new Error(`${name}: file is truncated (header needs ${dataOffset} bytes, file has ${reader.size})`);
  }
  const raw = reader.read(dictStart, headerLength);
  const dict = major === 3 ? new TextDecoder("utf-8").decode(raw) : String.fromCharCode(...raw);

  const descrText = dictEntry(dict, "descr");
  const descrMatch = descrText === undefined ? null : /^(['"])([^'"]*)\1/.exec(descrText);
  if (descrMatch === null) {
    throw new Error(`${name}: header has no plain 'descr' string (structured dtypes are not supported): ${dict.trim()}`);
  }
  const descr = descrMatch[2];
  const orderText = dictEntry(dict, "fortran_order");
  const orderMatch = orderText === undefined ? null : /^(True|False)\b/.exec(orderText);
  if (orderMatch === null) throw new Error(`${name}: header has no 'fortran_order' True or False: ${dict.trim()}`);
  const shapeText = dictEntry(dict, "shape");
  const shapeMatch = shapeText === undefined ? null : /^\(([^)]*)\)/.exec(shapeText);
  if (shapeMatch === null) throw new Error(`${name}: header has no 'shape' tuple: ${dict.trim()}`);
  const shape = shapeMatch[1]
    .split(",")
    .map((s) => s.trim().replace(/L$/, ""))
    .filter((s) => s.length > 0)
    .map((s) => {
      if (!/^\d+$/.test(s)) throw new Error(`${name}: shape entry '${s}' is not a non-negative integer`);
      return Number(s);
    });

  const typeMatch = /^([<>|=])?([a-z])(\d+)$/.exec(descr);
  const kind = typeMatch === null ? "" : `${typeMatch[2]}${typeMatch[3]}`;
  if (typeMatch === null || !(kind in ITEM_SIZE)) {
    throw new Error(`${name}: unsupported dtype '${descr}' (supported: u1, i1, b1, u2, i2, u4, i4, f4, f8)`);
  }
  const dtype = kind as NpyDtype;
  // '=' (native) is written by no current NumPy; it is read as little-endian, the order of
  // every platform NumPy ships for today.
  const littleEndian = typeMatch[1] !== ">";
  if (shape.length !== 2 && shape.length !== 3) {
    throw new Error(`${name}: array has ${shape.length} dimensions (shape (${shape.join(", ")})); expected 2 (height, width) or 3 (frames, height, width)`);
  }
  const [frameCount, height, width] = shape.length === 2 ? [1, shape[0], shape[1]] : shape;
  if (height === 0 || width === 0) throw new Error(`${name}: frames are empty (shape (${shape.join(", ")}))`);
  if (height * width > MAX_PIXELS) throw new Error(`${name}: frames of ${height} x ${width} are larger than ${MAX_PIXELS} pixels`);
  return {
    version: [major, minor],
    descr,
    dtype,
    littleEndian,
    fortranOrder: orderMatch[1] === "True",
    shape,
    dataOffset,
    frameCount,
    width,
    height,
    itemSize: ITEM_SIZE[dtype],
  };
}

const HOST_LITTLE = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** Copies C-order samples whose bytes already are the output's elements (u1, and u2 / f4 in the host's byte order). */
function copyNative(dtype: NpyDtype, little: boolean, bytes: Uint8Array, out: Uint8Array | Uint16Array | Float32Array, n: number): boolean {
  if (dtype === "u1") { (out as Uint8Array).set(bytes.subarray(0, n)); return true; }
  if ((dtype !== "u2" && dtype !== "f4") || little !== HOST_LITTLE) return false;
  const size = dtype === "u2" ? 2 : 4;
  const src = bytes.byteOffset % size === 0 ? bytes : bytes.slice(0, n * size);
  if (dtype === "u2") (out as Uint16Array).set(new Uint16Array(src.buffer, src.byteOffset, n));
  else (out as Float32Array).set(new Float32Array(src.buffer, src.byteOffset, n));
  return true;
}

function outputArray(dtype: NpyDtype, n: number): Uint8Array | Uint16Array | Float32Array {
  if (dtype === "u1" || dtype === "b1") return new Uint8Array(n);
  if (dtype === "u2") return new Uint16Array(n);
  return new Float32Array(n);
}

function elementReader(dtype: NpyDtype, little: boolean): (view: DataView, at: number) => number {
  switch (dtype) {
    case "u1":
      return (v, at) => v.getUint8(at);
    case "b1":
      return (v, at) => (v.getUint8(at) !== 0 ? 1 : 0);
    case "i1":
      return (v, at) => v.getInt8(at);
    case "u2":
      return (v, at) => v.getUint16(at, little);
    case "i2":
      return (v, at) => v.getInt16(at, little);
    case "u4":
      return (v, at) => v.getUint32(at, little);
    case "i4":
      return (v, at) => v.getInt32(at, little);
    case "f4":
      return (v, at) => v.getFloat32(at, little);
    case "f8":
      return (v, at) => v.getFloat64(at, little);
  }
}

function truncated(name: string, index: number, need: number, offset: number, size: number): Error {
  return new Error(`${name}: frame ${index}: file is truncated (expected ${need} bytes at offset ${offset}, file has ${size})`);
}

/**
 * Decodes frame `index` of a .npy file (0-based; a 2-D array has only frame 0) through
 * positioned reads: for C order exactly the frame's bytes are read; for Fortran order the frame
 * is strided through the whole array and is gathered one column slab at a time.
 */
export function readNpyFrame(input: Uint8Array | ByteReader, index: number, name = "npy", header?: NpyHeader): Frame {
  const reader = input instanceof Uint8Array ? memoryReader(input) : input;
  const h = header ?? parseNpyHeader(reader, name);
  if (!Number.isInteger(index) || index < 0 || index >= h.frameCount) {
    throw new RangeError(`${name}: frame ${index} does not exist (the array has ${h.frameCount})`);
  }
  const { width, height, frameCount, itemSize } = h;
  const n = width * height;
  const get = elementReader(h.dtype, h.littleEndian);
  if (!h.fortranOrder) {
    // C order: element (k, y, x) at ((k H + y) W + x) itemSize.
    const need = n * itemSize;
    const offset = h.dataOffset + index * need;
    if (offset + need > reader.size) throw truncated(name, index, need, offset, reader.size);
    const bytes = reader.read(offset, need);
    if (bytes.length < need) throw truncated(name, index, need, offset, reader.size);
    const out = outputArray(h.dtype, n);
    if (!copyNative(h.dtype, h.littleEndian, bytes, out, n)) {
      const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
      for (let i = 0; i < n; i++) out[i] = get(view, i * itemSize);
    }
    return { width, height, data: out };
  } else {
    // Fortran order: element (k, y, x) at (k + F y + F H x) itemSize. For one column x the
    // frame's samples (k, 0..H-1, x) lie in a slab of F (H - 1) + 1 elements.
    const slabElements = frameCount * (height - 1) + 1;
    const need = slabElements * itemSize;
    const lastOffset = h.dataOffset + (index + frameCount * height * (width - 1)) * itemSize;
    if (lastOffset + need > reader.size) throw truncated(name, index, need, lastOffset, reader.size);
    const out = outputArray(h.dtype, n);
    for (let x = 0; x < width; x++) {
      const offset = h.dataOffset + (index + frameCount * height * x) * itemSize;
      const bytes = reader.read(offset, need);
      if (bytes.length < need) throw truncated(name, index, need, offset, reader.size);
      const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
      for (let y = 0; y < height; y++) out[y * width + x] = get(view, frameCount * y * itemSize);
    }
    return { width, height, data: out };
  }
}

/** Decodes every frame of a .npy file in memory. */
export function decodeNpy(bytes: Uint8Array, name = "npy"): Frame[] {
  const header = parseNpyHeader(bytes, name);
  return Array.from({ length: header.frameCount }, (_, k) => readNpyFrame(bytes, k, name, header));
}

/** Options of {@link encodeNpy}. */
export interface EncodeNpyOptions {
  /**
   * Dimensions written: `"auto"` writes one frame as 2-D (height, width) and several as 3-D.
   * @default "auto"
   */
  dimensions?: "auto" | "3d";
}

/**
 * Writes frames as a little-endian, C-order .npy (format 1.0, or 2.0 when the header needs it).
 * The dtype follows the samples: Uint8Array '|u1', Uint16Array '<u2', Float32Array '<f4'.
 * All frames must share one size and sample type.
 */
export function encodeNpy(frames: Frame | readonly Frame[], options: EncodeNpyOptions = {}): Uint8Array {
  const list: readonly Frame[] = Array.isArray(frames) ? frames : [frames as Frame];
  if (list.length === 0) throw new RangeError("encodeNpy needs at least one frame");
  const first = list[0];
  const kind = first.data.constructor;
  list.forEach((f, k) => {
    if (f.width !== first.width || f.height !== first.height || f.data.constructor !== kind) {
      throw new RangeError(`encodeNpy: frame ${k} is ${f.width} x ${f.height} ${f.data.constructor.name}; frame 0 is ${first.width} x ${first.height} ${kind.name}`);
    }
    if (f.data.length !== f.width * f.height) {
      throw new RangeError(`encodeNpy: frame ${k} holds ${f.data.length} samples, expected ${f.width * f.height}`);
    }
  });
  const descr = first.data instanceof Uint8Array ? "|u1" : first.data instanceof Uint16Array ? "<u2" : "<f4";
  const threeD = list.length > 1 || options.dimensions === "3d";
  const shape = threeD ? `(${list.length}, ${first.height}, ${first.width})` : `(${first.height}, ${first.width})`;
  let dict = `{'descr': '${descr}', 'fortran_order': False, 'shape': ${shape}, }`;
  // Pad with spaces so that magic + version + length + dict + '\n' is a multiple of 64 bytes.
  let prefix = 10;
  let total = Math.ceil((prefix + dict.length + 1) / 64) * 64;
  if (total - prefix > 0xffff) {
    prefix = 12;
    total = Math.ceil((prefix + dict.length + 1) / 64) * 64;
  }
  dict = dict.padEnd(total - prefix - 1, " ") + "\n";
  const itemSize = first.data.BYTES_PER_ELEMENT;
  const frameBytes = first.width * first.height * itemSize;
  const out = new Uint8Array(total + list.length * frameBytes);
  out.set(MAGIC, 0);
  out[6] = prefix === 10 ? 1 : 2;
  out[7] = 0;
  const view = new DataView(out.buffer);
  if (prefix === 10) view.setUint16(8, total - prefix, true);
  else view.setUint32(8, total - prefix, true);
  for (let i = 0; i < dict.length; i++) out[prefix + i] = dict.charCodeAt(i);
  list.forEach((f, k) => {
    const base = total + k * frameBytes;
    const d = f.data;
    if (d instanceof Uint8Array) out.set(d, base);
    else if (d instanceof Uint16Array) for (let i = 0; i < d.length; i++) view.setUint16(base + 2 * i, d[i], true);
    else for (let i = 0; i < d.length; i++) view.setFloat32(base + 4 * i, d[i], true);
  });
  return out;
}
