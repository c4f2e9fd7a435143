// Files that appear whole or not at all: written to a temporary name beside the target, then
// renamed over it. A failed run leaves the previous file untouched.
import { closeSync, openSync, renameSync, unlinkSync, writeSync, mkdirSync } from "node:fs";
import { dirname } from "node:path";

export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  const w = new AtomicWriter(path);
  try {
    w.write(data);
    w.commit();
  } catch (err) {
    w.abort();
    throw err;
  }
}

/** Streams text to `path` through a temporary file; `commit` renames it into place. */
export class AtomicWriter {
  readonly path: string;
  private tmp: string;
  private fd: number | undefined;

  constructor(path: string) {
    this.path = path;
    mkdirSync(dirname(path), { recursive: true });
    this.tmp = `${path}.tmp-${process.pid}-${Math.random().toString(36).slice(2, 8)}`;
    this.fd = openSync(this.tmp, "w");
  }

  write(data: string | Uint8Array): void {
    if (this.fd === undefined) throw new Error(`${this.path}: already closed`);
    if (typeof data === "string") writeSync(this.fd, data);
    else writeSync(this.fd, data, 0, data.length);
  }

  commit(): void {
    if (this.fd === undefined) return;
    closeSync(this.fd);
    this.fd = undefined;
    renameSync(this.tmp, this.path);
  }

  abort(): void {
    if (this.fd !== undefined) {
      try { closeSync(this.fd); } catch { /* already failing */ }
      this.fd = undefined;
    }
    try { unlinkSync(this.tmp); } catch { /* nothing to remove */ }
  }
}

/**
 * The track table (header, then one row per track in id order) written atomically in batches,
 * so that its memory does not grow with the number of tracks. Returns the rows written.
 */
export function writeTrackTable(path: string, header: string, tracks: number, rowsOf: (start: number, end: number) => string): number {
  const w = new AtomicWriter(path);
  try {
    w.write(header);
    for (let s = 0; s < tracks; s += TRACK_BATCH) w.write(rowsOf(s, Math.min(tracks, s + TRACK_BATCH)));
    w.commit();
  } catch (err) {
    w.abort();
    throw err;
  }
  return tracks;
}

const TRACK_BATCH = 4096;
