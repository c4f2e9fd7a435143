// Overlap counting between two label images of one shape: for every pixel whose label in the
// previous frame and label in the current frame belong to the same phase, count one towards the
// pair (prev, cur). One pass over the pixels; runs of equal pairs along a row (the common case:
// a domain that stays put) are summed before they touch the table, so the table sees one update
// per run. The table is open addressing with linear probing over two Int32Array key columns
// (the pair itself rather than prev * (Kcur + 1) + cur, which would overflow 2^31 for large K).
// The runs come from a Wasm kernel (four pixels a step while nothing changes) on copies of the
// label images in buffers kept for the frame size. Browser-safe: no node:* imports.
import { kernels } from "../wasm/instance";
import { wasmAlloc, wasmFree, viewI32 } from "../wasm/heap";
import type { KernelExports, OverlapKernelExports } from "../wasm/exports";

const EMPTY = 0; // previous labels are >= 1 in every stored key

function memoryBuffer(): ArrayBufferLike | undefined {
  try { return kernels().memory.buffer; } catch { return undefined; }
}

export class OverlapCounter {
  private keyPrev = new Int32Array(0);
  private keyCur = new Int32Array(0);
  private value = new Int32Array(0);
  private mask = -1;
  private used = 0;
  // Per previous label: the current label and table slot of its last pair (runs of one domain
  // meet the same partner row after row), -1 when unknown or after the table moved.
  private memoCur = new Int32Array(0);
  private memoSlot = new Int32Array(0);
  // Wasm copies of the two label images and the run columns, for frames of `wasmN` pixels.
  private wasm: { n: number; prev: number; cur: number; a: number; b: number; len: number } | undefined;
  /** The pairs found by the last `count`: previous label, current label, shared pixels. */
  pairPrev = new Int32Array(64);
  pairCur = new Int32Array(64);
  pairPixels = new Int32Array(64);
  pairs = 0;

  /**
   * Counts same-phase overlaps of `prev` (ids 1..prevPhase.length - 1) and `cur` (ids 1..curCount).
   * `prevPhase[id]` / `curPhase[id]` hold each label's phase (index 0 unused). The table starts
   * at four slots per `sizeHint` pair and doubles when half full. Throws if `cur`
   * holds a label outside 0..curCount; label 0 overlaps nothing.
   */
  count(
    prev: Int32Array, cur: Int32Array, prevPhase: Uint8Array, curPhase: Uint8Array,
    prevCount: number, curCount: number, where: string, sizeHint = prevCount + curCount,
  ): number {
    this.reset(sizeHint);
    if (this.memoCur.length < prevCount + 1) {
      this.memoCur = new Int32Array(prevCount + 1);
      this.memoSlot = new Int32Array(prevCount + 1);
    }
    this.memoCur.fill(-1, 0, prevCount + 1);
    const n = cur.length;
    if (prev.length !== n) throw new Error(`${where}: the label images have ${prev.length} and ${n} pixels`);
    // Label images that are views into Wasm memory take the loop in TS: the kernel's buffers
    // could grow the memory and detach them (and the caller's other views).
    const mem = memoryBuffer();
    const w = mem && prev.buffer !== mem && cur.buffer !== mem ? this.wasmBuffers(n) : undefined;
    if (w) {
      const k = kernels() as KernelExports & OverlapKernelExports;
      viewI32(w.prev, n).set(prev);
      viewI32(w.cur, n).set(cur);
      const runs = k.overlapRuns(w.prev, w.cur, n, curCount, w.a, w.b, w.len);
      if (runs < 0) {
        const i = -runs - 1;
        throw new Error(`${where}: expected labels in 0..${curCount} (the domains' count), got ${cur[i]} at pixel ${i}`);
      }
      const A = viewI32(w.a, runs), B = viewI32(w.b, runs), L = viewI32(w.len, runs);
      for (let t = 0; t < runs; t++) {
        const a = A[t]!, b = B[t]!;
        if (a > 0 && b > 0 && prevPhase[a] === curPhase[b]) this.addRun(a, b, L[t]!);
      }
      this.collect();
      return this.pairs;
    }
    let runPrev = 0, runCur = 0, run = 0;
    for (let i = 0; i < n; i++) {
      const a = prev[i]!, b = cur[i]!;
      if (a === runPrev && b === runCur) {
        run++;
        continue;
      }
      if (run > 0 && runPrev > 0 && runCur > 0 && prevPhase[runPrev] === curPhase[runCur]) {
        this.addRun(runPrev, runCur, run);
      }
      if (b !== runCur && (b < 0 || b > curCount)) {
        throw new Error(`${where}: expected labels in 0..${curCount} (the domains' count), got ${b} at pixel ${i}`);
      }
      runPrev = a;
      runCur = b;
      run = 1;
    }
    if (run > 0 && runPrev > 0 && runCur > 0 && prevPhase[runPrev] === curPhase[runCur]) {
      this.addRun(runPrev, runCur, run);
    }
    this.collect();
    return this.pairs;
  }

