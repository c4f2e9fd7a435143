// Test inputs built byte by byte from the published format descriptions (Node-only helpers).
import { uniformSource } from "../../src/demo/random";
import { crc32, deflateSync } from "node:zlib";

/** Seeded uniform numbers in [0, 1): the project's mulberry32 (src/demo/random.ts). */
export const seeded = uniformSource;

export function concat(parts: readonly Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}

function be32(v: number): Uint8Array {
  return new Uint8Array([(v >>> 24) & 255, (v >>> 16) & 255, (v >>> 8) & 255, v & 255]);
}
function be16(v: number): Uint8Array {
  return new Uint8Array([(v >>> 8) & 255, v & 255]);
}

/** One PNG chunk: length, type, data, CRC-32 over type + data (PNG spec, 5.3). */
export function pngChunk(type: string, data: Uint8Array): Uint8Array {
  const typeBytes = new Uint8Array([...type].map((c) => c.charCodeAt(0)));
  const crc = crc32(concat([typeBytes, data]));
  return concat([be32(data.length), typeBytes, data, be32(crc)]);
}

export const PNG_SIGNATURE = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

/** zlib stream of 8-bit scanlines, each prefixed by filter type 0 (PNG spec, 7.3 and 9). */
export function scanlines(width: number, height: number, samples: ArrayLike<number>, channels = 1): Uint8Array {
  const row = width * channels;
  const raw = new Uint8Array((row + 1) * height);
  for (let y = 0; y < height; y++) for (let x = 0; x < row; x++) raw[y * (row + 1) + 1 + x] = samples[y * row + x];
  return new Uint8Array(deflateSync(raw));
}

export interface ApngFrameSpec {
  x: number;
  y: number;
  width: number;
  height: number;
  /** 8-bit samples, `channels` per pixel. */
  samples: ArrayLike<number>;
  dispose: 0 | 1 | 2;
  blend: 0 | 1;
}

/**
 * An 8-bit grey (channels 1, colour type 0) or grey + alpha (channels 2, colour type 4) APNG assembled from the APNG specification: IHDR, acTL, then per frame an fcTL
 * (sequence, size, offset, delay 1/10 s, dispose, blend) and its data: IDAT for frame 0 (so the
 * default image is frame 0), fdAT (sequence number + zlib data) for the others; then IEND.
 */
export function buildGreyApng(width: number, height: number, frames: readonly ApngFrameSpec[], channels: 1 | 2 = 1): Uint8Array {
  const ihdr = concat([be32(width), be32(height), new Uint8Array([8, channels === 1 ? 0 : 4, 0, 0, 0])]);
  const parts = [PNG_SIGNATURE, pngChunk("IHDR", ihdr), pngChunk("acTL", concat([be32(frames.length), be32(0)]))];
  let sequence = 0;
  frames.forEach((f, k) => {
    const fctl = concat([
      be32(sequence++), be32(f.width), be32(f.height), be32(f.x), be32(f.y),
      be16(1), be16(10), new Uint8Array([f.dispose, f.blend]),
    ]);
    parts.push(pngChunk("fcTL", fctl));
    const z = scanlines(f.width, f.height, f.samples, channels);
    parts.push(k === 0 ? pngChunk("IDAT", z) : pngChunk("fdAT", concat([be32(sequence++), z])));
  });
  parts.push(pngChunk("IEND", new Uint8Array(0)));
  return concat(parts);
}
