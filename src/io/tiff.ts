// Multi-page TIFF stacks. The header and the chain of image file directories (IFDs) are walked
// here per TIFF 6.0 (Adobe, 1992), section 2, with bounds and loop checks; strip decompression
// (none, LZW, Deflate, PackBits) and the horizontal predictor are done by UTIF (npm utif2), one
// page at a time, on demand.
//
// Samples: unsigned 8-bit -> Uint8Array, unsigned 16-bit -> Uint16Array; unsigned 32-bit, signed
// 8/16/32-bit and 32/64-bit float -> Float32Array (32-bit integers above 2^24 and doubles lose
// precision). RGB pages become Rec. 709 luma (see luminance.ts) in the same sample type;
// WhiteIsZero grey is inverted to BlackIsZero; extra samples (alpha) are dropped.

import UTIFModule from "utif2";
import type { Frame, FrameData } from "../types";
import type { ByteReader } from "./bytes";
import { exactBuffer, memoryReader, messageOf, plainBytes } from "./bytes";
import { luma } from "./luminance";

/** What one TIFF page holds, from its IFD. */
export interface TiffPageInfo {
  width: number;
  height: number;
  bitsPerSample: number;
  samplesPerPixel: number;
  sampleFormat: "uint" | "int" | "float";
  /** TIFF Compression tag value (1 none, 5 LZW, 8 Deflate, 32773 PackBits). */
  compression: number;
  /** TIFF PhotometricInterpretation (0 WhiteIsZero, 1 BlackIsZero, 2 RGB). */
  photometric: number;
}

/** A multi-page TIFF whose pages are decoded one at a time, on demand. */
export interface TiffStack {
  readonly name: string;
  /** Number of pages (IFDs in the main chain). */
  readonly count: number;
  /** The tags of page `index` (0-based), without decoding it. */
  page(index: number): TiffPageInfo;
  /** Decodes page `index` (0-based) into a frame; other pages are not touched. */
  readPage(index: number): Frame;
}

/** True when the bytes start with a classic TIFF header ("II*\0" or "MM\0*"). */
export function isTiff(bytes: Uint8Array): boolean {
  if (bytes.length < 4) return false;
  return (
    (bytes[0] === 0x49 && bytes[1] === 0x49 && bytes[2] === 42 && bytes[3] === 0) ||
    (bytes[0] === 0x4d && bytes[1] === 0x4d && bytes[2] === 0 && bytes[3] === 42)
  );
}

type Ifd = Record<string, unknown>;

// The parts of UTIF used here, typed as they behave (its bundled .d.ts omits the extra arguments).
const UTIF = UTIFModule as unknown as {
  decode(buffer: ArrayBuffer, options: { parseMN: boolean; debug: boolean }): Ifd[];
  decodeImage(buffer: ArrayBuffer, ifd: Ifd, ifds: Ifd[]): void;
};

const MAX_PAGES = 1 << 22;
/** Largest page decoded (2^28 pixels, 16384 x 16384): guards against corrupt tags. */
const MAX_PIXELS = 1 << 28;

/**
 * Walks the IFD chain (TIFF 6.0, section 2) and returns each IFD's offset, checking that every
 * directory lies inside the file and that the chain does not loop. Reads only 8 + 2 + 4 bytes
 * per page, so it can count the pages of a file on disk without loading it.
 */
