// Wasm side of the overlap count between consecutive frames (assembly/overlap.ts): both label
// images of one frame size, the pair table with its memo, the phase columns and the pairs,
// kept between counts and grown as needed. After a count the current image stays as the
// previous one of the next count, so a movie copies each label image in once.
import { kernels } from "./instance";
import { wasmAlloc, wasmFree, viewI32, viewU8 } from "./heap";
import type { KernelExports, OverlapKernelExports } from "./exports";

/** A block of Wasm memory grown (never shrunk) as needed. */
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

/** The kernels' memory, or undefined before they are loaded (browsers before `init()`). */
export function wasmMemoryBuffer(): ArrayBufferLike | undefined {
  try { return kernels().memory.buffer; } catch { return undefined; }
}

export type OverlapOutcome =
  | { pairs: number; prev: Int32Array; cur: Int32Array; pixels: Int32Array }
  | { bad: "current" | "previous"; pixel: number };

export class OverlapWorkspace {
  readonly pixels: number;
  private prev: number;
  private cur: number;
  /** Slots of the pair table: a power of two, kept at the largest a count needed. */
  capacity = 64;
  private readonly blocks = { table: new Block(), memo: new Block(), pph: new Block(), cph: new Block(), out: new Block() };
  private disposed = false;

  constructor(pixels: number) {
    this.pixels = pixels;
    this.prev = wasmAlloc(4 * pixels + 16);
    this.cur = wasmAlloc(4 * pixels + 16);
  }

  /** Copies `labels` in as the previous image. */
  loadPrevious(labels: Int32Array): void {
    viewI32(this.prev, this.pixels).set(labels);
  }

  /** Copies the previous image into `into`. */
  copyPrevious(into: Int32Array): void {
    into.set(viewI32(this.prev, this.pixels));
  }

  /**
   * Same-phase pairs of the previous image (labels 0..prevCount) and `cur` (0..curCount, copied
   * in); the phase columns are indexed by label. On success `cur` becomes the previous image and
   * the pairs are views (valid until the next call); a label out of range leaves the previous
   * image as it was.
   */
  count(cur: Int32Array, prevPhase: Uint8Array, curPhase: Uint8Array, prevCount: number, curCount: number, sizeHint: number): OverlapOutcome {
    if (this.disposed) throw new Error("domtopo: this OverlapWorkspace was disposed");
    const n = this.pixels, b = this.blocks;
    // Phase columns padded with values that match nothing on the other side.
    const pph = b.pph.at(prevCount + 1), cph = b.cph.at(curCount + 1);
    const memo = b.memo.at(8 * (prevCount + 1));
    let cap = this.capacity;
    while (cap < 4 * sizeHint) cap *= 2;
    let table = b.table.at(12 * cap), out = b.out.at(6 * cap);
    const pv = viewU8(pph, prevCount + 1), cv = viewU8(cph, curCount + 1);
    pv.fill(254);
    cv.fill(255);
    pv.set(prevPhase.subarray(0, prevCount + 1));
    cv.set(curPhase.subarray(0, curCount + 1));
    viewI32(this.cur, n).set(cur);
    const k = kernels() as KernelExports & OverlapKernelExports;
    let r: number;
    while ((r = k.overlapPairs(this.prev, this.cur, n, prevCount, curCount, pph, cph, table, cap, memo, out, out + 2 * cap, out + 4 * cap)) === -1) {
      // Half full: twice the slots, from the start.
      cap *= 2;
      table = b.table.at(12 * cap);
      out = b.out.at(6 * cap);
    }
    if (r < -1) {
      const i = -2 - r;
      return i < n ? { bad: "current", pixel: i } : { bad: "previous", pixel: i - n };
    }
    this.capacity = cap;
    [this.prev, this.cur] = [this.cur, this.prev];
    return { pairs: r, prev: viewI32(out, r), cur: viewI32(out + 2 * cap, r), pixels: viewI32(out + 4 * cap, r) };
  }

  /** The previous image's label at pixel i (for messages). */
  previousAt(i: number): number {
    return viewI32(this.prev, this.pixels)[i]!;
  }

  /** Returns the memory to the heap. */
  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    wasmFree(this.prev);
    wasmFree(this.cur);
    for (const blk of Object.values(this.blocks)) blk.free();
  }
}
