// Bump allocator over the module's linear memory (stub runtime: the module imports nothing).
// The TypeScript side (src/wasm) owns every allocation: it carves a workspace once per frame
// shape and releases it whole with `release(mark)`. Blocks are 16-byte aligned for SIMD.

let top: usize = 0;

@inline function base(): usize {
  return (__heap_base + 15) & ~(<usize>15);
}

/** Current top of the heap; pass it to `release` to free everything allocated after it. */
export function heapMark(): usize {
  if (top == 0) top = base();
  return top;
}

/** Frees every block allocated after `mark` (a value returned by `heapMark`). */
export function heapRelease(mark: usize): void {
  top = mark < base() ? base() : mark;
}

/** Allocates `bytes` (16-byte aligned, zeroed on fresh pages only); returns 0 when memory cannot grow. */
export function heapAlloc(bytes: usize): usize {
  if (top == 0) top = base();
  const ptr = top;
  const end = (ptr + bytes + 15) & ~(<usize>15);
  const have = (<usize>memory.size()) << 16;
  if (end > have) {
    const pages = <i32>((end - have + 0xffff) >> 16);
    if (memory.grow(pages) < 0) return 0;
  }
  top = end;
  return ptr;
}

/** Bytes of linear memory currently reserved by the module. */
export function memoryBytes(): usize {
  return (<usize>memory.size()) << 16;
}
