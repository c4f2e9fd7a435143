// PNG and APNG frames. Chunk layout and CRC follow the PNG specification (W3C, 2nd ed., 2003);
// animation chunks (acTL, fcTL, fdAT) and frame composition follow the APNG specification
// (Mozilla, 2008). Reading: decompression and unfiltering by upng-js; writing: zlib by fflate.
//
// Samples: grey stays grey at its depth (1/2/4-bit scaled to 0..255, 8-bit -> Uint8Array,
// 16-bit -> Uint16Array); RGB, RGBA and palette colours become Rec. 709 luma (see luminance.ts)
// at 8 bits (Uint8Array) or 16 bits (Uint16Array). Alpha is dropped from still images; in an
// animation it is used only to blend a frame over the previous canvas (APNG_BLEND_OP_OVER).

import { zlibSync } from "fflate";
import UPNG from "upng-js";
import type { Frame } from "../types";
import type { ByteReader } from "./bytes";
import { exactBuffer, memoryReader, messageOf } from "./bytes";
import { lumaRounded } from "./luminance";

const SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** What a PNG holds, read from its chunks without decompressing pixels. */
export interface PngInfo {
  width: number;
  height: number;
  /** Bits per sample (1, 2, 4, 8 or 16). */
  bitDepth: number;
  /** PNG colour type: 0 grey, 2 RGB, 3 palette, 4 grey + alpha, 6 RGBA. */
  colorType: number;
  /** Frames of the animation (1 for a still PNG). */
  frameCount: number;
  /** True when the file has an acTL chunk. */
  animated: boolean;
  /** True when the default image (IDAT) is also the first animation frame. */
  defaultImageIsFrame: boolean;
}

/** True when the bytes start with the PNG signature. */
export function isPng(bytes: Uint8Array): boolean {
  if (bytes.length < 8) return false;
  for (let i = 0; i < 8; i++) if (bytes[i] !== SIGNATURE[i]) return false;
  return true;
}

