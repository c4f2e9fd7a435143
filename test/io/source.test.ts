import { describe, expect, it } from "vitest";
import { encode as fastPngEncode } from "fast-png";
import { encodeNpy } from "../../src/io/npy";
import { detectFormat, sourceFromBytes } from "../../src/io/source";
import { buildTiff, sampleBytes } from "./tiff-bytes";

// Inputs: PNG by fast-png (independent encoder), TIFF hand-assembled per TIFF 6.0
// (tiff-bytes.ts), .npy by our writer (itself checked byte by byte in npy.test.ts).
const png = (v: number) => fastPngEncode({ width: 2, height: 1, data: Uint8Array.from([v, v + 1]), depth: 8, channels: 1 });
const tiff = buildTiff([0, 1, 2].map((k) => ({ width: 2, height: 1, bitsPerSample: 16, strips: [sampleBytes([100 * k, 100 * k + 1], "u16")] })));
const npy = encodeNpy([0, 1].map((k) => ({ width: 2, height: 1, data: Float32Array.from([k + 0.5, k + 0.75]) })));

describe("frame sources over bytes in memory", () => {
  it("finds the format from magic bytes, not from the name", () => {
    expect(detectFormat(png(1))).toBe("png");
    expect(detectFormat(tiff)).toBe("tiff");
    expect(detectFormat(npy)).toBe("npy");
    expect(detectFormat(new TextEncoder().encode("H,mT\n"))).toBeNull();
    const source = sourceFromBytes([{ name: "actually-a-tiff.png", bytes: tiff }]);
    expect(source.count).toBe(3);
    expect(source.describe(1)).toBe("actually-a-tiff.png page 1");
  });

  it("numbers frames through stills, TIFF pages and .npy frames in the order given", async () => {
    const source = sourceFromBytes([
      { name: "a.png", bytes: png(1) },
      { name: "stack.tif", bytes: tiff },
      { name: "b.png", bytes: png(7) },
      { name: "cube.npy", bytes: npy },
    ]);
    expect(source.count).toBe(7);
    expect([0, 1, 3, 4, 5, 6].map((i) => source.describe(i))).toEqual(["a.png", "stack.tif page 0", "stack.tif page 2", "b.png", "cube.npy frame 0", "cube.npy frame 1"]);
    expect(Array.from((await source.read(3)).data)).toEqual([200, 201]);
    expect(Array.from((await source.read(4)).data)).toEqual([7, 8]);
    expect(Array.from((await source.read(6)).data)).toEqual([1.5, 1.75]);
  });

  it("refuses an input of unknown content, naming it", () => {
    expect(() => sourceFromBytes([{ name: "field.csv", bytes: new TextEncoder().encode("H\n1\n") }])).toThrow("field.csv: not a PNG, TIFF or .npy file by its first bytes");
  });

  it("rejects a read out of range and a damaged frame with errors that name them", async () => {
    const bad = png(3).slice();
    bad[bad.length - 20] ^= 0xff;
    const source = sourceFromBytes([
      { name: "ok.png", bytes: png(1) },
      { name: "bad.png", bytes: bad },
    ]);
    await expect(source.read(2)).rejects.toThrow("frame 2 is out of range (the source has 2 frames)");
    await expect(source.read(1)).rejects.toThrow(/^bad\.png: /);
  });
});
