import { describe, expect, it } from "vitest";
import { decode as fastPngDecode, encode as fastPngEncode } from "fast-png";
import { decodeApng, decodeApngFrame, decodePng, encodePng, encodeRgbaApng, encodeRgbaPng, inspectPng } from "../../src/io/png";
import { buildGreyApng, seeded } from "./helpers";

function randomBytes(n: number, seed: number, max = 256): number[] {
  const rand = seeded(seed);
  return Array.from({ length: n }, () => Math.floor(rand() * max));
}

describe("PNG stills", () => {
  it("reads an 8-bit grey PNG as Uint8Array samples unchanged", () => {
    const grey = Uint8Array.from(randomBytes(7 * 5, 1));
    const bytes = fastPngEncode({ width: 7, height: 5, data: grey, depth: 8, channels: 1 }); // encoder: fast-png
    const frame = decodePng(bytes, "grey8.png");
    expect(frame.width).toBe(7);
    expect(frame.height).toBe(5);
    expect(frame.data).toBeInstanceOf(Uint8Array);
    expect(Array.from(frame.data)).toEqual(Array.from(grey));
  });

  it("keeps a 16-bit grey PNG at 16 bits, most significant byte first as the PNG spec stores it", () => {
    const grey = Uint16Array.from(randomBytes(6 * 4, 2, 65536));
    grey[0] = 0x0102; // MSB 1, LSB 2: read back as 258 only if byte order is right
    const bytes = fastPngEncode({ width: 6, height: 4, data: grey, depth: 16, channels: 1 }); // encoder: fast-png
    const frame = decodePng(bytes, "grey16.png");
    expect(frame.data).toBeInstanceOf(Uint16Array);
    expect(frame.data[0]).toBe(258);
    expect(Array.from(frame.data)).toEqual(Array.from(grey));
  });

  it("reads an Adam7-interlaced 8-bit grey PNG in raster order", () => {
    const grey = Uint8Array.from(randomBytes(11 * 9, 3));
    const bytes = fastPngEncode({ width: 11, height: 9, data: grey, depth: 8, channels: 1 }, { interlace: "Adam7" }); // encoder: fast-png
    expect(Array.from(decodePng(bytes, "adam7.png").data)).toEqual(Array.from(grey));
  });

  it("drops alpha from a grey + alpha PNG and keeps the grey samples", () => {
    const ga = Uint8Array.from(randomBytes(4 * 3 * 2, 4));
    const bytes = fastPngEncode({ width: 4, height: 3, data: ga, depth: 8, channels: 2 }); // encoder: fast-png
    const frame = decodePng(bytes, "ga.png");
    expect(Array.from(frame.data)).toEqual(Array.from({ length: 12 }, (_, i) => ga[2 * i]));
  });

  it("turns RGB into Rec. 709 luma, rounded to the nearest integer", () => {
    // Pure primaries: luma = 255 x weight; Rec. ITU-R BT.709-6, item 3.2: 0.2126 R + 0.7152 G + 0.0722 B.
    const rgb = Uint8Array.from([255, 0, 0, 0, 255, 0, 0, 0, 255, 200, 200, 200]);
    const bytes = fastPngEncode({ width: 4, height: 1, data: rgb, depth: 8, channels: 3 }); // encoder: fast-png
    const frame = decodePng(bytes, "rgb.png");
    expect(frame.data).toBeInstanceOf(Uint8Array);
    expect(Array.from(frame.data)).toEqual([54, 182, 18, 200]); // 54.213, 182.376, 18.411, grey stays grey
  });

  it("turns 16-bit RGBA into 16-bit luma and ignores alpha", () => {
    const rgba = Uint16Array.from([65535, 0, 0, 1000, 0, 0, 65535, 0]);
    const bytes = fastPngEncode({ width: 2, height: 1, data: rgba, depth: 16, channels: 4 }); // encoder: fast-png
    const frame = decodePng(bytes, "rgba16.png");
    expect(frame.data).toBeInstanceOf(Uint16Array);
    expect(Array.from(frame.data)).toEqual([Math.round(0.2126 * 65535), Math.round(0.0722 * 65535)]); // BT.709 weights
  });

  it("looks palette indices up and returns the luma of each colour", () => {
    const palette = [
      [0, 0, 0],
      [255, 255, 255],
      [0, 255, 0],
    ];
    const indices = Uint8Array.from([0, 1, 2, 1, 0, 2]);
    const bytes = fastPngEncode({ width: 3, height: 2, data: indices, depth: 8, channels: 1, palette }); // encoder: fast-png (colour type 3)
    expect(inspectPng(bytes).colorType).toBe(3);
    const frame = decodePng(bytes, "pal.png");
    expect(Array.from(frame.data)).toEqual([0, 255, 182, 255, 0, 182]); // green: 0.7152 x 255 = 182.4 (BT.709)
  });

  it("scales 1-bit grey to 0 and 255", () => {
    const bits = Uint8Array.from([0b01101001, 0b10000000]); // 9 pixels packed MSB first (PNG spec, 7.2)
    const bytes = fastPngEncode({ width: 9, height: 1, data: bits, depth: 1, channels: 1 }); // encoder: fast-png
    expect(Array.from(decodePng(bytes, "bits.png").data)).toEqual([0, 255, 255, 0, 255, 0, 0, 255, 255]); // PNG spec 12.5: v x 255 / (2^d - 1)
  });
});

