import { deflateSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { countTiffPages, decodeTiff, isTiff, openTiff } from "../../src/io/tiff";
import { seeded } from "./helpers";
import { buildTiff, lzwLiterals, packBits, sampleBytes } from "./tiff-bytes";

// Every TIFF here is hand-assembled from the TIFF 6.0 specification (see tiff-bytes.ts);
// Deflate strips are compressed by Node's zlib (an independent encoder), PackBits and LZW by the
// section 9 and section 13 rules written out in tiff-bytes.ts.

function values(n: number, seed: number, max: number): number[] {
  const rand = seeded(seed);
  return Array.from({ length: n }, () => Math.floor(rand() * max));
}

describe("TIFF pages", () => {
  it("reads an 8-bit grey page as Uint8Array", () => {
    const v = values(5 * 3, 1, 256);
    const file = buildTiff([{ width: 5, height: 3, bitsPerSample: 8, strips: [sampleBytes(v, "u8")] }]);
    expect(isTiff(file)).toBe(true);
    const [frame] = decodeTiff(file, "one.tif");
    expect(frame).toMatchObject({ width: 5, height: 3 });
    expect(frame.data).toBeInstanceOf(Uint8Array);
    expect(Array.from(frame.data)).toEqual(v);
  });

  it("reads 16-bit grey in both byte orders as Uint16Array", () => {
    const v = values(4 * 4, 2, 65536);
    for (const little of [true, false]) {
      const file = buildTiff([{ width: 4, height: 4, bitsPerSample: 16, strips: [sampleBytes(v, "u16", little)] }], little);
      const [frame] = decodeTiff(file, little ? "le.tif" : "be.tif");
      expect(frame.data).toBeInstanceOf(Uint16Array);
      expect(Array.from(frame.data)).toEqual(v);
    }
  });

  it("reads 32-bit unsigned and 32-bit float pages in both byte orders as Float32Array", () => {
    const u = [0, 1, 70000, 16777216];
    const f = [0.5, -1.25, NaN, 3e6];
    for (const little of [true, false]) {
      const file = buildTiff(
        [
          { width: 2, height: 2, bitsPerSample: 32, strips: [sampleBytes(u, "u32", little)] },
          { width: 2, height: 2, bitsPerSample: 32, sampleFormat: 3, strips: [sampleBytes(f, "f32", little)] },
        ],
        little,
      );
      const [a, b] = decodeTiff(file, "wide.tif");
      expect(a.data).toBeInstanceOf(Float32Array);
      expect(Array.from(a.data)).toEqual(u);
      expect(b.data).toBeInstanceOf(Float32Array);
      const got = Array.from(b.data);
      expect([got[0], got[1], got[3]]).toEqual([0.5, -1.25, 3e6]);
      expect(Number.isNaN(got[2])).toBe(true); // NaN is data at this layer
    }
  });

  it("reads signed 16-bit samples with their sign", () => {
    const file = buildTiff([{ width: 3, height: 1, bitsPerSample: 16, sampleFormat: 2, strips: [sampleBytes([-5, 0, 32767], "i16")] }]);
    expect(Array.from(decodeTiff(file)[0].data)).toEqual([-5, 0, 32767]);
  });

  it("turns 8-bit RGB into Rec. 709 luma", () => {
    const rgb = [255, 0, 0, 0, 255, 0, 0, 0, 255, 10, 10, 10];
    const file = buildTiff([{ width: 4, height: 1, bitsPerSample: 8, samplesPerPixel: 3, photometric: 2, strips: [sampleBytes(rgb, "u8")] }]);
    expect(Array.from(decodeTiff(file, "rgb.tif")[0].data)).toEqual([54, 182, 18, 10]); // BT.709: 0.2126, 0.7152, 0.0722
  });

  it("inverts WhiteIsZero grey to BlackIsZero", () => {
    const file = buildTiff([{ width: 3, height: 1, bitsPerSample: 8, photometric: 0, strips: [sampleBytes([0, 1, 255], "u8")] }]);
    expect(Array.from(decodeTiff(file)[0].data)).toEqual([255, 254, 0]); // TIFF 6.0, PhotometricInterpretation 0
  });

  it("reads a page split into several strips", () => {
    const v = values(3 * 5, 3, 256);
    const strips = [sampleBytes(v.slice(0, 6), "u8"), sampleBytes(v.slice(6, 12), "u8"), sampleBytes(v.slice(12), "u8")];
    const file = buildTiff([{ width: 3, height: 5, bitsPerSample: 8, rowsPerStrip: 2, strips }]);
    expect(Array.from(decodeTiff(file)[0].data)).toEqual(v);
  });

  it("reads Deflate and PackBits compressed strips", () => {
    const v = [...values(20, 4, 65536), 7, 7, 7, 7];
    const raw = sampleBytes(v, "u16");
    const deflated = new Uint8Array(deflateSync(raw)); // encoder: Node zlib (zlib stream, compression 8)
    const packed = packBits(sampleBytes([9, 9, 9, 9, 9, 1, 2, 3], "u8"));
    const file = buildTiff([
      { width: 6, height: 4, bitsPerSample: 16, compression: 8, strips: [deflated] },
      { width: 4, height: 2, bitsPerSample: 8, compression: 32773, strips: [packed] },
    ]);
    const [a, b] = decodeTiff(file, "z.tif");
    expect(Array.from(a.data)).toEqual(v);
    expect(Array.from(b.data)).toEqual([9, 9, 9, 9, 9, 1, 2, 3]);
  });
});

describe("TIFF LZW strips", () => {
  it("reads an LZW strip of literal codes", () => {
    const v = values(6 * 5, 5, 256);
    const file = buildTiff([{ width: 6, height: 5, bitsPerSample: 8, compression: 5, strips: [lzwLiterals(Uint8Array.from(v))] }]);
    expect(Array.from(decodeTiff(file, "lzw.tif")[0].data)).toEqual(v);
  });
});

describe("TIFF stacks", () => {
  const page = (k: number) => Array.from({ length: 6 }, (_, i) => 1000 * k + i);

  it("reads page 3 of a 16-bit stack without decoding the others", () => {
    // Pages 0-2 point their strips past the end of the file: decoding any of them fails, so a
    // successful read of page 3 shows that the others were not decoded.
    const specs = [0, 1, 2, 3, 4].map((k) => ({
      width: 3,
      height: 2,
      bitsPerSample: 16,
      strips: [sampleBytes(page(k), "u16")],
      stripOffsetsOverride: k < 3 ? [1 << 20] : undefined,
    }));
    const stack = openTiff(buildTiff(specs), "stack.tif");
    expect(stack.count).toBe(5);
    expect(Array.from(stack.readPage(3).data)).toEqual(page(3));
    expect(() => stack.readPage(1)).toThrow(/stack\.tif: page 1: file is truncated \(strip 0 at offset 1048576 needs 12 bytes/);
  });

  it("counts pages from the IFD chain alone", () => {
    const file = buildTiff([0, 1, 2, 3].map((k) => ({ width: 3, height: 2, bitsPerSample: 16, strips: [sampleBytes(page(k), "u16")] })));
    expect(countTiffPages(file, "c.tif")).toBe(4);
    const stack = openTiff(file, "c.tif");
    expect(stack.page(2)).toMatchObject({ width: 3, height: 2, bitsPerSample: 16, sampleFormat: "uint", compression: 1 });
    expect(decodeTiff(file).map((f) => Array.from(f.data))).toEqual([0, 1, 2, 3].map(page));
  });
});

describe("TIFF errors", () => {
  const good = buildTiff([
    { width: 2, height: 2, bitsPerSample: 8, strips: [sampleBytes([1, 2, 3, 4], "u8")] },
    { width: 2, height: 2, bitsPerSample: 8, strips: [sampleBytes([5, 6, 7, 8], "u8")] },
  ]);

  it("names the file when the header is not TIFF or is BigTIFF", () => {
    expect(() => openTiff(Uint8Array.from([0x50, 0x4b, 3, 4, 0, 0, 0, 0]), "zip.tif")).toThrow(/zip\.tif: not a TIFF file/);
    expect(() => openTiff(Uint8Array.from([0x49, 0x49, 43, 0, 8, 0, 0, 0]), "big.tif")).toThrow(/big\.tif: BigTIFF files are not supported/);
  });

  it("names the page whose IFD lies past the end of a truncated file", () => {
    const cut = good.subarray(0, good.length - 30);
    expect(() => openTiff(cut, "cut.tif")).toThrow(/cut\.tif: page 1: file is truncated/);
  });

  it("reports an IFD chain that loops", () => {
    const looped = good.slice();
    const view = new DataView(looped.buffer);
    const first = view.getUint32(4, true);
    const entries = view.getUint16(first, true);
    view.setUint32(first + 2 + 12 * entries, first, true); // next IFD = this IFD
    expect(() => openTiff(looped, "loop.tif")).toThrow(/loop\.tif: page 1: IFD chain loops back to offset/);
  });

  it("names the page and the layout it cannot read", () => {
    const file = buildTiff([
      { width: 2, height: 1, bitsPerSample: 8, strips: [sampleBytes([1, 2], "u8")] },
      { width: 2, height: 1, bitsPerSample: 12, strips: [new Uint8Array(3)] },
    ]);
    const stack = openTiff(file, "odd.tif");
    expect(Array.from(stack.readPage(0).data)).toEqual([1, 2]);
    expect(() => stack.readPage(1)).toThrow(/odd\.tif: page 1: 12-bit uint samples are not supported/);
    expect(() => stack.readPage(2)).toThrow(/odd\.tif: page 2 does not exist \(the file has 2\)/);
  });

  it("names the page whose Deflate data is corrupt", () => {
    const garbage = Uint8Array.from([0x78, 0x9c, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0, 0, 0, 0]);
    const file = buildTiff([
      { width: 2, height: 1, bitsPerSample: 8, strips: [sampleBytes([1, 2], "u8")] },
      { width: 4, height: 4, bitsPerSample: 8, compression: 8, strips: [garbage] },
    ]);
    expect(() => openTiff(file, "z.tif").readPage(1)).toThrow(/^z\.tif: page 1: image data is corrupt/);
  });

  it("names the page whose strips hold fewer bytes than its size needs", () => {
    const file = buildTiff([{ width: 4, height: 4, bitsPerSample: 8, rowsPerStrip: 2, strips: [new Uint8Array(8), new Uint8Array(5)] }]);
    expect(() => openTiff(file, "short.tif").readPage(0)).toThrow(/short\.tif: page 0: strips hold 13 bytes, the page needs 16/);
  });
});
