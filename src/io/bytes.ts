// Random access to the bytes of one input, in memory or (Node) on disk, so that decoders can
// read a frame's bytes without holding the whole input.

/** Positioned reads over one input of known size. */
export interface ByteReader {
  /** Total size in bytes. */
  readonly size: number;
  /**
   * Bytes `[offset, offset + length)`, clipped at the end of the input (the result may be shorter
   * than asked). The result may be a view that is only valid until the next call.
   */
  read(offset: number, length: number): Uint8Array;
}

/**
 * The same bytes as a plain `Uint8Array` view. Subclasses such as Node's `Buffer` are re-viewed
 * because their `slice` shares memory instead of copying.
 */
export function plainBytes(bytes: Uint8Array): Uint8Array {
  return Object.getPrototypeOf(bytes) === Uint8Array.prototype ? bytes : new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

/** A reader over bytes already in memory (views, no copies). */
export function memoryReader(input: Uint8Array): ByteReader {
  const bytes = plainBytes(input);
  return {
    size: bytes.length,
    read(offset, length) {
      const start = Math.min(Math.max(0, offset), bytes.length);
      return bytes.subarray(start, Math.min(bytes.length, start + Math.max(0, length)));
    },
  };
}

/** An `ArrayBuffer` holding exactly these bytes (the underlying one when the view covers it all). */
export function exactBuffer(bytes: Uint8Array): ArrayBuffer {
  const buffer = bytes.buffer;
  if (buffer instanceof ArrayBuffer && bytes.byteOffset === 0 && bytes.byteLength === buffer.byteLength) {
    return buffer;
  }
  return new Uint8Array(bytes).buffer as ArrayBuffer; // a copy, also for Buffer views of a pool
}

/** The message of anything thrown (some decoders throw strings). */
export function messageOf(error: unknown): string {
  if (error instanceof Error) return error.message;
  return String(error);
}
