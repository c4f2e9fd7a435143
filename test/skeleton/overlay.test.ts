import { describe, it, expect } from "vitest";
import { writeFileSync } from "node:fs";
import UPNG from "upng-js";
import { analyzeSkeletons } from "../../src/topology/skeleton-analysis";
import { overlayPixels } from "../../src/render/overlay";
import { encodeRgbaPng } from "../../src/io/png";
import { noiseFrame, label } from "./helpers";
import * as S from "./shapes";

function compose(parts: S.Shape[], gap = 4): S.Shape {
  const width = parts.reduce((s, p) => s + p.width + gap, gap);
  const height = Math.max(...parts.map((p) => p.height)) + 2 * gap;
  const phase = new Uint8Array(width * height);
  let ox = gap;
  for (const p of parts) {
    for (let y = 0; y < p.height; y++) for (let x = 0; x < p.width; x++) phase[(y + gap) * width + ox + x] = p.phase[y * p.width + x]!;
    ox += p.width + gap;
  }
  return { width, height, phase };
}

describe("overlay", () => {
  it("draws generated frames as PNG (written to /tmp for a look)", () => {
    const frames: Array<[string, S.Shape, boolean]> = [
      ["shapes", compose([S.disc(8), S.roughen(S.bar(50, 8, 30), 0.3, 1), S.ring(14, 3), S.star(24, 3, [90, 210, 330]), S.star(24, 3, [0, 90, 180, 270])]), false],
      ["maze", { width: 160, height: 120, phase: noiseFrame(160, 120, 5, 3, 3, 0.5) }, true],
      ["bubbles", { width: 160, height: 120, phase: noiseFrame(160, 120, 8, 3, 3, 0.2) }, true],
    ];
    for (const [name, f, periodic] of frames) {
      const L = label(f.phase, f.width, f.height, periodic, periodic, 0);
      const a = analyzeSkeletons({ ...f, labels: L.labels, count: L.count }, { boundary: periodic ? "periodic" : "open" });
      const img = overlayPixels(a, f.width, f.height, f.phase, L.labels, { scale: 4 });
      expect(img.rgba.length).toBe(f.width * 4 * f.height * 4 * 4);
      const png = encodeRgbaPng(img.width, img.height, img.rgba);
      const back = UPNG.decode(png.slice().buffer as ArrayBuffer);
      expect([back.width, back.height]).toEqual([img.width, img.height]);
      writeFileSync(`/tmp/domtopo-skeleton-${name}.png`, png);
    }
  });
});