export function tiffPageOffsets(input: Uint8Array | ByteReader, name = "tiff"): number[] {
  const reader = input instanceof Uint8Array ? memoryReader(input) : input;
  const head = reader.read(0, 8).slice();
  if (head.length < 8) throw new Error(`${name}: file is truncated (${head.length} bytes, a TIFF header needs 8)`);
  const little = head[0] === 0x49 && head[1] === 0x49;
  const big = head[0] === 0x4d && head[1] === 0x4d;
  if (!little && !big) throw new Error(`${name}: not a TIFF file (bad byte-order mark)`);
  const view = new DataView(head.buffer, head.byteOffset, 8);
  const magic = view.getUint16(2, little);
  if (magic === 43) throw new Error(`${name}: BigTIFF files are not supported`);
  if (magic !== 42) throw new Error(`${name}: not a TIFF file (version ${magic}, expected 42)`);
  const offsets: number[] = [];
  const seen = new Set<number>();
  let next = view.getUint32(4, little);
  while (next !== 0) {
    const page = offsets.length;
    if (seen.has(next)) throw new Error(`${name}: page ${page}: IFD chain loops back to offset ${next}`);
    if (next < 8 || next + 2 > reader.size) {
      throw new Error(`${name}: page ${page}: file is truncated (IFD at offset ${next}, file has ${reader.size})`);
    }
    const countBytes = reader.read(next, 2);
    const entries = new DataView(countBytes.buffer, countBytes.byteOffset, 2).getUint16(0, little);
    const end = next + 2 + 12 * entries + 4;
    if (end > reader.size) {
      throw new Error(`${name}: page ${page}: file is truncated (IFD of ${entries} entries at offset ${next} needs ${end - next} bytes, file has ${reader.size})`);
    }
    if (entries === 0) throw new Error(`${name}: page ${page}: IFD at offset ${next} has no entries`);
    seen.add(next);
    offsets.push(next);
    if (offsets.length > MAX_PAGES) throw new Error(`${name}: more than ${MAX_PAGES} pages`);
    const link = reader.read(end - 4, 4);
    next = new DataView(link.buffer, link.byteOffset, 4).getUint32(0, little);
  }
  if (offsets.length === 0) throw new Error(`${name}: TIFF has no pages`);
  return offsets;
}

/** Number of pages of a TIFF, from its IFD chain. */
export function countTiffPages(input: Uint8Array | ByteReader, name = "tiff"): number {
  return tiffPageOffsets(input, name).length;
}

function tag(ifd: Ifd, id: number): number[] | undefined {
  const value = ifd[`t${id}`];
  if (value === undefined) return undefined;
  return Array.from(value as ArrayLike<number>);
}

function first(ifd: Ifd, id: number, fallback: number): number {
  const v = tag(ifd, id);
  return v === undefined || v.length === 0 ? fallback : v[0];
}

const COMPRESSIONS: Record<number, string> = { 1: "none", 5: "LZW", 8: "Deflate", 32946: "Deflate", 32773: "PackBits" };
const FORMATS: Record<number, TiffPageInfo["sampleFormat"]> = { 1: "uint", 2: "int", 3: "float" };