describe("PNG errors", () => {
  const good = fastPngEncode({ width: 8, height: 8, data: new Uint8Array(64).fill(9), depth: 8, channels: 1 }); // encoder: fast-png

  it("names the file when the signature is not PNG", () => {
    expect(() => decodePng(new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8, 9]), "notes.png")).toThrow(/notes\.png: not a PNG file/);
  });

  it("names the file and the chunk when the file is truncated", () => {
    const cut = good.subarray(0, good.length - 20);
    expect(() => decodePng(cut, "cut.png")).toThrow(/cut\.png: file is truncated \(chunk IDAT at offset 33 needs/);
  });

  it("reports a corrupt chunk by its CRC", () => {
    const bad = good.slice();
    bad[45] ^= 0xff; // inside the IDAT data: 8 signature + 25 IHDR + 8 IDAT length and type = byte 41 on
    expect(() => decodePng(bad, "flip.png")).toThrow(/flip\.png: chunk IDAT at offset 33 is corrupt \(CRC mismatch\)/);
  });
});

describe("APNG", () => {
  const W = 4;
  const H = 3;
  const base = Array.from({ length: W * H }, (_, i) => 10 + i);

  it("composites frames onto the canvas with dispose NONE, BACKGROUND and PREVIOUS", () => {
    // APNG spec, fcTL dispose_op: 0 NONE leaves the canvas, 1 BACKGROUND clears the region to
    // transparent black, 2 PREVIOUS restores the region to what it was before the frame.
    const bytes = buildGreyApng(W, H, [
      { x: 0, y: 0, width: W, height: H, samples: base, dispose: 0, blend: 0 },
      { x: 1, y: 1, width: 2, height: 1, samples: [200, 201], dispose: 2, blend: 0 },
      { x: 0, y: 0, width: 1, height: 1, samples: [99], dispose: 1, blend: 0 },
      { x: 3, y: 2, width: 1, height: 1, samples: [77], dispose: 0, blend: 0 },
    ]);
    expect(inspectPng(bytes).frameCount).toBe(4);
    const frames = decodeApng(bytes, "movie.png");
    expect(frames).toHaveLength(4);
    const expected1 = base.slice();
    expected1[5] = 200;
    expected1[6] = 201;
    expect(Array.from(frames[0].data)).toEqual(base);
    expect(Array.from(frames[1].data)).toEqual(expected1);
    const expected2 = base.slice(); // frame 1 was disposed to PREVIOUS
    expected2[0] = 99;
    expect(Array.from(frames[2].data)).toEqual(expected2);
    const expected3 = base.slice();
    expected3[0] = 0; // frame 2 was disposed to BACKGROUND
    expected3[11] = 77;
    expect(Array.from(frames[3].data)).toEqual(expected3);
    expect(Array.from(decodeApngFrame(bytes, 3, "movie.png").data)).toEqual(expected3);
  });

  it("blends a half-transparent grey + alpha frame OVER the canvas", () => {
    // Porter & Duff 1984 "over" with straight alpha, as the APNG spec prescribes for blend_op 1:
    // opaque 100 under 200 at alpha 128/255 gives (128/255) 200 + (1 - 128/255) 100 = 150.2 -> 150.
    const opaque = Array.from({ length: W * H }, () => [100, 255]).flat();
    const bytes = buildGreyApng(
      W,
      H,
      [
        { x: 0, y: 0, width: W, height: H, samples: opaque, dispose: 0, blend: 0 },
        { x: 0, y: 0, width: 1, height: 1, samples: [200, 128], dispose: 0, blend: 1 },
      ],
      2,
    );
    const frames = decodeApng(bytes, "blend.png");
    expect(frames[1].data[0]).toBe(150);
    expect(frames[1].data[1]).toBe(100);
  });

  it("reads a still PNG as a one-frame animation", () => {
    const bytes = fastPngEncode({ width: 2, height: 2, data: Uint8Array.from([1, 2, 3, 4]), depth: 8, channels: 1 }); // encoder: fast-png
    expect(decodeApng(bytes, "still.png").map((f) => Array.from(f.data))).toEqual([[1, 2, 3, 4]]);
  });

  it("names the frame whose region lies outside the canvas", () => {
    const bytes = buildGreyApng(W, H, [
      { x: 0, y: 0, width: W, height: H, samples: base, dispose: 0, blend: 0 },
      { x: 3, y: 0, width: 2, height: 1, samples: [1, 2], dispose: 0, blend: 0 },
    ]);
    expect(() => decodeApng(bytes, "wide.png")).toThrow(/wide\.png: frame 1: region 2 x 1 at \(3, 0\) lies outside the 4 x 3 canvas/);
  });
});

