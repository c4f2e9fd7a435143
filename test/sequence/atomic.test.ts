import { describe, it, expect } from "vitest";
import { mkdtempSync, readFileSync, readdirSync, writeFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { writeTrackTable, writeFileAtomic } from "../../src/node/atomic";

describe("atomic table files", () => {
  it("writes the track table in batches, every row once and in order", () => {
    const dir = mkdtempSync(join(tmpdir(), "domtopo-atomic-"));
    try {
      const path = join(dir, "tracks.csv");
      const batches: Array<[number, number]> = [];
      const n = writeTrackTable(path, "track_id\n", 10001, (s, e) => {
        batches.push([s, e]);
        return Array.from({ length: e - s }, (_v, k) => `${s + k + 1}\n`).join("");
      });
      expect(n).toBe(10001);
      expect(batches).toEqual([[0, 4096], [4096, 8192], [8192, 10001]]);
      const lines = readFileSync(path, "utf8").trimEnd().split("\n");
      expect(lines[0]).toBe("track_id");
      expect(lines.slice(1).map(Number)).toEqual(Array.from({ length: 10001 }, (_v, k) => k + 1));
      // A failing batch leaves the earlier file as it was and no temporary file behind.
      expect(() => writeTrackTable(path, "track_id\n", 5000, (s) => { if (s > 0) throw new Error("disk full"); return "1\n"; }))
        .toThrow("disk full");
      expect(readFileSync(path, "utf8").split("\n").length).toBe(10003);
      expect(readdirSync(dir)).toEqual(["tracks.csv"]);
      writeFileSync(join(dir, "other.txt"), "old");
      writeFileAtomic(join(dir, "other.txt"), "new");
      expect(readFileSync(join(dir, "other.txt"), "utf8")).toBe("new");
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