function pageInfo(ifd: Ifd, where: string): TiffPageInfo {
  const width = first(ifd, 256, 0);
  const height = first(ifd, 257, 0);
  if (!(width > 0 && height > 0)) throw new Error(`${where}: image size is missing or zero (${width} x ${height})`);
  if (width * height > MAX_PIXELS) throw new Error(`${where}: page of ${width} x ${height} pixels is larger than ${MAX_PIXELS} pixels`);
  const samplesPerPixel = first(ifd, 277, 1);
  const bitsList = tag(ifd, 258) ?? [1];
  const bitsPerSample = bitsList[0];
  if (bitsList.some((b) => b !== bitsPerSample)) throw new Error(`${where}: samples of different bit depths (${bitsList.join(", ")}) are not supported`);
  const formatCode = first(ifd, 339, 1);
  const sampleFormat = FORMATS[formatCode];
  if (sampleFormat === undefined) throw new Error(`${where}: sample format ${formatCode} is not supported (1 unsigned, 2 signed, 3 float)`);
  const allowed = sampleFormat === "float" ? [32, 64] : sampleFormat === "int" ? [8, 16, 32] : [8, 16, 32];
  if (!allowed.includes(bitsPerSample)) {
    throw new Error(`${where}: ${bitsPerSample}-bit ${sampleFormat} samples are not supported (${allowed.join(", ")}-bit are)`);
  }
  const compression = first(ifd, 259, 1);
  if (COMPRESSIONS[compression] === undefined) throw new Error(`${where}: compression ${compression} is not supported (none, LZW, Deflate, PackBits are)`);
  const photometric = first(ifd, 262, samplesPerPixel >= 3 ? 2 : 1);
  if (photometric !== 0 && photometric !== 1 && photometric !== 2) {
    throw new Error(`${where}: photometric interpretation ${photometric} is not supported (0 WhiteIsZero, 1 BlackIsZero, 2 RGB are)`);
  }
  if (photometric === 2 && samplesPerPixel < 3) throw new Error(`${where}: RGB page with ${samplesPerPixel} samples per pixel`);
  if (photometric === 0 && sampleFormat !== "uint") throw new Error(`${where}: WhiteIsZero ${sampleFormat} samples are not supported`);
  if (samplesPerPixel > 1 && first(ifd, 284, 1) === 2) throw new Error(`${where}: planar configuration 2 (separate planes) is not supported`);
  const predictor = first(ifd, 317, 1);
  if (predictor === 3) throw new Error(`${where}: floating-point predictor (3) is not supported`);
  if (predictor === 2 && bitsPerSample > 16) throw new Error(`${where}: horizontal predictor on ${bitsPerSample}-bit samples is not supported`);
  if (predictor !== 1 && predictor !== 2) throw new Error(`${where}: predictor ${predictor} is not supported`);
  if (ifd["t322"] !== undefined) throw new Error(`${where}: tiled pages are not supported (strips are)`);
  return { width, height, bitsPerSample, samplesPerPixel, sampleFormat, compression, photometric };
}

function checkStrips(ifd: Ifd, info: TiffPageInfo, size: number, where: string): void {
  const offsets = tag(ifd, 273);
  if (offsets === undefined || offsets.length === 0) throw new Error(`${where}: page has no strip offsets`);
  const rowBytes = Math.ceil((info.width * info.samplesPerPixel * info.bitsPerSample) / 8);
  const counts = tag(ifd, 279);
  if (info.compression === 1 && offsets.length === 1) {
    // UTIF reads height x row bytes from a single uncompressed strip.
    const need = rowBytes * info.height;
    if (offsets[0] + need > size) {
      throw new Error(`${where}: file is truncated (strip 0 at offset ${offsets[0]} needs ${need} bytes, file has ${size})`);
    }
    return;
  }
  if (counts === undefined || counts.length !== offsets.length) {
    throw new Error(`${where}: ${offsets.length} strip offsets but ${counts?.length ?? 0} strip byte counts`);
  }
  const rowsPerStrip = Math.min(first(ifd, 278, info.height), info.height);
  const strips = Math.ceil(info.height / rowsPerStrip);
  if (offsets.length < strips) throw new Error(`${where}: ${offsets.length} strips hold fewer than the ${info.height} rows (${rowsPerStrip} rows per strip)`);
  for (let i = 0; i < offsets.length; i++) {
    if (offsets[i] + counts[i] > size) {
      throw new Error(`${where}: file is truncated (strip ${i} at offset ${offsets[i]} needs ${counts[i]} bytes, file has ${size})`);
    }
  }
  if (info.compression === 1) {
    const total = counts.reduce((a, b) => a + b, 0);
    if (total < rowBytes * info.height) {
      throw new Error(`${where}: strips hold ${total} bytes, the page needs ${rowBytes * info.height}`);
    }
  }
}

