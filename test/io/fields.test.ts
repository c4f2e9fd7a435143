import { describe, expect, it } from "vitest";
import { checkFieldCount, fieldsFromList, fieldsFromNames, fieldsFromSweep, fieldsFromTable, parseDelimited } from "../../src/io/fields";

describe("field values from a table", () => {
  it("picks a column by name from comma-separated text and reads its unit from the header", () => {
    const csv = "frame,time (s),H (mT)\n0,0.0,-40\n1,0.5,-38.5\n2,1.0,-37\n";
    const f = fieldsFromTable(csv, "H (mT)", { name: "field.csv" });
    expect(Array.from(f.values)).toEqual([-40, -38.5, -37]);
    expect(f.unit).toBe("mT");
    expect(f.source).toBe('column "H (mT)" of field.csv');
  });

  it("detects tab and semicolon delimiters, reading decimal commas in semicolon tables", () => {
    expect(Array.from(fieldsFromTable("a\tB [Oe]\n1\t2\n3\t4\n", "b [oe]").values)).toEqual([2, 4]);
    const f = fieldsFromTable("nr;Feld [mT]\r\n1;-1,5\r\n2;2,25\r\n", "Feld [mT]");
    expect(Array.from(f.values)).toEqual([-1.5, 2.25]);
    expect(f.unit).toBe("mT");
  });

  it("understands quoted fields with delimiters, doubled quotes and line breaks inside", () => {
    // RFC 4180, section 2: fields may be enclosed in double quotes; a quote inside is doubled.
    expect(parseDelimited('a,"b,c","say ""hi""","two\nlines"\n1,2,3,4', ",")).toEqual([
      ["a", "b,c", 'say "hi"', "two\nlines"],
      ["1", "2", "3", "4"],
    ]);
    expect(Array.from(fieldsFromTable('"note, free","H"\n"x, y",5\n"z",6\n', "H").values)).toEqual([5, 6]);
  });

  it("names the table, the row and the column of a cell that is not a number", () => {
    expect(() => fieldsFromTable("H\n1\nabc\n", "H", { name: "log.csv" })).toThrow('log.csv: row 3: column "H" holds "abc", not a number');
    expect(() => fieldsFromTable("H,x\n1,2\n,3\n", "H", { name: "log.csv" })).toThrow('log.csv: row 3: column "H" holds nothing, not a number');
  });

  it("lists the columns it has when the asked one is missing", () => {
    expect(() => fieldsFromTable("a,b\n1,2\n", "H", { name: "t.csv" })).toThrow('t.csv: no column named "H" (columns: "a", "b")');
  });
});

describe("field values from a sweep", () => {
  it("runs a loop -40 -> 40 -> -40 mT with both ends and without repeating the joint", () => {
    const f = fieldsFromSweep(
      [
        { start: -40, stop: 40, step: 20 },
        { start: 40, stop: -40, step: 20 },
      ],
      { unit: "mT" },
    );
    expect(Array.from(f.values)).toEqual([-40, -20, 0, 20, 40, 20, 0, -20, -40]);
    expect(f.unit).toBe("mT");
  });

  it("steps by decimals without float noise", () => {
    expect(Array.from(fieldsFromSweep([{ start: 0, stop: 0.3, step: 0.1 }]).values)).toEqual([0, 0.1, 0.2, 0.3]);
  });

  it("keeps both values where a segment jumps instead of joining", () => {
    const f = fieldsFromSweep([
      { start: 0, stop: 2, step: 1 },
      { start: -1, stop: 1, step: 1 },
    ]);
    expect(Array.from(f.values)).toEqual([0, 1, 2, -1, 0, 1]);
  });

  it("refuses a span that is not a whole number of steps", () => {
    expect(() => fieldsFromSweep([{ start: 0, stop: 10, step: 3 }])).toThrow(/sweep segment 0 \(0 -> 10 step 3\): the span 10 is not a whole number of steps of 3/);
  });
});

describe("field values from file names", () => {
  it("reads the number captured by a pattern from each name", () => {
    const names = ["scan_H=-12.5mT.png", "scan_H=0mT.png", "scan_H=7mT.png"];
    const f = fieldsFromNames(names, /H=(-?[\d.]+)mT/, { unit: "mT" });
    expect(Array.from(f.values)).toEqual([-12.5, 0, 7]);
  });

  it("names the file that does not match", () => {
    expect(() => fieldsFromNames(["H=1mT.png", "dark.png"], /H=(-?[\d.]+)mT/)).toThrow("dark.png: does not match the field pattern /H=(-?[\\d.]+)mT/");
  });

  it("refuses a pattern without a capture group", () => {
    expect(() => fieldsFromNames(["a"], "H=\\d+")).toThrow(/has no capture group/);
  });
});

describe("field count against frame count", () => {
  it("says how many values were expected, how many arrived and from where", () => {
    const f = fieldsFromList([1, 2, 3], { unit: "mT" });
    expect(() => checkFieldCount(f, 4)).toThrow("expected 4 field values for 4 frames, got 3 from a list");
    expect(() => fieldsFromTable("H\n1\n2\n", "H", { name: "f.csv", frames: 3 })).toThrow('expected 3 field values for 3 frames, got 2 from column "H" of f.csv');
    expect(checkFieldCount(f, 3)).toBe(f);
  });

  it("refuses a list holding NaN", () => {
    expect(() => fieldsFromList([1, NaN])).toThrow("a list: value 1 is NaN, not a finite number");
  });
});
