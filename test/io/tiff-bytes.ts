// TIFF files assembled byte by byte from the TIFF 6.0 specification (Adobe, 1992): an 8-byte
// header ("II" or "MM", 42, offset of the first IFD), then per page its strips followed by its
// IFD: a 2-byte entry count, 12-byte entries (tag, type, count, value or offset) in ascending tag
// order, and the 4-byte offset of the next IFD (0 after the last). Values of 4 bytes or less sit
// in the entry, left-justified; longer ones follow the IFD.

export interface TiffPageSpec {
  width: number;
  height: number;
  bitsPerSample: number;
  samplesPerPixel?: number;
  /** 1 unsigned, 2 signed, 3 float. */
  sampleFormat?: number;
  /** 0 WhiteIsZero, 1 BlackIsZero, 2 RGB. */
  photometric?: number;
  /** 1 none, 8 Deflate, 32773 PackBits. */
  compression?: number;
  rowsPerStrip?: number;
  /** Strip bytes as stored (already compressed), one entry per strip. */
  strips: Uint8Array[];
  /** Overrides of the stored strip offsets (to point past the end of the file). */
  stripOffsetsOverride?: number[];
}

const SHORT = 3;
const LONG = 4;

interface Entry {
  tag: number;
  type: number;
  values: number[];
}

export function buildTiff(pages: readonly TiffPageSpec[], littleEndian = true): Uint8Array {
  const bytes: number[] = [];
  const put16 = (v: number, at?: number) => {
    const b = littleEndian ? [v & 255, (v >>> 8) & 255] : [(v >>> 8) & 255, v & 255];
    if (at === undefined) bytes.push(...b);
    else b.forEach((x, i) => (bytes[at + i] = x));
  };
  const put32 = (v: number, at?: number) => {
    const b = littleEndian
      ? [v & 255, (v >>> 8) & 255, (v >>> 16) & 255, (v >>> 24) & 255]
      : [(v >>> 24) & 255, (v >>> 16) & 255, (v >>> 8) & 255, v & 255];
    if (at === undefined) bytes.push(...b);
    else b.forEach((x, i) => (bytes[at + i] = x));
  };
  bytes.push(...(littleEndian ? [0x49, 0x49] : [0x4d, 0x4d]));
  put16(42);
  let linkAt = bytes.length;
  put32(0);
  for (const page of pages) {
    const spp = page.samplesPerPixel ?? 1;
    const stripOffsets: number[] = [];
    for (const strip of page.strips) {
      if (bytes.length % 2) bytes.push(0); // word-align (TIFF 6.0: offsets should be even)
      stripOffsets.push(bytes.length);
      bytes.push(...strip);
    }
    if (bytes.length % 2) bytes.push(0);
    const entries: Entry[] = [
      { tag: 256, type: LONG, values: [page.width] },
      { tag: 257, type: LONG, values: [page.height] },
      { tag: 258, type: SHORT, values: Array(spp).fill(page.bitsPerSample) },
      { tag: 259, type: SHORT, values: [page.compression ?? 1] },
      { tag: 262, type: SHORT, values: [page.photometric ?? 1] },
      { tag: 273, type: LONG, values: page.stripOffsetsOverride ?? stripOffsets },
      { tag: 277, type: SHORT, values: [spp] },
      { tag: 278, type: LONG, values: [page.rowsPerStrip ?? page.height] },
      { tag: 279, type: LONG, values: page.strips.map((s) => s.length) },
      { tag: 284, type: SHORT, values: [1] },
      { tag: 339, type: SHORT, values: Array(spp).fill(page.sampleFormat ?? 1) },
    ];
    const ifdAt = bytes.length;
    put32(ifdAt, linkAt);
    put16(entries.length);
    const extra: { entryAt: number; entry: Entry }[] = [];
    for (const e of entries) {
      put16(e.tag);
      put16(e.type);
      put32(e.values.length);
      const size = (e.type === SHORT ? 2 : 4) * e.values.length;
      if (size <= 4) {
        const at = bytes.length;
        put32(0);
        e.values.forEach((v, i) => (e.type === SHORT ? put16(v, at + 2 * i) : put32(v, at)));
      } else {
        extra.push({ entryAt: bytes.length, entry: e });
        put32(0);
      }
    }
    linkAt = bytes.length;
    put32(0);
    for (const { entryAt, entry } of extra) {
      put32(bytes.length, entryAt);
      for (const v of entry.values) (entry.type === SHORT ? put16 : put32)(v);
    }
  }
  return Uint8Array.from(bytes);
}

/** Samples as stored in a strip, in the file's byte order. */
export function sampleBytes(values: readonly number[], kind: "u8" | "u16" | "u32" | "i16" | "f32", littleEndian = true): Uint8Array {
  const size = kind === "u8" ? 1 : kind === "u16" || kind === "i16" ? 2 : 4;
  const out = new Uint8Array(values.length * size);
  const view = new DataView(out.buffer);
  values.forEach((v, i) => {
    const at = i * size;
    if (kind === "u8") view.setUint8(at, v);
    else if (kind === "u16") view.setUint16(at, v, littleEndian);
    else if (kind === "i16") view.setInt16(at, v, littleEndian);
    else if (kind === "u32") view.setUint32(at, v, littleEndian);
    else view.setFloat32(at, v, littleEndian);
  });
  return out;
}

/**
 * PackBits (TIFF 6.0, section 9): a header byte n in 0..127 copies the next n + 1 bytes
 * literally; n in -127..-1 repeats the next byte 1 - n times.
 */
export function packBits(data: Uint8Array): Uint8Array {
  const out: number[] = [];
  let i = 0;
  while (i < data.length) {
    let run = 1;
    while (i + run < data.length && data[i + run] === data[i] && run < 128) run++;
    if (run >= 3) {
      out.push((1 - run) & 255, data[i]);
      i += run;
      continue;
    }
    let end = i;
    while (end < data.length && end - i < 128) {
      if (end + 2 < data.length && data[end] === data[end + 1] && data[end] === data[end + 2]) break;
      end++;
    }
    out.push(end - i - 1, ...data.subarray(i, end));
    i = end;
  }
  return Uint8Array.from(out);
}

/**
 * LZW (TIFF 6.0, section 13) with literal codes only: ClearCode 256, one 9-bit code per byte,
 * EndOfInformation 257, packed most significant bit first. Valid while fewer than 254 codes
 * follow a ClearCode (the code width stays 9 bits).
 */
export function lzwLiterals(data: Uint8Array): Uint8Array {
  if (data.length > 250) throw new RangeError("lzwLiterals keeps to 9-bit codes: at most 250 bytes");
  const codes = [256, ...data, 257];
  const out = new Uint8Array(Math.ceil((codes.length * 9) / 8));
  let bit = 0;
  for (const code of codes) {
    for (let b = 8; b >= 0; b--, bit++) if ((code >> b) & 1) out[bit >> 3] |= 0x80 >> (bit & 7);
  }
  return out;
}
