// Overlap counting between two label images of one shape: for every pixel whose label in the
// previous frame and label in the current frame belong to the same phase, count one towards the
// pair (prev, cur). One pass over the pixels; runs of equal pairs along a row (the common case:
// a domain that stays put) are summed before they touch the table, so the table sees one update
// per run. The table is open addressing with linear probing over two key columns (the pair
// itself rather than prev * (Kcur + 1) + cur, which would overflow 2^31 for large K).
// The pass and the table are a Wasm kernel (assembly/overlap.ts) on copies of the label images
// in buffers kept for the frame size; the current image stays there as the next count's
// previous one (`countNext`), so a movie copies each label image in once. Label images that are
// views into Wasm memory take the same loop in TS. Browser-safe: no node:* imports.
import { kernels } from "../wasm/instance";
import { wasmAlloc, wasmFree, viewI32, viewU8 } from "../wasm/heap";
import type { KernelExports, OverlapKernelExports } from "../wasm/exports";

const EMPTY = 0; // previous labels are >= 1 in every stored key

function memoryBuffer(): ArrayBufferLike | undefined {
  try { return kernels().memory.buffer; } catch { return undefined; }
}

/** A Wasm block grown (never shrunk) as needed. */
class Block {
  ptr = 0;
  bytes = 0;
  at(bytes: number): number {
    if (bytes > this.bytes) {
      if (this.ptr) wasmFree(this.ptr);
      this.bytes = Math.max(bytes, 2 * this.bytes, 64);
      this.ptr = wasmAlloc(this.bytes);
    }
    return this.ptr;
  }
  free(): void {
    if (this.ptr) wasmFree(this.ptr);
    this.ptr = 0;
    this.bytes = 0;
  }
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
  // Wasm side: the two label images (`prev` holds the last current image when `held`), the
  // table, the memo, both phase columns and the pairs.
  private img: { n: number; prev: number; cur: number } | undefined;
  private held = false;
  private wasmCap = 64;
  private readonly blocks = { table: new Block(), memo: new Block(), pph: new Block(), cph: new Block(), out: new Block() };
  /** The pairs found by the last `count`: previous label, current label, shared pixels. */
  pairPrev = new Int32Array(64);
  pairCur = new Int32Array(64);
  pairPixels = new Int32Array(64);
  pairs = 0;

  /**
   * Counts same-phase overlaps of `prev` (ids 1..prevCount) and `cur` (ids 1..curCount).
   * `prevPhase[id]` / `curPhase[id]` hold each label's phase (index 0 unused). The table starts
   * at four slots per `sizeHint` pair and doubles when half full. Throws if `cur`
   * holds a label outside 0..curCount; label 0 overlaps nothing. Afterwards the counter holds
   * `cur` for `countNext` when it took the Wasm path (see `holds`).
   */
  count(
    prev: Int32Array, cur: Int32Array, prevPhase: Uint8Array, curPhase: Uint8Array,
    prevCount: number, curCount: number, where: string, sizeHint = prevCount + curCount,
  ): number {
    const n = cur.length;
    if (prev.length !== n) throw new Error(`${where}: the label images have ${prev.length} and ${n} pixels`);
    // Label images that are views into Wasm memory take the loop in TS: the kernel's buffers
    // could grow the memory and detach them (and the caller's other views).
    const mem = memoryBuffer();
    this.held = false;
    if (mem && prev.buffer !== mem && cur.buffer !== mem) {
      const img = this.images(n);
      viewI32(img.prev, n).set(prev);
      return this.countWasm(cur, prevPhase, curPhase, prevCount, curCount, where, sizeHint, prev);
    }
    return this.countLoop(prev, cur, prevPhase, curPhase, prevCount, curCount, where, sizeHint);
  }

  /** Whether the counter holds a previous label image for `countNext` (the last `count`'s current one, or `hold`'s). */
  get holds(): boolean {
    return this.held;
  }

  /** Keeps `labels` (a copy) as the previous image of the next `countNext`; false where the Wasm path is not open to them. */
  hold(labels: Int32Array): boolean {
    const mem = memoryBuffer();
    if (!mem || labels.buffer === mem) { this.held = false; return false; }
    const img = this.images(labels.length);
    viewI32(img.prev, labels.length).set(labels);
    this.held = true;
    return true;
  }

  /** The held previous image, copied into `into` (of its length). */
  copyHeld(into: Int32Array): void {
    if (!this.held || !this.img || into.length !== this.img.n) throw new Error("overlap counter: no previous label image of that size is held");
    into.set(viewI32(this.img.prev, this.img.n));
  }

