import { describe, expect, it } from "vitest";
import { naturalCompare, naturalSort } from "../../src/io/natural";
import { seeded } from "./helpers";

describe("natural order of file names", () => {
  it("puts frame2 before frame10", () => {
    expect(naturalSort(["frame10.png", "frame2.png", "frame1.png"])).toEqual(["frame1.png", "frame2.png", "frame10.png"]);
  });

  it("compares numbers longer than any integer type exactly", () => {
    expect(naturalSort(["s123456789012345678901", "s99999999999999999999"])).toEqual(["s99999999999999999999", "s123456789012345678901"]);
  });

  it("orders several number runs field by field", () => {
    expect(naturalSort(["run2_f10", "run10_f1", "run2_f9", "run1_f100"])).toEqual(["run1_f100", "run2_f9", "run2_f10", "run10_f1"]);
  });

  it("ignores case in text but still orders names that differ only in case", () => {
    expect(naturalSort(["B2", "a10", "A2"])).toEqual(["A2", "a10", "B2"]);
    expect(naturalCompare("a", "A")).not.toBe(0);
  });

  it("treats zero-padded and plain numbers as equal, fewer zeros first", () => {
    expect(naturalSort(["img007", "img7", "img06"])).toEqual(["img06", "img7", "img007"]);
  });

  it("puts a name before its own extensions", () => {
    expect(naturalSort(["frame1b", "frame1", "frame"])).toEqual(["frame", "frame1", "frame1b"]);
  });

  it("is a total order on random names (antisymmetric and transitive)", () => {
    const rand = seeded(11);
    const pick = (s: string) => s[Math.floor(rand() * s.length)];
    const names = Array.from({ length: 60 }, () => Array.from({ length: 1 + Math.floor(rand() * 6) }, () => pick("a0b1Z09_.")).join(""));
    const sorted = naturalSort(names);
    for (let i = 0; i + 1 < sorted.length; i++) expect(naturalCompare(sorted[i], sorted[i + 1])).toBeLessThanOrEqual(0);
    const sign = (a: string, b: string) => Math.sign(naturalCompare(a, b)) + 0;
    for (const a of names) for (const b of names) expect(sign(a, b)).toBe(-sign(b, a) + 0);
    const few = names.slice(0, 20);
    for (const a of few) for (const b of few) for (const c of few) {
      if (sign(a, b) <= 0 && sign(b, c) <= 0) expect(sign(a, c)).toBeLessThanOrEqual(0);
    }
  });
});
