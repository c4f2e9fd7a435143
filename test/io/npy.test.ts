import { describe, expect, it } from "vitest";
import type { ByteReader } from "../../src/io/bytes";
import { decodeNpy, encodeNpy, parseNpyHeader, readNpyFrame } from "../../src/io/npy";
import { concat } from "./helpers";

// .npy files assembled by hand from the format description in numpy.lib.format (NEP 1):
// "\x93NUMPY", major, minor, header length (uint16 LE for 1.0, uint32 LE for 2.0 / 3.0),
// the dict literal padded with spaces and ended by "\n", then the raw data.
function npyBytes(dict: string, data: Uint8Array, version: 1 | 2 | 3 = 1): Uint8Array {
  const prefix = version === 1 ? 10 : 12;
  const total = Math.ceil((prefix + dict.length + 1) / 64) * 64;
  const text = dict.padEnd(total - prefix - 1, " ") + "\n";
  const head = new Uint8Array(prefix);
  head.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, version, 0]);
  const view = new DataView(head.buffer);
  if (version === 1) view.setUint16(8, text.length, true);
  else view.setUint32(8, text.length, true);
  const dictBytes = new TextEncoder().encode(text);
  return concat([head, dictBytes, data]);
}

function bytesOf(values: readonly number[], setter: (v: DataView, at: number, x: number) => void, size: number): Uint8Array {
  const out = new Uint8Array(values.length * size);
  const view = new DataView(out.buffer);
  values.forEach((x, i) => setter(view, i * size, x));
  return out;
}

/** A reader that records which byte ranges were asked for. */
function recordingReader(bytes: Uint8Array): ByteReader & { reads: [number, number][] } {
  const reads: [number, number][] = [];
  return {
    size: bytes.length,
    reads,
    read(offset, length) {
      reads.push([offset, length]);
      return bytes.slice(offset, offset + length);
    },
  };
}

describe(".npy headers", () => {
  it("parses a version 1.0 header with a 2-D shape", () => {
    const file = npyBytes("{'descr': '|u1', 'fortran_order': False, 'shape': (2, 3), }", new Uint8Array(6));
    const h = parseNpyHeader(file, "a.npy");
    expect(h).toMatchObject({ version: [1, 0], dtype: "u1", fortranOrder: false, shape: [2, 3], frameCount: 1, width: 3, height: 2, dataOffset: 128 });
  });

  it("parses version 2.0 (4-byte header length) and 3.0 (UTF-8 header) files", () => {
    const data = new Uint8Array(4);
    expect(parseNpyHeader(npyBytes("{'descr': '|u1', 'fortran_order': False, 'shape': (2, 2), }", data, 2)).version).toEqual([2, 0]);
    expect(parseNpyHeader(npyBytes("{'descr': '|u1', 'fortran_order': False, 'shape': (2, 2), }", data, 3)).version).toEqual([3, 0]);
  });

  it("rejects a 1-D array, a structured dtype and an unknown version, naming the file", () => {
    const one = npyBytes("{'descr': '<f4', 'fortran_order': False, 'shape': (5,), }", new Uint8Array(20));
    expect(() => parseNpyHeader(one, "line.npy")).toThrow(/line\.npy: array has 1 dimensions/);
    const rec = npyBytes("{'descr': [('x', '<f4')], 'fortran_order': False, 'shape': (1, 1), }", new Uint8Array(4));
    expect(() => parseNpyHeader(rec, "rec.npy")).toThrow(/rec\.npy: header has no plain 'descr' string/);
    const c8 = npyBytes("{'descr': '<c8', 'fortran_order': False, 'shape': (1, 1), }", new Uint8Array(8));
    expect(() => parseNpyHeader(c8, "c.npy")).toThrow(/c\.npy: unsupported dtype '<c8'/);
    const v9 = npyBytes("{'descr': '|u1', 'fortran_order': False, 'shape': (1, 1), }", new Uint8Array(1));
    v9[6] = 9;
    expect(() => parseNpyHeader(v9, "v9.npy")).toThrow(/v9\.npy: unsupported \.npy format version 9\.0/);
    expect(() => parseNpyHeader(new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]), "x.npy")).toThrow(/x\.npy: not a NumPy \.npy file/);
  });
});

