// Each domain's Euler number and wall length from the kernels, against a direct count in plain
// TS over the label image: per 2x2 quad and per domain in it, the bit-quad contribution of that
// domain's own pixels (Gray 1971, IEEE Trans. Comput. C-20:551: 4 E = Q1 - Q3 -+ 2 QD, the sign
// of QD by whether the diagonal pair joins), and phase changes along rows, columns and both
// diagonals for the Crofton estimate (Ohser & Muecklich 2000).
import { describe, expect, it } from "vitest";
import { analyzeFrame } from "../src/topology/analyze";
import { croftonLength } from "../src/topology/domains";
import type { Boundary } from "../src/topology/options";
import { mulberry32, randomPhaseMaps, type RandomPhaseMap } from "./reference/random-frames";

type Rule = 8 | 4 | "saddle";

interface Direct { euler4: Int32Array; n0: Int32Array; n90: Int32Array; n45: Int32Array; n135: Int32Array }

/** Direct per-domain counts over `labels` (ids 1..K); `samples` decide saddle quads. */
function directCounts(
  labels: Int32Array, phase: Uint8Array, samples: Float32Array, width: number, height: number,
  K: number, rule: Rule, px: boolean, py: boolean,
): Direct {
  const out: Direct = {
    euler4: new Int32Array(K + 1), n0: new Int32Array(K + 1), n90: new Int32Array(K + 1),
    n45: new Int32Array(K + 1), n135: new Int32Array(K + 1),
  };
  const at = (x: number, y: number) => y * width + x;
  const wrapX = (x: number) => (px ? (x + width) % width : x);
  const wrapY = (y: number) => (py ? (y + height) % height : y);
  const inside = (x: number, y: number) => x >= 0 && x < width && y >= 0 && y < height;
  // Bit quads, zero-padded on open sides: corners a (x, y), b (x+1, y), c (x, y+1), d (x+1, y+1).
  for (let y = py ? 0 : -1; y < height; y++) {
    for (let x = px ? 0 : -1; x < width; x++) {
      const cx = [x, x + 1, x, x + 1].map(wrapX), cy = [y, y, y + 1, y + 1].map(wrapY);
      const lab = cx.map((xx, k) => (inside(xx, cy[k]!) ? labels[at(xx, cy[k]!)]! : 0));
      const ph = cx.map((xx, k) => (inside(xx, cy[k]!) ? phase[at(xx, cy[k]!)]! : -1));
      for (const l of new Set(lab)) {
        if (l === 0) continue;
        const bits = lab.map((v) => (v === l ? 1 : 0));
        const n = bits[0]! + bits[1]! + bits[2]! + bits[3]!;
        if (n === 1) out.euler4[l]! += 1;
        else if (n === 3) out.euler4[l]! -= 1;
        else if (n === 2 && bits[0] === bits[3]) {
          const v = ph[bits[0] ? 0 : 1]!;
          let upJoins = rule === 8;
          if (rule === "saddle") {
            const mean = (samples[at(cx[0]!, cy[0]!)]! + samples[at(cx[1]!, cy[1]!)]! +
              samples[at(cx[2]!, cy[2]!)]! + samples[at(cx[3]!, cy[3]!)]!) * 0.25;
            upJoins = mean > 0.5;
          }
          out.euler4[l]! += (v === 1) === upJoins ? -2 : 2;
        }
      }
    }
  }
  const change = (col: Int32Array, x0: number, y0: number, x1: number, y1: number) => {
    const i = at(wrapX(x0), wrapY(y0)), j = at(wrapX(x1), wrapY(y1));
    if (phase[i] !== phase[j]) { col[labels[i]!]! += 1; col[labels[j]!]! += 1; }
  };
  const qw = px ? width : width - 1, qh = py ? height : height - 1;
  for (let y = 0; y < height; y++) for (let x = 0; x < qw; x++) change(out.n0, x, y, x + 1, y);
  for (let y = 0; y < qh; y++) for (let x = 0; x < width; x++) change(out.n90, x, y, x, y + 1);
  for (let y = 0; y < qh; y++) {
    for (let x = 0; x < qw; x++) {
      change(out.n135, x, y, x + 1, y + 1);
      change(out.n45, x + 1, y, x, y + 1);
    }
  }
  return out;
}