describe("PNG writers", () => {
  it("writes an 8-bit grey frame that an independent decoder reads back", () => {
    const grey = Uint8Array.from(randomBytes(5 * 4, 7));
    const png = encodePng({ width: 5, height: 4, data: grey });
    const back = fastPngDecode(png); // decoder: fast-png
    const greyBack = Array.from({ length: 20 }, (_, i) => back.data[i * back.channels]);
    expect(back.width).toBe(5);
    expect(greyBack).toEqual(Array.from(grey));
  });

  it("writes RGBA pixels that an independent decoder reads back exactly", () => {
    const rgba = Uint8Array.from(randomBytes(3 * 2 * 4, 8));
    const png = encodeRgbaPng(3, 2, rgba);
    const back = fastPngDecode(png); // decoder: fast-png
    expect(back.channels).toBe(4);
    expect(Array.from(back.data)).toEqual(Array.from(rgba));
  });

  it("writes an RGBA animation whose frames read back through decodeApng", () => {
    const a = new Uint8Array(2 * 2 * 4).fill(255);
    const b = a.slice();
    b.set([0, 0, 0, 255], 4);
    const frames = decodeApng(encodeRgbaApng(2, 2, [a, b], [100, 100]), "overlay.png");
    expect(frames.map((f) => Array.from(f.data))).toEqual([
      [255, 255, 255, 255],
      [255, 0, 255, 255],
    ]);
  });

  it("refuses to write a frame whose sample count does not match its size", () => {
    expect(() => encodePng({ width: 3, height: 3, data: new Uint8Array(8) })).toThrow(/expected 9 bytes for 3 x 3 x 1, got 8/);
    expect(() => encodePng({ width: 1, height: 1, data: new Float32Array(1) })).toThrow(/8-bit grey/);
  });
});