describe(".npy data", () => {
  it("reads u1 as Uint8Array and u2 (little-endian) as Uint16Array", () => {
    const u1 = npyBytes("{'descr': '|u1', 'fortran_order': False, 'shape': (2, 3), }", Uint8Array.from([1, 2, 3, 4, 5, 255]));
    const f1 = decodeNpy(u1, "u1.npy")[0];
    expect(f1.data).toBeInstanceOf(Uint8Array);
    expect(Array.from(f1.data)).toEqual([1, 2, 3, 4, 5, 255]);
    const u2 = npyBytes("{'descr': '<u2', 'fortran_order': False, 'shape': (1, 2), }", Uint8Array.from([0x02, 0x01, 0xff, 0xff]));
    const f2 = decodeNpy(u2, "u2.npy")[0];
    expect(f2.data).toBeInstanceOf(Uint16Array);
    expect(Array.from(f2.data)).toEqual([0x0102, 65535]); // '<' = least significant byte first (numpy.lib.format)
  });

  it("reads big-endian '>u2' and '>f8' with their bytes swapped", () => {
    const u2 = npyBytes("{'descr': '>u2', 'fortran_order': False, 'shape': (1, 2), }", Uint8Array.from([0x01, 0x02, 0x00, 0x07]));
    expect(Array.from(decodeNpy(u2, "be.npy")[0].data)).toEqual([0x0102, 7]);
    const f8 = npyBytes("{'descr': '>f8', 'fortran_order': False, 'shape': (1, 2), }", bytesOf([1.5, -2.25], (v, at, x) => v.setFloat64(at, x, false), 8));
    const frame = decodeNpy(f8, "be8.npy")[0];
    expect(frame.data).toBeInstanceOf(Float32Array);
    expect(Array.from(frame.data)).toEqual([1.5, -2.25]);
  });

  it("converts i1, i2 and f4 to Float32Array, keeping signs and NaN", () => {
    const i1 = npyBytes("{'descr': '|i1', 'fortran_order': False, 'shape': (1, 2), }", Uint8Array.from([0xff, 0x7f]));
    expect(Array.from(decodeNpy(i1)[0].data)).toEqual([-1, 127]);
    const i2 = npyBytes("{'descr': '<i2', 'fortran_order': False, 'shape': (1, 2), }", bytesOf([-300, 300], (v, at, x) => v.setInt16(at, x, true), 2));
    expect(Array.from(decodeNpy(i2)[0].data)).toEqual([-300, 300]);
    const f4 = npyBytes("{'descr': '<f4', 'fortran_order': False, 'shape': (1, 3), }", bytesOf([0.5, NaN, -1], (v, at, x) => v.setFloat32(at, x, true), 4));
    const data = Array.from(decodeNpy(f4, "nan.npy")[0].data);
    expect(data[0]).toBe(0.5);
    expect(Number.isNaN(data[1])).toBe(true); // NaN is data, not an error, at this layer
    expect(data[2]).toBe(-1);
  });

  it("reads '|b1' booleans as 0 and 1", () => {
    const b1 = npyBytes("{'descr': '|b1', 'fortran_order': False, 'shape': (1, 3), }", Uint8Array.from([0, 1, 1]));
    expect(Array.from(decodeNpy(b1)[0].data)).toEqual([0, 1, 1]);
  });

  it("reads a Fortran-order 2-D array (column-major) into row-major samples", () => {
    // Fortran order stores a[0,0], a[1,0], a[0,1], a[1,1], a[0,2], a[1,2] (first index fastest).
    const file = npyBytes("{'descr': '|u1', 'fortran_order': True, 'shape': (2, 3), }", Uint8Array.from([1, 4, 2, 5, 3, 6]));
    expect(Array.from(decodeNpy(file, "f.npy")[0].data)).toEqual([1, 2, 3, 4, 5, 6]);
  });

  it("reads frame 1 of a Fortran-order 3-D stack", () => {
    // shape (F=2, H=2, W=2), element (k, y, x) stored at k + 2 y + 4 x; value = 100 k + 10 y + x.
    const data = new Uint8Array(8);
    for (let k = 0; k < 2; k++) for (let y = 0; y < 2; y++) for (let x = 0; x < 2; x++) data[k + 2 * y + 4 * x] = 100 * k + 10 * y + x;
    const file = npyBytes("{'fortran_order': True, 'descr': '|u1', 'shape': (2, 2, 2)}", data);
    expect(Array.from(readNpyFrame(file, 1, "f3.npy").data)).toEqual([100, 101, 110, 111]);
    expect(Array.from(readNpyFrame(file, 0, "f3.npy").data)).toEqual([0, 1, 10, 11]);
  });

  it("reads frame 2 of a C-order 3-D stack by reading only that frame's bytes", () => {
    const frames = 4;
    const data = new Uint8Array(frames * 2 * 3 * 2);
    const view = new DataView(data.buffer);
    for (let i = 0; i < frames * 6; i++) view.setUint16(2 * i, 1000 + i, true);
    const file = npyBytes("{'descr': '<u2', 'fortran_order': False, 'shape': (4, 2, 3), }", data);
    const reader = recordingReader(file);
    const header = parseNpyHeader(reader, "stack.npy");
    reader.reads.length = 0;
    const frame = readNpyFrame(reader, 2, "stack.npy", header);
    expect(Array.from(frame.data)).toEqual([1012, 1013, 1014, 1015, 1016, 1017]);
    expect(reader.reads).toEqual([[128 + 2 * 12, 12]]); // 128-byte header (64-byte aligned)
  });

  it("names the file, the frame and the byte counts when a stack is truncated", () => {
    const file = npyBytes("{'descr': '<u2', 'fortran_order': False, 'shape': (3, 2, 2), }", new Uint8Array(20));
    expect(Array.from(readNpyFrame(file, 1, "stack.npy").data)).toEqual([0, 0, 0, 0]);
    expect(() => readNpyFrame(file, 2, "stack.npy")).toThrow("stack.npy: frame 2: file is truncated (expected 8 bytes at offset 144, file has 148)");
    expect(() => readNpyFrame(file, 3, "stack.npy")).toThrow(/stack\.npy: frame 3 does not exist \(the array has 3\)/);
  });

  it("names the frame of a truncated Fortran-order stack", () => {
    // shape (2, 2, 2) u1 needs 8 data bytes; frame 1's last column slab ends at data byte 7.
    const file = npyBytes("{'descr': '|u1', 'fortran_order': True, 'shape': (2, 2, 2), }", new Uint8Array(7));
    expect(() => readNpyFrame(file, 1, "f.npy")).toThrow("f.npy: frame 1: file is truncated (expected 3 bytes at offset 133, file has 135)");
  });

  it("refuses a header that claims frames too large to be real before allocating them", () => {
    const file = npyBytes("{'descr': '<f8', 'fortran_order': False, 'shape': (100000, 100000), }", new Uint8Array(8));
    expect(() => parseNpyHeader(file, "huge.npy")).toThrow(/huge\.npy: frames of 100000 x 100000 are larger than/);
  });
});