  /** Wasm buffers for frames of n pixels (the kernels are loaded: memoryBuffer() answered). */
  private wasmBuffers(n: number) {
    if (this.wasm?.n === n) return this.wasm;
    if (this.wasm) for (const p of [this.wasm.prev, this.wasm.cur, this.wasm.a, this.wasm.b, this.wasm.len]) wasmFree(p);
    this.wasm = { n, prev: wasmAlloc(4 * n + 16), cur: wasmAlloc(4 * n + 16), a: wasmAlloc(4 * n), b: wasmAlloc(4 * n), len: wasmAlloc(4 * n) };
    return this.wasm;
  }

  /** Slots in the table (a power of two, at least twice the pairs of the last count). */
  capacity(): number {
    return this.keyPrev.length;
  }

  private reset(expected: number): void {
    // Capacity: a power of two at least four times the expected number of pairs.
    let cap = 64;
    while (cap < 4 * expected) cap *= 2;
    if (this.keyPrev.length < cap) {
      this.keyPrev = new Int32Array(cap);
      this.keyCur = new Int32Array(cap);
      this.value = new Int32Array(cap);
    } else {
      this.keyPrev.fill(EMPTY);
    }
    this.mask = this.keyPrev.length - 1;
    this.used = 0;
  }

  private slot(a: number, b: number): number {
    // Multiplicative mixing of both labels (golden-ratio and murmur3 constants), then fold.
    let h = Math.imul(a, 0x9e3779b1) ^ Math.imul(b, 0x85ebca77);
    h ^= h >>> 15;
    return h & this.mask;
  }

  private addRun(a: number, b: number, n: number): void {
    if (a < this.memoCur.length && this.memoCur[a] === b) {
      this.value[this.memoSlot[a]!]! += n;
      return;
    }
    const s = this.add(a, b, n);
    if (a >= this.memoCur.length) return;
    if (s < 0) { this.memoCur.fill(-1); return; }
    this.memoCur[a] = b;
    this.memoSlot[a] = s;
  }

  /** Adds n to the pair (a, b); returns its slot, or -1 when the table grew (slots moved). */
  private add(a: number, b: number, n: number): number {
    const kp = this.keyPrev, kc = this.keyCur, mask = this.mask;
    let s = this.slot(a, b);
    for (;;) {
      const k = kp[s]!;
      if (k === EMPTY) {
        kp[s] = a;
        kc[s] = b;
        this.value[s] = n;
        if (++this.used * 2 > kp.length) { this.grow(); return -1; }
        return s;
      }
      if (k === a && kc[s] === b) {
        this.value[s]! += n;
        return s;
      }
      s = (s + 1) & mask;
    }
  }

  private grow(): void {
    const oldP = this.keyPrev, oldC = this.keyCur, oldV = this.value;
    const cap = oldP.length * 2;
    this.keyPrev = new Int32Array(cap);
    this.keyCur = new Int32Array(cap);
    this.value = new Int32Array(cap);
    this.mask = cap - 1;
    for (let s = 0; s < oldP.length; s++) {
      const a = oldP[s]!;
      if (a === EMPTY) continue;
      let t = this.slot(a, oldC[s]!);
      while (this.keyPrev[t] !== EMPTY) t = (t + 1) & this.mask;
      this.keyPrev[t] = a;
      this.keyCur[t] = oldC[s]!;
      this.value[t] = oldV[s]!;
    }
  }

  private collect(): void {
    if (this.pairPrev.length < this.used) {
      let cap = this.pairPrev.length;
      while (cap < this.used) cap *= 2;
      this.pairPrev = new Int32Array(cap);
      this.pairCur = new Int32Array(cap);
      this.pairPixels = new Int32Array(cap);
    }
    let e = 0;
    const kp = this.keyPrev;
    for (let s = 0; s < kp.length; s++) {
      if (kp[s] === EMPTY) continue;
      this.pairPrev[e] = kp[s]!;
      this.pairCur[e] = this.keyCur[s]!;
      this.pairPixels[e] = this.value[s]!;
      e++;
    }
    this.pairs = e;
  }
}
