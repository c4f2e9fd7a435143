import { describe, it, expect } from "vitest";
import { LabelingWorkspace, type RuleCode } from "../src/wasm/labeling";
import { buildDomainTable, type DomainTable } from "../src/topology/domains";

// Specks absorbed inside the labeling (one scan; flipped components joined in place) against
// the plain way: label, flip every domain of the phase below the limit, label the edited phase
// map again (up specks, then down specks). Labels, phase maps, every domain column and the quad
// statistics must agree.

/** Seeded grey frame: white noise box-blurred once (radius r, wrapping); small r gives many specks. */
function greyFrame(w: number, h: number, seed: number, r: number): Uint8Array {
  let s = seed >>> 0;
  const rand = () => { s = (Math.imul(s, 1664525) + 1013904223) >>> 0; return s / 4294967296; };
  const a = new Float64Array(w * h);
  for (let i = 0; i < a.length; i++) a[i] = rand();
  const out = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    let acc = 0, n = 0;
    for (let dy = -r; dy <= r; dy++) for (let dx = -r; dx <= r; dx++) {
      acc += a[((y + dy + h) % h) * w + ((x + dx + w) % w)]!; n++;
    }
    out[y * w + x] = Math.max(0, Math.min(255, Math.round(128 + (acc / n - 0.5) * 255 * (1 + r))));
  }
  return out;
}

interface Outcome { count: number; labels: number[]; phase: number[]; table: DomainTable; hist: number[]; border: number[]; absorbed: { up: number; down: number } }

function prepared(w: number, h: number, data: Uint8Array, rule: RuleCode): LabelingWorkspace {
  const ws = new LabelingWorkspace(w, h);
  ws.loadSamples(data);
  ws.threshold(0, 128, false);
  if (rule === 2) ws.saddleDecisions(0, 127.5, false);
  return ws;
}

function outcome(ws: LabelingWorkspace, count: number, absorbed: { up: number; down: number }): Outcome {
  const q = ws.measureQuads();
  return {
    count, labels: Array.from(ws.labels()), phase: Array.from(ws.phase()), table: buildDomainTable(ws, 1),
    hist: Array.from(q.hist), border: Array.from(q.border), absorbed,
  };
}

/** Label; flip the domains of phase p below minArea; label again (p = 1, then 0). */
function plainWay(w: number, h: number, data: Uint8Array, rule: RuleCode, px: boolean, py: boolean, minArea: number): Outcome {
  const ws = prepared(w, h, data, rule);
  let count = ws.label(rule, px, py);
  const absorbed = { up: 0, down: 0 };
  for (const p of [1, 0] as const) {
    const area = ws.i32Column("area"), dphase = ws.i32Column("phase"), labels = ws.labels();
    const phase = ws.phase().slice();
    let specks = 0;
    for (let d = 1; d <= count; d++) if (dphase[d] === p && area[d]! < minArea) specks++;
    if (specks === 0) continue;
    for (let i = 0; i < phase.length; i++) {
      const d = labels[i]!;
      if (dphase[d] === p && area[d]! < minArea) phase[i] = 1 - p;
    }
    if (p === 1) absorbed.up = specks; else absorbed.down = specks;
    ws.loadPhase(phase);
    count = ws.label(rule, px, py);
  }
  const out = outcome(ws, count, absorbed);
  ws.dispose();
  return out;
}

function inOneScan(w: number, h: number, data: Uint8Array, rule: RuleCode, px: boolean, py: boolean, minArea: number): Outcome {
  const ws = prepared(w, h, data, rule);
  const count = ws.label(rule, px, py, minArea);
  const out = outcome(ws, count, ws.absorbed);
  ws.dispose();
  return out;
}

/** Columns that mean something for a domain: positions along an axis it wraps are left out. */
function comparable(t: DomainTable): Record<string, number[]> {
  const out: Record<string, number[]> = {};
  for (const [k, v] of Object.entries(t)) if (typeof v !== "number") out[k] = Array.from(v as ArrayLike<number>);
  return out;
}

