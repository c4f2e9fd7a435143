// Overlap counting between two label images of one shape: for every pixel whose label in the
// previous frame and label in the current frame belong to the same phase, count one towards the
// pair (prev, cur). One pass over the pixels; runs of equal pairs along a row (the common case:
// a domain that stays put) are summed before they touch the table, so the table sees one update
// per run. The table is open addressing with linear probing over two key columns (the pair
// itself rather than prev * (Kcur + 1) + cur, which would overflow 2^31 for large K).
// The pass and the table are a Wasm kernel (src/wasm/overlap.ts); the current image stays there
// as the next count's previous one (`countNext`), so a movie copies each label image in once.
// Label images that are views into Wasm memory take the same loop in TS. Browser-safe.
import { OverlapWorkspace, wasmMemoryBuffer } from "../wasm/overlap";

const EMPTY = 0; // previous labels are >= 1 in every stored key

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
  private ws: OverlapWorkspace | undefined;
  /** The workspace's previous image is the last count's current one (or `hold`'s). */
  private held = false;
  private lastPath: "wasm" | "loop" = "loop";
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
    this.held = false;
    // Label images that are views into Wasm memory take the loop in TS: the kernel's buffers
    // could grow the memory and detach them (and the caller's other views).
    const mem = wasmMemoryBuffer();
    if (mem && prev.buffer !== mem && cur.buffer !== mem) {
      this.workspace(n).loadPrevious(prev);
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
    const mem = wasmMemoryBuffer();
    this.held = false;
    if (!mem || labels.buffer === mem) return false;
    this.workspace(labels.length).loadPrevious(labels);
    this.held = true;
    return true;
  }

  /** The held previous image, copied into `into` (of its length). */
  copyHeld(into: Int32Array): void {
    if (!this.held || !this.ws || into.length !== this.ws.pixels) throw new Error("overlap counter: no previous label image of that size is held");
    this.ws.copyPrevious(into);
  }

  /** `count` with the held image as `prev` (see `holds`); a count that throws keeps it held. */
  countNext(
    cur: Int32Array, prevPhase: Uint8Array, curPhase: Uint8Array,
    prevCount: number, curCount: number, where: string, sizeHint = prevCount + curCount,
  ): number {
    const ws = this.ws;
    if (!this.held || !ws) throw new Error(`${where}: the overlap counter holds no previous label image`);
    if (cur.length !== ws.pixels) throw new Error(`${where}: the label images have ${ws.pixels} and ${cur.length} pixels`);
    if (cur.buffer === wasmMemoryBuffer()) {
      const prev = new Int32Array(ws.pixels);
      ws.copyPrevious(prev);
      const r = this.countLoop(prev, cur, prevPhase, curPhase, prevCount, curCount, where, sizeHint);
      this.held = false; // (the loop leaves `cur` where it is)
      return r;
    }
    return this.countWasm(cur, prevPhase, curPhase, prevCount, curCount, where, sizeHint);
  }

  /** Slots in the table of the last count (a power of two, at least twice its pairs). */
  capacity(): number {
    return this.lastPath === "wasm" ? this.ws!.capacity : this.keyPrev.length;
  }

  /** Returns the Wasm memory to the heap (the counter stays usable; it holds no image then). */
  dispose(): void {
    this.ws?.dispose();
    this.ws = undefined;
    this.held = false;
  }

  private workspace(n: number): OverlapWorkspace {
    if (this.ws?.pixels !== n) {
      this.ws?.dispose();
      this.ws = new OverlapWorkspace(n);
    }
    return this.ws;
  }

  /** The kernel on the workspace's previous image and `cur`; then `cur` is held as the previous image. */
  private countWasm(
    cur: Int32Array, prevPhase: Uint8Array, curPhase: Uint8Array,
    prevCount: number, curCount: number, where: string, sizeHint: number, prev?: Int32Array,
  ): number {
    const ws = this.ws!;
    const r = ws.count(cur, prevPhase, curPhase, prevCount, curCount, sizeHint);
    if ("bad" in r) {
      const i = r.pixel;
      if (r.bad === "current") throw new Error(`${where}: expected labels in 0..${curCount} (the domains' count), got ${cur[i]} at pixel ${i}`);
      throw new Error(`${where}: expected previous labels in 0..${prevCount}, got ${prev ? prev[i] : ws.previousAt(i)} at pixel ${i}`);
    }
    this.lastPath = "wasm";
    this.reservePairs(r.pairs);
    this.pairPrev.set(r.prev);
    this.pairCur.set(r.cur);
    this.pairPixels.set(r.pixels);
    this.pairs = r.pairs;
    this.held = true;
    return r.pairs;
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