// CRC-32 of ISO 3309 / ITU-T V.42, as used by PNG chunks (PNG spec, annex D).
let crcTable: Uint32Array | null = null;
function crc32(bytes: Uint8Array, start: number, end: number): number {
  if (crcTable === null) {
    crcTable = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      crcTable[n] = c >>> 0;
    }
  }
  let c = 0xffffffff;
  for (let i = start; i < end; i++) c = crcTable[(c ^ bytes[i]) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function u32(bytes: Uint8Array, at: number): number {
  return ((bytes[at] << 24) | (bytes[at + 1] << 16) | (bytes[at + 2] << 8) | bytes[at + 3]) >>> 0;
}

function chunkType(bytes: Uint8Array, at: number): string {
  return String.fromCharCode(bytes[at], bytes[at + 1], bytes[at + 2], bytes[at + 3]);
}

const VALID_DEPTHS: Record<number, number[]> = {
  0: [1, 2, 4, 8, 16],
  2: [8, 16],
  3: [1, 2, 4, 8],
  4: [8, 16],
  6: [8, 16],
};

function checkHeader(name: string, width: number, height: number, depth: number, colorType: number): void {
  const depths = VALID_DEPTHS[colorType];
  if (depths === undefined) throw new Error(`${name}: unsupported PNG colour type ${colorType}`);
  if (!depths.includes(depth)) {
    throw new Error(`${name}: bit depth ${depth} is not allowed for PNG colour type ${colorType}`);
  }
  if (width === 0 || height === 0) throw new Error(`${name}: image is empty (${width} x ${height})`);
  if (width * height > MAX_PIXELS) throw new Error(`${name}: image of ${width} x ${height} pixels is larger than ${MAX_PIXELS} pixels`);
}

/** Largest frame decoded (2^28 pixels, 16384 x 16384): guards against corrupt headers. */
const MAX_PIXELS = 1 << 28;

/**
 * Reads a PNG's header and animation control from its chunks, reading only chunk headers up to
 * the first image data (no decompression, no CRC checks). Works on a reader so a file on disk
 * need not be loaded.
 */
export function inspectPng(input: Uint8Array | ByteReader, name = "png"): PngInfo {
  const reader = input instanceof Uint8Array ? memoryReader(input) : input;
  const signature = reader.read(0, 8);
  if (!isPng(signature)) throw new Error(`${name}: not a PNG file (bad signature)`);
  let at = 8;
  let info: PngInfo | null = null;
  let frameCount = 1;
  let animated = false;
  let sawFcTL = false;
  while (true) {
    const head = reader.read(at, 8).slice();
    if (head.length < 8) throw new Error(`${name}: file is truncated (no image data before byte ${reader.size})`);
    const length = u32(head, 0);
    const type = chunkType(head, 4);
    if (at + 12 + length > reader.size) {
      throw new Error(
        `${name}: file is truncated (chunk ${type} at offset ${at} needs ${length + 12} bytes, file has ${reader.size - at} after it)`,
      );
    }
    if (info === null) {
      if (type !== "IHDR" || length !== 13) throw new Error(`${name}: first chunk is ${type}, not a 13-byte IHDR`);
      const body = reader.read(at + 8, 13);
      info = {
        width: u32(body, 0),
        height: u32(body, 4),
        bitDepth: body[8],
        colorType: body[9],
        frameCount: 1,
        animated: false,
        defaultImageIsFrame: true,
      };
      checkHeader(name, info.width, info.height, info.bitDepth, info.colorType);
    } else if (type === "acTL") {
      const body = reader.read(at + 8, 8);
      frameCount = u32(body, 0);
      animated = true;
      if (frameCount === 0) throw new Error(`${name}: acTL declares 0 frames`);
    } else if (type === "fcTL") {
      sawFcTL = true;
    } else if (type === "IDAT" || type === "IEND") {
      break;
    }
    at += 12 + length;
  }
  info.frameCount = animated ? frameCount : 1;
  info.animated = animated;
  info.defaultImageIsFrame = !animated || sawFcTL;
  return info;
}

/** Walks every chunk of a complete PNG in memory, checking lengths, CRCs and the final IEND. */
function checkChunks(bytes: Uint8Array, name: string): void {
  if (!isPng(bytes)) throw new Error(`${name}: not a PNG file (bad signature)`);
  let at = 8;
  while (true) {
    if (at + 8 > bytes.length) throw new Error(`${name}: file is truncated (no IEND chunk; file ends at ${bytes.length})`);
    const length = u32(bytes, at);
    const type = chunkType(bytes, at + 4);
    if (at + 12 + length > bytes.length) {
      throw new Error(
        `${name}: file is truncated (chunk ${type} at offset ${at} needs ${length + 12} bytes, file has ${bytes.length - at} after it)`,
      );
    }
    const stored = u32(bytes, at + 8 + length);
    if (crc32(bytes, at + 4, at + 8 + length) !== stored) {
      throw new Error(`${name}: chunk ${type} at offset ${at} is corrupt (CRC mismatch)`);
    }
    if (type === "IEND") return;
    at += 12 + length;
  }
}

interface DecodedPng {
  width: number;
  height: number;
  depth: number;
  ctype: number;
  frames: { rect: { x: number; y: number; width: number; height: number }; dispose: number; blend: number; data?: Uint8Array }[];
  tabs: Record<string, unknown>;
  data?: Uint8Array;
}

function decodeChecked(bytes: Uint8Array, name: string): DecodedPng {
  checkChunks(bytes, name);
  const info = inspectPng(bytes, name);
  let out: DecodedPng;
  try {
    out = UPNG.decode(exactBuffer(bytes)) as unknown as DecodedPng;
  } catch (error) {
    throw new Error(`${name}: image data is corrupt (${messageOf(error)})`);
  }
  if (out.ctype === 3 && out.tabs["PLTE"] === undefined) throw new Error(`${name}: palette image has no PLTE chunk`);
  const expected = rawBytes(info.width, info.height, info.colorType, info.bitDepth);
  if (!(out.data instanceof Uint8Array) || out.data.length < expected) {
    throw new Error(
      `${name}: image data is truncated or corrupt (decoded ${out.data?.length ?? 0} bytes, expected ${expected})`,
    );
  }
  return out;
}

const CHANNELS: Record<number, number> = { 0: 1, 2: 3, 3: 1, 4: 2, 6: 4 };

function rawBytes(width: number, height: number, colorType: number, depth: number): number {
  return Math.ceil((width * CHANNELS[colorType] * depth) / 8) * height;
}

/** One decoded image (or frame rectangle) as grey samples plus optional alpha in 0..1. */
interface GreyImage {
  grey: Uint8Array | Uint16Array;
  alpha: Float32Array | null;
}

/** Converts unfiltered PNG scanlines of one image or frame rectangle to grey samples. */
function toGrey(raw: Uint8Array, width: number, height: number, png: DecodedPng, wantAlpha: boolean): GreyImage {
  const { depth, ctype } = png;
  const n = width * height;
  const wide = depth === 16 && ctype !== 3;
  const grey = wide ? new Uint16Array(n) : new Uint8Array(n);
  const alpha = wantAlpha ? new Float32Array(n).fill(1) : null;
  const sample = (i: number): number => (depth === 16 ? (raw[2 * i] << 8) | raw[2 * i + 1] : raw[i]);
  const rowBytes = Math.ceil((width * CHANNELS[ctype] * depth) / 8);
  const packed = (x: number, y: number): number => {
    // Sub-byte samples, most significant bits first (PNG spec, 7.2).
    const perByte = 8 / depth;
    const byte = raw[y * rowBytes + Math.floor(x / perByte)];
    const shift = 8 - depth * ((x % perByte) + 1);
    return (byte >> shift) & ((1 << depth) - 1);
  };
  if (ctype === 0) {
    const scale = depth < 8 ? 255 / ((1 << depth) - 1) : 1;
    const key = png.tabs["tRNS"] as number | undefined;
    for (let y = 0, i = 0; y < height; y++) {
      for (let x = 0; x < width; x++, i++) {
        const v = depth < 8 ? packed(x, y) : sample(i);
        grey[i] = depth < 8 ? Math.round(v * scale) : v;
        if (alpha !== null && key !== undefined && v === key) alpha[i] = 0;
      }
    }
  } else if (ctype === 2) {
    const key = png.tabs["tRNS"] as number[] | undefined;
    for (let i = 0; i < n; i++) {
      const r = sample(3 * i);
      const g = sample(3 * i + 1);
      const b = sample(3 * i + 2);
      grey[i] = lumaRounded(r, g, b);
      if (alpha !== null && key !== undefined && r === key[0] && g === key[1] && b === key[2]) alpha[i] = 0;
    }
  } else if (ctype === 3) {
    const palette = png.tabs["PLTE"] as ArrayLike<number>;
    const alphas = png.tabs["tRNS"] as ArrayLike<number> | undefined;
    const entries = palette.length / 3;
    for (let y = 0, i = 0; y < height; y++) {
      for (let x = 0; x < width; x++, i++) {
        const j = depth < 8 ? packed(x, y) : raw[i];
        if (j >= entries) throw new Error(`palette index ${j} is outside the ${entries}-entry palette`);
        grey[i] = lumaRounded(palette[3 * j], palette[3 * j + 1], palette[3 * j + 2]);
        if (alpha !== null && alphas !== undefined && j < alphas.length) alpha[i] = alphas[j] / 255;
      }
    }
  } else {
    const channels = CHANNELS[ctype];
    const max = depth === 16 ? 65535 : 255;
    for (let i = 0; i < n; i++) {
      const base = channels * i;
      grey[i] = ctype === 4 ? sample(base) : lumaRounded(sample(base), sample(base + 1), sample(base + 2));
      if (alpha !== null) alpha[i] = sample(base + channels - 1) / max;
    }
  }
  return { grey, alpha };
}

function hasAlpha(png: DecodedPng): boolean {
  return png.ctype === 4 || png.ctype === 6 || png.tabs["tRNS"] !== undefined;
}

/**
 * Decodes the default image of a PNG (for an APNG, the IDAT image) as one frame.
 * Throws, naming the file, on bad signature, bad CRC, truncation or unsupported header.
 */
export function decodePng(bytes: Uint8Array, name = "png"): Frame {
  const png = decodeChecked(bytes, name);
  try {
    const { grey } = toGrey(png.data!, png.width, png.height, png, false);
    return { width: png.width, height: png.height, data: grey };
  } catch (error) {
    throw new Error(`${name}: ${messageOf(error)}`);
  }
}

/**
 * Decodes every animation frame of an APNG, composited onto the full canvas as the APNG
 * specification describes (dispose NONE / BACKGROUND / PREVIOUS, blend SOURCE / OVER).
 * A still PNG gives its one image. Frames share the sample type of the file.
 */
export function decodeApng(bytes: Uint8Array, name = "png"): Frame[] {
  const png = decodeChecked(bytes, name);
  const info = inspectPng(bytes, name);
  if (!info.animated) return [decodePng(bytes, name)];
  const { width, height } = png;
  const frames = png.frames;
  if (frames.length !== info.frameCount) {
    throw new Error(`${name}: acTL declares ${info.frameCount} frames but the file has ${frames.length} fcTL chunks`);
  }
  if (frames.length > 0 && frames[0].data === undefined && info.defaultImageIsFrame) frames[0].data = png.data;
  const wantAlpha = hasAlpha(png);
  const wide = png.depth === 16 && png.ctype !== 3;
  const size = width * height;
  let canvas: Uint8Array | Uint16Array = wide ? new Uint16Array(size) : new Uint8Array(size);
  let canvasAlpha = new Float32Array(size); // fully transparent black before frame 0 (APNG spec)
  const result: Frame[] = [];
  for (let k = 0; k < frames.length; k++) {
    const frame = frames[k];
    const { x: fx, y: fy, width: fw, height: fh } = frame.rect;
    const where = `${name}: frame ${k}`;
    if (fw === 0 || fh === 0 || fx + fw > width || fy + fh > height) {
      throw new Error(`${where}: region ${fw} x ${fh} at (${fx}, ${fy}) lies outside the ${width} x ${height} canvas`);
    }
    if (k === 0 && (fx !== 0 || fy !== 0 || fw !== width || fh !== height)) {
      throw new Error(`${where}: the first frame must cover the whole canvas`);
    }
    const expected = rawBytes(fw, fh, png.ctype, png.depth);
    if (!(frame.data instanceof Uint8Array) || frame.data.length < expected) {
      throw new Error(`${where}: frame data is truncated or corrupt (decoded ${frame.data?.length ?? 0} bytes, expected ${expected})`);
    }
    let src: GreyImage;
    try {
      src = toGrey(frame.data, fw, fh, png, wantAlpha);
    } catch (error) {
      throw new Error(`${where}: ${messageOf(error)}`);
    }
    const before = frame.dispose === 2 ? { grey: canvas.slice(), alpha: canvasAlpha.slice() } : null;
    for (let y = 0; y < fh; y++) {
      for (let x = 0; x < fw; x++) {
        const s = y * fw + x;
        const d = (fy + y) * width + fx + x;
        const as = src.alpha === null ? 1 : src.alpha[s];
        if (frame.blend === 0 || as >= 1) {
          canvas[d] = src.grey[s];
          canvasAlpha[d] = as;
        } else if (as > 0) {
          // Porter-Duff "over" on grey with straight alpha (APNG spec, APNG_BLEND_OP_OVER).
          const ad = canvasAlpha[d];
          const ao = as + (1 - as) * ad;
          canvas[d] = Math.round((as * src.grey[s] + (1 - as) * ad * canvas[d]) / ao);
          canvasAlpha[d] = ao;
        }
      }
    }
    result.push({ width, height, data: canvas.slice() });
    if (frame.dispose === 1) {
      for (let y = 0; y < fh; y++) {
        const row = (fy + y) * width + fx;
        canvas.fill(0, row, row + fw);
        canvasAlpha.fill(0, row, row + fw);
      }
    } else if (frame.dispose === 2 && before !== null) {
      // The first frame's PREVIOUS is treated as BACKGROUND (APNG spec): `before` is then empty.
      canvas = before.grey;
      canvasAlpha = before.alpha;
    }
  }
  return result;
}

/** Decodes animation frame `index` of an APNG (or frame 0 of a still PNG). */
export function decodeApngFrame(bytes: Uint8Array, index: number, name = "png"): Frame {
  const frames = decodeApng(bytes, name);
  if (!Number.isInteger(index) || index < 0 || index >= frames.length) {
    throw new RangeError(`${name}: frame ${index} does not exist (the file has ${frames.length})`);
  }
  return frames[index];
}

// ---- Writers: IHDR + IDAT (+ acTL/fcTL/fdAT) + IEND, zlib by fflate, one filter per row chosen
// by the minimum sum of absolute differences (PNG spec, 12.8 "Filter selection").

function chunk(type: string, body: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + body.length);
  const view = new DataView(out.buffer);
  view.setUint32(0, body.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(body, 8);
  view.setUint32(8 + body.length, crc32(out, 4, 8 + body.length));
  return out;
}

function be(values: readonly number[], sizes: readonly number[]): Uint8Array {
  const out = new Uint8Array(sizes.reduce((a, b) => a + b, 0));
  const view = new DataView(out.buffer);
  let at = 0;
  values.forEach((v, i) => {
    if (sizes[i] === 4) view.setUint32(at, v);
    else if (sizes[i] === 2) view.setUint16(at, v);
    else view.setUint8(at, v);
    at += sizes[i];
  });
  return out;
}

function joinBytes(parts: readonly Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}

/** Filtered, zlib-compressed scanlines of 8-bit samples, `channels` per pixel. */
function compressScanlines(width: number, height: number, channels: number, samples: Uint8Array): Uint8Array {
  const row = width * channels;
  const out = new Uint8Array((row + 1) * height);
  const trial = new Uint8Array(row);
  for (let y = 0; y < height; y++) {
    const cur = y * row;
    const prev = cur - row;
    let bestCost = Infinity;
    for (let type = 0; type < 5; type++) {
      let cost = 0;
      for (let i = 0; i < row; i++) {
        const a = i >= channels ? samples[cur + i - channels] : 0;
        const b = y > 0 ? samples[prev + i] : 0;
        const c = y > 0 && i >= channels ? samples[prev + i - channels] : 0;
        let predictor = 0;
        if (type === 1) predictor = a;
        else if (type === 2) predictor = b;
        else if (type === 3) predictor = (a + b) >> 1;
        else if (type === 4) {
          const p = a + b - c;
          const pa = Math.abs(p - a);
          const pb = Math.abs(p - b);
          const pc = Math.abs(p - c);
          predictor = pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
        }
        const v = (samples[cur + i] - predictor) & 255;
        trial[i] = v;
        cost += v < 128 ? v : 256 - v;
      }
      if (cost < bestCost) {
        bestCost = cost;
        out[y * (row + 1)] = type;
        out.set(trial, y * (row + 1) + 1);
      }
    }
  }
  return zlibSync(out, { level: 6 });
}

function ihdr(width: number, height: number, colorType: number): Uint8Array {
  return chunk("IHDR", be([width, height, 8, colorType, 0, 0, 0], [4, 4, 1, 1, 1, 1, 1]));
}

const SIGNATURE_BYTES = Uint8Array.from(SIGNATURE);
const IEND = chunk("IEND", new Uint8Array(0));

/** Encodes an 8-bit grey frame as a PNG (colour type 0), for masks and grey overlays. */
export function encodePng(frame: Frame): Uint8Array {
  if (!(frame.data instanceof Uint8Array)) {
    throw new TypeError(`encodePng writes 8-bit grey frames; got ${frame.data.constructor.name} samples`);
  }
  checkSize(frame.width, frame.height, frame.data.length, 1);
  const idat = chunk("IDAT", compressScanlines(frame.width, frame.height, 1, frame.data));
  return joinBytes([SIGNATURE_BYTES, ihdr(frame.width, frame.height, 0), idat, IEND]);
}

/** Encodes straight (non-premultiplied) 8-bit RGBA pixels, row-major, as a PNG (colour type 6). */
export function encodeRgbaPng(width: number, height: number, rgba: Uint8Array): Uint8Array {
  checkSize(width, height, rgba.length, 4);
  const idat = chunk("IDAT", compressScanlines(width, height, 4, rgba));
  return joinBytes([SIGNATURE_BYTES, ihdr(width, height, 6), idat, IEND]);
}

/**
 * Encodes 8-bit RGBA frames as an APNG that loops forever; every frame covers the canvas
 * (dispose NONE, blend SOURCE) and `delaysMs[k]` is frame k's display time in milliseconds.
 */
export function encodeRgbaApng(width: number, height: number, frames: readonly Uint8Array[], delaysMs: readonly number[]): Uint8Array {
  if (frames.length === 0) throw new RangeError("encodeRgbaApng needs at least one frame");
  if (delaysMs.length !== frames.length) {
    throw new RangeError(`encodeRgbaApng: expected ${frames.length} delays for ${frames.length} frames, got ${delaysMs.length}`);
  }
  frames.forEach((f) => checkSize(width, height, f.length, 4));
  const parts = [SIGNATURE_BYTES, ihdr(width, height, 6), chunk("acTL", be([frames.length, 0], [4, 4]))];
  let sequence = 0;
  frames.forEach((rgba, k) => {
    const delay = Math.max(0, Math.min(65535, Math.round(delaysMs[k])));
    parts.push(chunk("fcTL", be([sequence++, width, height, 0, 0, delay, 1000, 0, 0], [4, 4, 4, 4, 4, 2, 2, 1, 1])));
    const z = compressScanlines(width, height, 4, rgba);
    parts.push(k === 0 ? chunk("IDAT", z) : chunk("fdAT", joinBytes([be([sequence++], [4]), z])));
  });
  parts.push(IEND);
  return joinBytes(parts);
}

function checkSize(width: number, height: number, length: number, channels: number): void {
  if (!Number.isInteger(width) || !Number.isInteger(height) || width <= 0 || height <= 0) {
    throw new RangeError(`image size must be positive integers; got ${width} x ${height}`);
  }
  if (length !== width * height * channels) {
    throw new RangeError(`expected ${width * height * channels} bytes for ${width} x ${height} x ${channels}, got ${length}`);
  }
}
