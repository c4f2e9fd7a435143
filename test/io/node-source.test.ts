// Node-only: files on disk.
import { closeSync, ftruncateSync, mkdirSync, mkdtempSync, openSync, rmSync, writeFileSync, writeSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { encode as fastPngEncode } from "fast-png";
import { listFrameFiles, openFrameFiles } from "../../src/io/node-source";
import { sourceFromBytes } from "../../src/io/source";
import { buildTiff, sampleBytes } from "./tiff-bytes";

let dir = "";
const png = (v: number) => fastPngEncode({ width: 2, height: 2, data: Uint8Array.from([v, v, v, v]), depth: 8, channels: 1 }); // encoder: fast-png

/** A .npy header per numpy.lib.format (version 1.0), padded to 128 bytes. */
function npyHeader(dict: string): Uint8Array {
  const text = dict.padEnd(128 - 10 - 1, " ") + "\n";
  const out = new Uint8Array(128);
  out.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0, text.length & 255, text.length >> 8]);
  out.set(new TextEncoder().encode(text), 10);
  return out;
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "domtopo-io-"));
  const movie = join(dir, "movie");
  mkdirSync(movie);
  for (const k of [10, 2, 1, 33]) writeFileSync(join(movie, `frame${k}.png`), png(k));
  writeFileSync(join(movie, "field.csv"), "H (mT)\n1\n2\n10\n33\n");
  writeFileSync(join(movie, ".DS_Store"), "junk");
  writeFileSync(join(dir, "stack.tif"), buildTiff([0, 1, 2].map((k) => ({ width: 2, height: 1, bitsPerSample: 16, strips: [sampleBytes([k, 65535 - k], "u16")] }))));
  writeFileSync(join(dir, "broken.png"), "not really a png");
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

describe("frame sources over files", () => {
  it("lists a folder's frames in natural order, skipping hidden files and tables", () => {
    const files = listFrameFiles(join(dir, "movie")).map((p) => p.slice(dir.length + 1));
    expect(files).toEqual(["movie/frame1.png", "movie/frame2.png", "movie/frame10.png", "movie/frame33.png"]);
  });

  it("expands a file-name pattern in natural order", () => {
    const files = listFrameFiles(join(dir, "movie", "frame[12]*.png")).map((p) => p.slice(dir.length + 1));
    expect(files).toEqual(["movie/frame1.png", "movie/frame2.png", "movie/frame10.png"]);
  });

  it("reads frame k of a folder movie and describes it by its file", async () => {
    const source = openFrameFiles(join(dir, "movie"));
    expect(source.count).toBe(4);
    expect(source.describe(2)).toBe(join(dir, "movie", "frame10.png"));
    expect(Array.from((await source.read(2)).data)).toEqual([10, 10, 10, 10]);
  });

  it("maps frame numbers to the pages of a TIFF stack after the folder's files", async () => {
    const source = openFrameFiles([join(dir, "movie", "frame1.png"), join(dir, "stack.tif")]);
    expect(source.count).toBe(4);
    expect(source.describe(3)).toBe(`${join(dir, "stack.tif")} page 2`);
    expect(Array.from((await source.read(3)).data)).toEqual([2, 65533]);
    expect(Array.from((await source.read(1)).data)).toEqual([0, 65535]);
  });

  it("reads inputs handed over as Node Buffers that sit inside a larger shared memory block", async () => {
    const pool = Buffer.alloc(4096, 0xaa);
    const tif = buildTiff([{ width: 2, height: 1, bitsPerSample: 16, strips: [sampleBytes([5, 6], "u16")] }]);
    const pngBytes = png(9);
    pool.set(tif, 100);
    pool.set(pngBytes, 1000);
    const source = sourceFromBytes([
      { name: "pooled.tif", bytes: pool.subarray(100, 100 + tif.length) },
      { name: "pooled.png", bytes: pool.subarray(1000, 1000 + pngBytes.length) },
    ]);
    expect(Array.from((await source.read(0)).data)).toEqual([5, 6]);
    expect(Array.from((await source.read(1)).data)).toEqual([9, 9, 9, 9]);
  });

  it("counts a file of unknown content as one frame that fails when read, naming it", async () => {
    const one = openFrameFiles(join(dir, "broken.png"));
    expect(one.count).toBe(1);
    await expect(one.read(0)).rejects.toThrow(`${join(dir, "broken.png")}: not a PNG, TIFF or .npy file by its first bytes`);
    const all = openFrameFiles(dir);
    const k = Array.from({ length: all.count }, (_, i) => all.describe(i)).findIndex((d) => d.includes("broken.png"));
    expect(k).toBeGreaterThanOrEqual(0);
    await expect(all.read(k)).rejects.toThrow(/broken\.png: not a PNG, TIFF or \.npy file/);
  });

  it("reads the last frame of a 2.4 GiB .npy stack by positioned reads, never loading the file", async () => {
    // 40000 frames of 256 x 256 u1 (2.44 GiB, larger than fs.readFileSync accepts); the file is
    // sparse except for the header and the last frame.
    const path = join(dir, "huge.npy");
    const frameBytes = 256 * 256;
    const frames = 40000;
    const fd = openSync(path, "w");
    try {
      writeSync(fd, npyHeader("{'descr': '|u1', 'fortran_order': False, 'shape': (40000, 256, 256), }"), 0, 128, 0);
      ftruncateSync(fd, 128 + frames * frameBytes);
      const last = new Uint8Array(frameBytes).map((_, i) => i % 251);
      writeSync(fd, last, 0, frameBytes, 128 + (frames - 1) * frameBytes);
    } finally {
      closeSync(fd);
    }
    const source = openFrameFiles(path);
    expect(source.count).toBe(frames);
    const frame = await source.read(frames - 1);
    expect(frame.data[0]).toBe(0);
    expect(frame.data[300]).toBe(300 % 251);
    expect(Array.from((await source.read(5)).data.subarray(0, 3))).toEqual([0, 0, 0]);
    rmSync(path);
  });

  it("names the .npy file, the frame and the offsets when the stack is truncated", async () => {
    const path = join(dir, "short.npy");
    const body = new Uint8Array(3 * 4 * 2 - 5); // (3, 2, 2) u2 needs 24 bytes of data; 19 present
    writeFileSync(path, Buffer.concat([npyHeader("{'descr': '<u2', 'fortran_order': False, 'shape': (3, 2, 2), }"), body]));
    const source = openFrameFiles(path);
    await expect(source.read(2)).rejects.toThrow(`${path}: frame 2: file is truncated (expected 8 bytes at offset 144, file has 147)`);
  });
});