  /** `count` with the held image as `prev` (see `holds`); a count that throws keeps it held. */
  countNext(
    cur: Int32Array, prevPhase: Uint8Array, curPhase: Uint8Array,
    prevCount: number, curCount: number, where: string, sizeHint = prevCount + curCount,
  ): number {
    if (!this.held || !this.img) throw new Error(`${where}: the overlap counter holds no previous label image`);
    if (cur.length !== this.img.n) throw new Error(`${where}: the label images have ${this.img.n} and ${cur.length} pixels`);
    const mem = memoryBuffer();
    if (cur.buffer === mem) {
      const prev = viewI32(this.img.prev, this.img.n).slice();
      const r = this.countLoop(prev, cur, prevPhase, curPhase, prevCount, curCount, where, sizeHint);
      this.held = false; // (the loop leaves `cur` where it is)
      return r;
    }
    return this.countWasm(cur, prevPhase, curPhase, prevCount, curCount, where, sizeHint);
  }

  /** Returns the Wasm buffers to the heap (the counter stays usable). */
  dispose(): void {
    if (this.img) { wasmFree(this.img.prev); wasmFree(this.img.cur); }
    this.img = undefined;
    this.held = false;
    for (const b of Object.values(this.blocks)) b.free();
  }

  /** Both label images in Wasm memory for frames of n pixels (the kernels are loaded). */
  private images(n: number) {
    if (this.img?.n === n) return this.img;
    if (this.img) { wasmFree(this.img.prev); wasmFree(this.img.cur); }
    this.held = false;
    this.img = { n, prev: wasmAlloc(4 * n + 16), cur: wasmAlloc(4 * n + 16) };
    return this.img;
  }

  /** The kernel on img.prev (already there) and `cur`; then `cur` becomes the held previous image. */
  private countWasm(
    cur: Int32Array, prevPhase: Uint8Array, curPhase: Uint8Array,
    prevCount: number, curCount: number, where: string, sizeHint: number, prev?: Int32Array,
  ): number {
    const img = this.img!, n = img.n, b = this.blocks;
    // Phase columns indexed by label, padded with values that match nothing on the other side.
    const pph = b.pph.at(prevCount + 1), cph = b.cph.at(curCount + 1);
    const memo = b.memo.at(8 * (prevCount + 1));
    let cap = this.wasmCap;
    while (cap < 4 * sizeHint) cap *= 2;
    let table = b.table.at(12 * cap), out = b.out.at(6 * cap);
    const pv = viewU8(pph, prevCount + 1), cv = viewU8(cph, curCount + 1);
    pv.fill(254); cv.fill(255);
    pv.set(prevPhase.subarray(0, prevCount + 1));
    cv.set(curPhase.subarray(0, curCount + 1));
    viewI32(img.cur, n).set(cur);
    const k = kernels() as KernelExports & OverlapKernelExports;
    let r: number;
    while ((r = k.overlapPairs(img.prev, img.cur, n, prevCount, curCount, pph, cph, table, cap, memo, out, out + 2 * cap, out + 4 * cap)) === -1) {
      cap *= 2;
      table = b.table.at(12 * cap);
      out = b.out.at(6 * cap);
    }
    if (r < -1) {
      const i = -2 - r;
      if (i < n) throw new Error(`${where}: expected labels in 0..${curCount} (the domains' count), got ${cur[i]} at pixel ${i}`);
      const got = prev ? prev[i - n] : viewI32(img.prev, n)[i - n];
      throw new Error(`${where}: expected previous labels in 0..${prevCount}, got ${got} at pixel ${i - n}`);
    }
    this.wasmCap = cap;
    this.lastPath = "wasm";
    this.reservePairs(r);
    this.pairPrev.set(viewI32(out, r));
    this.pairCur.set(viewI32(out + 2 * cap, r));
    this.pairPixels.set(viewI32(out + 4 * cap, r));
    this.pairs = r;
    // This frame's image is the next count's previous one.
    [img.prev, img.cur] = [img.cur, img.prev];
    this.held = true;
    return r;
  }

  private reservePairs(m: number): void {
    if (this.pairPrev.length >= m) return;
    let c = this.pairPrev.length;
    while (c < m) c *= 2;
    this.pairPrev = new Int32Array(c);
    this.pairCur = new Int32Array(c);
    this.pairPixels = new Int32Array(c);
  }

  private countLoop(
    prev: Int32Array, cur: Int32Array, prevPhase: Uint8Array, curPhase: Uint8Array,
    prevCount: number, curCount: number, where: string, sizeHint: number,
  ): number {
    this.reset(sizeHint);
    if (this.memoCur.length < prevCount + 1) {
      this.memoCur = new Int32Array(prevCount + 1);
      this.memoSlot = new Int32Array(prevCount + 1);
    }
    this.memoCur.fill(-1, 0, prevCount + 1);
    const n = cur.length;
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

  /** Slots in the table of the last count (a power of two, at least twice its pairs). */
  capacity(): number {
    return this.lastPath === "wasm" ? this.wasmCap : this.keyPrev.length;
  }
  private lastPath: "wasm" | "loop" = "loop";

  private reset(expected: number): void {
    this.lastPath = "loop";
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
    this.reservePairs(this.used);
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
