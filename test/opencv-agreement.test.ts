import { beforeAll, describe, expect, it } from "vitest";
import { analyzeFrame } from "../src/topology/analyze";
import { loadOpenCv, type OpenCv } from "./reference/opencv";
import { randomPhaseMaps, type RandomPhaseMap } from "./reference/random-frames";

let cv: OpenCv;
beforeAll(async () => {
  ({ cv } = await loadOpenCv());
});

interface Component { key: string; cx: number; cy: number }

/** Components of the pixels equal to 1 in `mask`: OpenCV connectedComponentsWithStats. */
function opencvComponents(mask: Uint8Array, width: number, height: number, connectivity: 8 | 4): Component[] {
  const src = new cv.Mat(height, width, cv.CV_8UC1);
  const labels = new cv.Mat(), stats = new cv.Mat(), centroids = new cv.Mat();
  try {
    src.data.set(mask);
    const n: number = cv.connectedComponentsWithStats(src, labels, stats, centroids, connectivity, cv.CV_32S);
    const s: Int32Array = stats.data32S, c: Float64Array = centroids.data64F;
    const out: Component[] = [];
    for (let l = 1; l < n; l++) { // label 0 is the background (the mask's zeros)
      const [left, top, w, h, area] = [0, 1, 2, 3, 4].map((k) => s[l * 5 + k]!);
      out.push({ key: `${area} ${left} ${top} ${w} ${h}`, cx: c[l * 2]!, cy: c[l * 2 + 1]! });
    }
    return out;
  } finally {
    src.delete(); labels.delete(); stats.delete(); centroids.delete();
  }
}

/** Domains of phase `p` from the kernel, open boundary, as (area, box) keys and centroids. */
function kernelComponents(m: RandomPhaseMap, connectivity: 8 | 4, p: 0 | 1): Component[] {
  const r = analyzeFrame({ width: m.width, height: m.height, data: m.phase }, { threshold: 0.5, boundary: "open", connectivity });
  const t = r.domains;
  const out: Component[] = [];
  for (let i = 0; i < t.count; i++) {
    if (t.phase[i] !== p) continue;
    out.push({
      key: `${t.area[i]} ${t.bboxX[i]} ${t.bboxY[i]} ${t.bboxWidth[i]} ${t.bboxHeight[i]}`,
      cx: t.centroidX[i]!, cy: t.centroidY[i]!,
    });
  }
  return out;
}

/** The first way two component lists differ, or undefined. Components match by area and box. */
function difference(kernel: Component[], opencv: Component[]): string | undefined {
  if (kernel.length !== opencv.length) return `kernel has ${kernel.length} components, OpenCV ${opencv.length}`;
  const byKey = (list: Component[]) => {
    const groups = new Map<string, Component[]>();
    for (const c of list) groups.set(c.key, [...(groups.get(c.key) ?? []), c]);
    // Several components can share area and box; pair them up in centroid order.
    for (const g of groups.values()) g.sort((a, b) => a.cx - b.cx || a.cy - b.cy);
    return groups;
  };
  const a = byKey(kernel), b = byKey(opencv);
  for (const [key, ga] of a) {
    const gb = b.get(key);
    if (!gb || gb.length !== ga.length) return `(area left top width height) ${key}: kernel ${ga.length}, OpenCV ${gb?.length ?? 0}`;
    for (let i = 0; i < ga.length; i++) {
      const dx = Math.abs(ga[i]!.cx - gb[i]!.cx), dy = Math.abs(ga[i]!.cy - gb[i]!.cy);
      if (!(dx <= 1e-9 && dy <= 1e-9)) {
        return `${key}: centroid (${ga[i]!.cx}, ${ga[i]!.cy}) vs OpenCV (${gb[i]!.cx}, ${gb[i]!.cy})`;
      }
    }
  }
  return undefined;
}

const IMAGES = randomPhaseMaps(7_919, 230);

describe("the labeling kernel against OpenCV, open boundary", () => {
  it("is checked on at least 200 seeded images, odd and non-square among them", () => {
    expect(IMAGES.length).toBeGreaterThanOrEqual(200);
    expect(IMAGES.some((m) => m.width % 2 === 1 && m.height % 2 === 1 && m.width !== m.height)).toBe(true);
  });

  for (const connectivity of [8, 4] as const) {
    const downConnectivity = connectivity === 8 ? 4 : 8;
    for (const p of [1, 0] as const) {
      const phaseName = p === 1 ? "up" : "down";
      const c = p === 1 ? connectivity : downConnectivity;
      it(`finds the ${phaseName} domains (${c}-connected, up ${connectivity}) with the count, areas, boxes and centroids OpenCV finds`, () => {
        const failures: string[] = [];
        for (const [n, m] of IMAGES.entries()) {
          const mask = p === 1 ? m.phase : m.phase.map((v) => 1 - v);
          // OpenCV connectedComponentsWithStats, @techstark/opencv-js 4.12.0: count, (area, left,
          // top, width, height) of each component and its centroid.
          const problem = difference(kernelComponents(m, connectivity, p), opencvComponents(mask, m.width, m.height, c));
          if (problem) failures.push(`image ${n} (${m.width}x${m.height}, density ${m.density.toFixed(2)}): ${problem}`);
        }
        expect(failures.slice(0, 5)).toEqual([]);
      });
    }
  }
});
