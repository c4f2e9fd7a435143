// Blocks of Wasm linear memory for workspaces. The module's own allocator only bumps; this keeps
// a first-fit free list on top of it so that several workspaces (labeling, spectrum, skeleton)
// can live side by side and be released independently. Views into memory must be rebuilt after
// any call that can grow it: use the view helpers below right before reading or writing.
import { kernels } from "./instance";

interface Block { ptr: number; bytes: number }
const freeBlocks: Block[] = [];
const liveBlocks = new Map<number, number>();

function round16(n: number): number {
  return (n + 15) & ~15;
}

/** Allocates `bytes` of Wasm memory (16-byte aligned, contents undefined). */
export function wasmAlloc(bytes: number): number {
  const size = round16(Math.max(16, bytes));
  for (let i = 0; i < freeBlocks.length; i++) {
    const b = freeBlocks[i]!;
    if (b.bytes >= size) {
      freeBlocks.splice(i, 1);
      if (b.bytes - size >= 4096) freeBlocks.push({ ptr: b.ptr + size, bytes: b.bytes - size });
      const used = b.bytes - size >= 4096 ? size : b.bytes;
      liveBlocks.set(b.ptr, used);
      return b.ptr;
    }
  }
  const ptr = kernels().heapAlloc(size);
  if (ptr === 0) {
    throw new Error(`domtopo: out of WebAssembly memory (asked for ${size} bytes more)`);
  }
  liveBlocks.set(ptr, size);
  return ptr;
}

/** Returns a block from `wasmAlloc` to the free list (adjacent free blocks are merged). */
export function wasmFree(ptr: number): void {
  const bytes = liveBlocks.get(ptr);
  if (bytes === undefined) return;
  liveBlocks.delete(ptr);
  freeBlocks.push({ ptr, bytes });
  freeBlocks.sort((a, b) => a.ptr - b.ptr);
  for (let i = freeBlocks.length - 2; i >= 0; i--) {
    const a = freeBlocks[i]!, b = freeBlocks[i + 1]!;
    if (a.ptr + a.bytes === b.ptr) {
      a.bytes += b.bytes;
      freeBlocks.splice(i + 1, 1);
    }
  }
}

/** Bytes of linear memory the module holds now. */
export function wasmMemoryBytes(): number {
  return kernels().memory.buffer.byteLength;
}

export function viewU8(ptr: number, length: number): Uint8Array {
  return new Uint8Array(kernels().memory.buffer, ptr, length);
}
export function viewU16(ptr: number, length: number): Uint16Array {
  return new Uint16Array(kernels().memory.buffer, ptr, length);
}
export function viewI32(ptr: number, length: number): Int32Array {
  return new Int32Array(kernels().memory.buffer, ptr, length);
}
export function viewU32(ptr: number, length: number): Uint32Array {
  return new Uint32Array(kernels().memory.buffer, ptr, length);
}
export function viewF32(ptr: number, length: number): Float32Array {
  return new Float32Array(kernels().memory.buffer, ptr, length);
}
export function viewF64(ptr: number, length: number): Float64Array {
  return new Float64Array(kernels().memory.buffer, ptr, length);
}