/** Grey samples whose 0.5 level gives the phase map, with saddle means on both sides of it. */
function greyOf(m: RandomPhaseMap, seed: number): Float32Array {
  const random = mulberry32(seed);
  return Float32Array.from(m.phase, (p) => p * 0.6 + 0.4 * random());
}

function disagreement(m: RandomPhaseMap, samples: Float32Array, boundary: Boundary, rule: Rule): string | undefined {
  const r = analyzeFrame({ width: m.width, height: m.height, data: samples },
    { threshold: 0.5, boundary, connectivity: rule, keepLabels: true, spectrum: "off" });
  const px = boundary === "periodic" || boundary === "periodic-x";
  const py = boundary === "periodic" || boundary === "periodic-y";
  const t = r.domains;
  const direct = directCounts(r.labels!, m.phase, samples, m.width, m.height, t.count, rule, px, py);
  for (let d = 1; d <= t.count; d++) {
    const i = d - 1;
    if (t.euler[i]! * 4 !== direct.euler4[d]) return `domain ${d}: 4 x Euler ${t.euler[i]! * 4} vs ${direct.euler4[d]}`;
    const wall = croftonLength(direct.n0[d]!, direct.n90[d]!, direct.n45[d]!, direct.n135[d]!);
    if (t.wallLength[i] !== wall) return `domain ${d}: wall length ${t.wallLength[i]} vs ${wall}`;
  }
  return undefined;
}

// Frames a few 16-pixel lanes wide, so that runs and quads cross the kernels' vector steps.
const WIDE: RandomPhaseMap[] = [];
{
  const random = mulberry32(77);
  for (const [w, h] of [[33, 9], [47, 20], [64, 7], [100, 30], [129, 5]] as const) {
    for (const smoothing of [0, 1, 3]) {
      WIDE.push(rowsOf(w, h, smoothing, random));
    }
  }
}

/** Noise smoothed by `smoothing` wrapping 3-point sums, cut at its median. */
function rowsOf(w: number, h: number, smoothing: number, random: () => number): RandomPhaseMap {
  const n = w * h;
  let field = Float64Array.from({ length: n }, () => random());
  for (let k = 0; k < smoothing; k++) {
    const next = new Float64Array(n);
    for (let y = 0; y < h; y++) {
      for (let x = 0; x < w; x++) {
        next[y * w + x] = field[y * w + x]! + field[y * w + (x + 1) % w]! + field[((y + 1) % h) * w + x]!;
      }
    }
    field = next;
  }
  const sorted = Float64Array.from(field).sort();
  const cut = sorted[Math.floor(n / 2)]!;
  return { width: w, height: h, density: 0.5, smoothing, phase: Uint8Array.from(field, (v) => (v >= cut ? 1 : 0)) };
}

const FRAMES = [...randomPhaseMaps(20250101, 92), ...WIDE];
const BOUNDARIES: Boundary[] = ["open", "periodic", "periodic-x", "periodic-y"];

describe("per-domain Euler numbers and wall lengths against a direct count over the labels", () => {
  for (const boundary of BOUNDARIES) {
    for (const rule of [8, 4, "saddle"] as const) {
      it(`agrees domain for domain with ${boundary} sides and rule ${rule}`, () => {
        const failures: string[] = [];
        for (const [n, m] of FRAMES.entries()) {
          const problem = disagreement(m, greyOf(m, 1000 + n), boundary, rule);
          if (problem) failures.push(`frame ${n} (${m.width}x${m.height}): ${problem}`);
        }
        expect(failures.slice(0, 5)).toEqual([]);
      });
    }
  }
});