describe(".npy writer", () => {
  it("writes a header that follows the format description byte for byte", () => {
    const bytes = encodeNpy({ width: 3, height: 2, data: new Uint8Array(6) });
    // numpy.lib.format: magic, version 1.0, header length 118 (LE), dict, spaces, '\n'; 64-byte aligned.
    expect(Array.from(bytes.subarray(0, 10))).toEqual([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0, 118, 0]);
    const dict = new TextDecoder().decode(bytes.subarray(10, 128));
    expect(dict.startsWith("{'descr': '|u1', 'fortran_order': False, 'shape': (2, 3), }")).toBe(true);
    expect(dict.endsWith(" \n")).toBe(true);
    expect(bytes.length).toBe(128 + 6);
  });

  it("round-trips Uint16 and Float32 stacks", () => {
    const a = { width: 2, height: 2, data: Uint16Array.from([1, 2, 65535, 4]) };
    const b = { width: 2, height: 2, data: Uint16Array.from([5, 6, 7, 8]) };
    const back = decodeNpy(encodeNpy([a, b]));
    expect(back.map((f) => Array.from(f.data))).toEqual([[1, 2, 65535, 4], [5, 6, 7, 8]]);
    const f = { width: 3, height: 1, data: Float32Array.from([0.25, -7, NaN]) };
    const fb = decodeNpy(encodeNpy(f, { dimensions: "3d" }));
    expect(fb).toHaveLength(1);
    expect(Array.from(fb[0].data).slice(0, 2)).toEqual([0.25, -7]);
  });

  it("refuses frames of different sizes", () => {
    const a = { width: 2, height: 2, data: new Uint8Array(4) };
    const b = { width: 2, height: 1, data: new Uint8Array(2) };
    expect(() => encodeNpy([a, b])).toThrow(/frame 1 is 2 x 1 Uint8Array; frame 0 is 2 x 2 Uint8Array/);
  });
});