/** Converts UTIF's decoded page bytes to frame samples. */
function toFrame(raw: Uint8Array, info: TiffPageInfo, littleEndian: boolean): Frame {
  const { width, height, bitsPerSample: bits, samplesPerPixel: spp, sampleFormat, photometric } = info;
  const n = width * height;
  const bytesPerSample = bits / 8;
  // UTIF turns 16-bit samples to little-endian; 32- and 64-bit ones stay in file order.
  const little = bits === 16 ? true : littleEndian;
  const view = new DataView(raw.buffer, raw.byteOffset, raw.byteLength);
  let get: (at: number) => number;
  if (sampleFormat === "float") get = bits === 32 ? (at) => view.getFloat32(at, little) : (at) => view.getFloat64(at, little);
  else if (sampleFormat === "int") get = bits === 8 ? (at) => view.getInt8(at) : bits === 16 ? (at) => view.getInt16(at, little) : (at) => view.getInt32(at, little);
  else get = bits === 8 ? (at) => raw[at] : bits === 16 ? (at) => view.getUint16(at, true) : (at) => view.getUint32(at, little);
  const integerOut = sampleFormat === "uint" && bits <= 16;
  const data: FrameData = integerOut ? (bits === 8 ? new Uint8Array(n) : new Uint16Array(n)) : new Float32Array(n);
  const pixelBytes = spp * bytesPerSample;
  const max = bits === 8 ? 255 : bits === 16 ? 65535 : 4294967295;
  for (let i = 0; i < n; i++) {
    const at = i * pixelBytes;
    let v: number;
    if (photometric === 2) {
      v = luma(get(at), get(at + bytesPerSample), get(at + 2 * bytesPerSample));
      if (integerOut) v = Math.round(v);
    } else {
      v = get(at);
      if (photometric === 0) v = max - v;
    }
    data[i] = v;
  }
  return { width, height, data };
}

/**
 * Opens a TIFF held in memory: walks its IFD chain and reads its tags at once, and decodes each
 * page only when asked. Throws, naming the file, on a bad header or IFD chain; page problems
 * (unsupported layout, truncated strips) are thrown by `page` / `readPage`, naming the page.
 */
export function openTiff(input: Uint8Array, name = "tiff"): TiffStack {
  const bytes = plainBytes(input);
  const offsets = tiffPageOffsets(bytes, name);
  const buffer = exactBuffer(bytes);
  let ifds: Ifd[];
  try {
    ifds = UTIF.decode(buffer, { parseMN: false, debug: false });
  } catch (error) {
    throw new Error(`${name}: corrupt TIFF directory (${messageOf(error)})`);
  }
  if (ifds.length !== offsets.length) {
    throw new Error(`${name}: corrupt TIFF directory (${offsets.length} IFDs in the chain, ${ifds.length} readable)`);
  }
  const littleEndian = bytes[0] === 0x49;
  const infos: (TiffPageInfo | undefined)[] = new Array(offsets.length);
  const check = (index: number): void => {
    if (!Number.isInteger(index) || index < 0 || index >= offsets.length) {
      throw new RangeError(`${name}: page ${index} does not exist (the file has ${offsets.length})`);
    }
  };
  const page = (index: number): TiffPageInfo => {
    check(index);
    return (infos[index] ??= pageInfo(ifds[index], `${name}: page ${index}`));
  };
  return {
    name,
    count: offsets.length,
    page,
    readPage(index: number): Frame {
      const info = page(index);
      const where = `${name}: page ${index}`;
      checkStrips(ifds[index], info, bytes.length, where);
      // Decode into a shallow copy so the decoded bytes are not cached on the shared IFD.
      const ifd: Ifd = { ...ifds[index] };
      try {
        UTIF.decodeImage(buffer, ifd, ifds);
      } catch (error) {
        throw new Error(`${where}: image data is corrupt (${messageOf(error)})`);
      }
      const raw = ifd["data"] as Uint8Array | undefined;
      const need = Math.ceil((info.width * info.samplesPerPixel * info.bitsPerSample) / 8) * info.height;
      if (raw === undefined || raw.length < need) {
        throw new Error(`${where}: image data is truncated or corrupt (decoded ${raw?.length ?? 0} bytes, expected ${need})`);
      }
      return toFrame(raw, info, littleEndian);
    },
  };
}

/** Decodes every page of a TIFF in memory. */
export function decodeTiff(bytes: Uint8Array, name = "tiff"): Frame[] {
  const stack = openTiff(bytes, name);
  return Array.from({ length: stack.count }, (_, k) => stack.readPage(k));
}
