// Frame geometry and buffers shared by the kernel families (not exported from the module).
// Buffers are row-major: pixel (x, y) is at index y * W + x.
//   PH: u8 phase map (1 = up, 0 = down)      LB: i32 labels
//   PA: i32 provisional union-find parents     QM: u8 quad decisions (saddle rule), quad (x, y)
//       has corners (x, y), (x+1, y), (x, y+1), (x+1, y+1), indices wrapping on periodic axes.

export let W: i32 = 0;
export let H: i32 = 0;
export let PX: bool = false;
export let PY: bool = false;
/** 0: up 8-connected / down 4; 1: down 8 / up 4; 2: saddle rule read from QM at diagonal quads. */
export let RULE: i32 = 0;
export let PH: usize = 0;
export let LB: usize = 0;
export let PA: usize = 0;
export let QM: usize = 0;

export function setGeometry(w: i32, h: i32, px: bool, py: bool, rule: i32): void {
  W = w; H = h; PX = px; PY = py; RULE = rule;
}

export function setBuffers(ph: usize, lb: usize, pa: usize, qm: usize): void {
  PH = ph; LB = lb; PA = pa; QM = qm;
}

@inline export function phaseAt(i: i32): i32 {
  return <i32>load<u8>(PH + <usize>i);
}
@inline export function labelAt(i: i32): i32 {
  return load<i32>(LB + (<usize>i << 2));
}
@inline export function setLabel(i: i32, v: i32): void {
  store<i32>(LB + (<usize>i << 2), v);
}
@inline export function ldi(p: usize, i: i32): i32 {
  return load<i32>(p + (<usize>i << 2));
}
@inline export function sti(p: usize, i: i32, v: i32): void {
  store<i32>(p + (<usize>i << 2), v);
}
@inline export function ldf(p: usize, i: i32): f64 {
  return load<f64>(p + (<usize>i << 3));
}
@inline export function stf(p: usize, i: i32, v: f64): void {
  store<f64>(p + (<usize>i << 3), v);
}

// Runs of one phase, 16 pixels at a time from byte-lane masks. The vector loads may read up to
// 15 bytes past a row (and past the phase map, which never ends Wasm memory: the label buffer
// follows it); lanes beyond the row are masked off.

@inline export function sameMask(p: usize, vv: v128): i32 {
  return i8x16.bitmask(i8x16.eq(v128.load(p), vv));
}

/** First x' >= x in a row of width w (at p) whose phase differs from vv's lanes, or w. */
@inline export function runEnd(p: usize, x: i32, w: i32, vv: v128): i32 {
  let e = w;
  while (x < w) {
    const m = ~sameMask(p + <usize>x, vv) & 0xffff;
    if (m != 0) { e = min(x + <i32>ctz(m), w); break; }
    x += 16;
  }
  return e;
}

/**
 * Writes label l to pixels i0..i1 of the label buffer (n pixels); may overshoot by up to three
 * pixels within it, so only where the pixels after the run are written later anyway.
 */
@inline export function fillRun(i0: i32, i1: i32, l: i32, n: i32): void {
  let p = LB + (<usize>i0 << 2);
  const end = LB + (<usize>(i1 + 1) << 2);
  if (i1 + 4 <= n) {
    const vl = i32x4.splat(l);
    do { v128.store(p, vl); p += 16; } while (p < end);
  } else {
    for (; p < end; p += 4) store<i32>(p, l);
  }
}

/** Writes label l to exactly pixels i0..i1 (a last vector store may overlap the one before). */
@inline export function fillRunExact(i0: i32, i1: i32, l: i32): void {
  const p = LB + (<usize>i0 << 2);
  const end = LB + (<usize>(i1 + 1) << 2);
  if (i1 - i0 >= 3) {
    const vl = i32x4.splat(l);
    for (let q = p; q + 16 < end; q += 16) v128.store(q, vl);
    v128.store(end - 16, vl);
  } else {
    store<i32>(p, l);
    if (i1 > i0) store<i32>(p, l, 4);
    if (i1 - i0 == 2) store<i32>(p, l, 8);
  }
}

/**
 * Whether phase `v` joins the diagonal pair of quad `q`. Fixed rules: the 8-connected phase
 * always does. Saddle rule: QM[q] holds the joined phase at saddle quads (0 or 1) and 2 elsewhere
 * (a non-saddle quad links its diagonal pair through a 4-path anyway, so joining is harmless).
 */
@inline export function joinsDiagonal(v: i32, q: i32): bool {
  if (RULE == 0) return v == 1;
  if (RULE == 1) return v == 0;
  const d = <i32>load<u8>(QM + <usize>q);
  return d == 2 || d == v;
}