describe("speck absorption inside the labeling", () => {
  it("equals labeling, flipping and labeling again on seeded frames: every rule, open, periodic and mixed sides, several limits", () => {
    const sizes: Array<[number, number]> = [[1, 1], [1, 6], [6, 1], [2, 2], [3, 5], [8, 8], [13, 9], [24, 31], [64, 48]];
    let frames = 0, absorbedUp = 0, absorbedDown = 0, merges = 0;
    for (const [w, h] of sizes) {
      for (let s = 0; s < 24; s++) {
        const rule = (s % 3) as RuleCode;
        const px = (s >> 2) % 2 === 1, py = (s >> 3) % 2 === 1 || s % 5 === 0;
        const minArea = [2, 3, 4, 6, 12][s % 5]!;
        const data = greyFrame(w, h, 900 + 37 * s + w * 5 + h, s % 2);
        const a = plainWay(w, h, data, rule, px, py, minArea);
        const b = inOneScan(w, h, data, rule, px, py, minArea);
        const where = `${w} x ${h} seed ${s} rule ${rule} px ${px} py ${py} minArea ${minArea}`;
        expect(b.absorbed, where).toEqual(a.absorbed);
        expect(b.count, where).toBe(a.count);
        expect(b.phase, where).toEqual(a.phase);
        expect(b.labels, where).toEqual(a.labels);
        expect(comparable(b.table), where).toEqual(comparable(a.table));
        expect(b.hist, where).toEqual(a.hist);
        expect(b.border, where).toEqual(a.border);
        frames++; absorbedUp += a.absorbed.up; absorbedDown += a.absorbed.down;
        if (a.absorbed.up + a.absorbed.down > 0) merges++;
      }
    }
    // The frames do exercise the absorption, in both phases.
    expect(frames).toBe(sizes.length * 24);
    expect(absorbedUp).toBeGreaterThan(200);
    expect(absorbedDown).toBeGreaterThan(200);
    expect(merges).toBeGreaterThan(frames / 2);
  });

  it("merges the domains a ring-shaped speck kept apart, and lets a domain wind when a speck across the frame goes", () => {
    // An up ring of 8 pixels around one down pixel, limit 9: the ring goes first, so the down
    // pixel inside joins the down domain outside (and is no speck any more when down specks go).
    const w = 9, h = 7;
    const ring = new Uint8Array(w * h);
    for (let y = 2; y <= 4; y++) for (let x = 3; x <= 5; x++) ring[y * w + x] = x === 4 && y === 3 ? 0 : 1;
    const a = new LabelingWorkspace(w, h);
    a.loadPhase(ring);
    expect(a.label(0, false, false)).toBe(3);
    a.loadPhase(ring);
    expect(a.label(0, false, false, 9)).toBe(1);
    expect(a.absorbed).toEqual({ up: 1, down: 0 });
    expect(Array.from(a.phase()).every((v) => v === 0)).toBe(true);
    expect(buildDomainTable(a, 1).area[0]).toBe(w * h);
    a.dispose();
    // A periodic 6 x 7 frame with one up row: the down domain around it winds in x but cannot
    // wind in y; absorbing the row (6 pixels, limit 7) leaves one down domain winding in both.
    const b = new LabelingWorkspace(6, 7);
    const row = new Uint8Array(6 * 7);
    for (let x = 0; x < 6; x++) row[3 * 6 + x] = 1;
    b.loadPhase(row);
    expect(b.label(1, true, true)).toBe(2);
    const before = buildDomainTable(b, 1);
    const down = before.phase[0] === 0 ? 0 : 1;
    expect([before.wrapsX[down], before.wrapsY[down]]).toEqual([1, 0]);
    b.loadPhase(row);
    expect(b.label(1, true, true, 7)).toBe(1);
    const after = buildDomainTable(b, 1);
    expect([after.phase[0], after.area[0], after.wrapsX[0], after.wrapsY[0]]).toEqual([0, 42, 1, 1]);
    expect(Number.isNaN(after.holes[0])).toBe(true);
    b.dispose();
  });
});
