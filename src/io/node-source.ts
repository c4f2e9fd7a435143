// Node-only: frame sources over files, folders and file-name patterns. Only headers are read
// when the source is built; a frame's bytes are read when it is asked for: a PNG file whole, a
// TIFF file whole (one file kept at a time), a .npy frame by positioned reads at its offset, so a
// stack larger than memory can be walked frame by frame.

import { closeSync, fstatSync, openSync, readdirSync, readFileSync, readSync, statSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import type { Frame } from "../types";
import type { ByteReader } from "./bytes";
import { naturalSort } from "./natural";
import { parseNpyHeader, readNpyFrame } from "./npy";
import { decodeApng, decodePng, inspectPng } from "./png";
import type { FrameContainer, FrameFormat, FrameSource } from "./source";
import { detectFormat, sourceFromContainers } from "./source";
import { countTiffPages, openTiff } from "./tiff";
import type { TiffStack } from "./tiff";

/** Extensions of files meant as frames: in a folder, other files with unknown content are skipped. */
const FRAME_EXTENSIONS = /\.(png|apng|tif|tiff|npy)$/i;

/** Runs `use` with a positioned reader over the file, closing it afterwards. */
export function withFileReader<T>(path: string, use: (reader: ByteReader) => T): T {
  const fd = openSync(path, "r");
  try {
    const size = fstatSync(fd).size;
    const reader: ByteReader = {
      size,
      read(offset, length) {
        const start = Math.min(Math.max(0, offset), size);
        const n = Math.max(0, Math.min(length, size - start));
        const out = new Uint8Array(n);
        let done = 0;
        while (done < n) {
          const got = readSync(fd, out, done, n - done, start + done);
          if (got === 0) break;
          done += got;
        }
        return done === n ? out : out.subarray(0, done);
      },
    };
    return use(reader);
  } finally {
    closeSync(fd);
  }
}

function sniff(path: string): FrameFormat | null {
  return withFileReader(path, (r) => detectFormat(r.read(0, 8)));
}

function hasWildcard(text: string): boolean {
  return /[*?[]/.test(text);
}

/** A file-name glob (`*`, `?`, `[...]`) as a regular expression over whole names. */
function globToRegExp(glob: string): RegExp {
  let out = "";
  for (let i = 0; i < glob.length; i++) {
    const c = glob[i];
    if (c === "*") out += "[^/]*";
    else if (c === "?") out += "[^/]";
    else if (c === "[") {
      const end = glob.indexOf("]", i + 1);
      if (end < 0) out += "\\[";
      else {
        let body = glob.slice(i + 1, end);
        if (body.startsWith("!")) body = "^" + body.slice(1);
        out += `[${body.replace(/\\/g, "\\\\")}]`;
        i = end;
      }
    } else out += c.replace(/[.+^${}()|\\]/g, "\\$&");
  }
  return new RegExp(`^${out}$`);
}

function framesInFolder(folder: string, pattern: RegExp | null, what: string): string[] {
  const names = readdirSync(folder, { withFileTypes: true })
    .filter((e) => e.isFile() && !e.name.startsWith("."))
    .map((e) => e.name)
    .filter((n) => pattern === null || pattern.test(n));
  const frames = naturalSort(names)
    .map((n) => join(folder, n))
    .filter((p) => sniff(p) !== null || FRAME_EXTENSIONS.test(p));
  if (frames.length === 0) throw new Error(`${what}: no PNG, TIFF or .npy files`);
  return frames;
}

/**
 * The frame files named by `inputs`, in order: a file stands for itself; a folder for its
 * PNG / TIFF / .npy files (found by magic bytes; hidden files and files that are neither frames
 * by content nor by extension are skipped) in natural order; a pattern with `*`, `?` or `[...]`
 * in its last path segment for the matching files of that folder, likewise.
 */
export function listFrameFiles(inputs: string | readonly string[]): string[] {
  const list = typeof inputs === "string" ? [inputs] : inputs;
  const files: string[] = [];
  for (const input of list) {
    const name = basename(input);
    const dir = dirname(input);
    if (hasWildcard(name)) {
      if (hasWildcard(dir)) throw new Error(`${input}: wildcards are supported in the file-name part only`);
      files.push(...framesInFolder(dir, globToRegExp(name), input));
    } else if (statOf(input).isDirectory()) {
      files.push(...framesInFolder(input, null, input));
    } else {
      files.push(input);
    }
  }
  return files;
}

function statOf(path: string) {
  try {
    return statSync(path);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === "ENOENT") throw new Error(`${path}: no such file or folder`);
    throw new Error(`${path}: cannot read (${code ?? (err as Error).message})`);
  }
}

function fileContainer(path: string, keep: { tiff: { path: string; stack: TiffStack } | null }): FrameContainer {
  const format = sniff(path);
  if (format === null) throw new Error(`${path}: not a PNG, TIFF or .npy file by its first bytes`);
  if (format === "png") {
    const info = withFileReader(path, (r) => inspectPng(r, path));
    if (!info.animated) return { name: path, count: 1, unit: "frame", read: () => decodePng(readFileSync(path), path) };
    let frames: Frame[] | null = null;
    return {
      name: path,
      count: info.frameCount,
      unit: "frame",
      read: (k) => (frames ??= decodeApng(readFileSync(path), path))[k],
      release: () => {
        frames = null;
      },
    };
  }
  if (format === "tiff") {
    const count = withFileReader(path, (r) => countTiffPages(r, path));
    return {
      name: path,
      count,
      unit: "page",
      read(k) {
        if (keep.tiff === null || keep.tiff.path !== path) keep.tiff = { path, stack: openTiff(readFileSync(path), path) };
        return keep.tiff.stack.readPage(k);
      },
      release() {
        if (keep.tiff?.path === path) keep.tiff = null;
      },
    };
  }
  const header = withFileReader(path, (r) => parseNpyHeader(r, path));
  return {
    name: path,
    count: header.frameCount,
    unit: "frame",
    read: (k) => withFileReader(path, (r) => readNpyFrame(r, k, path, header)),
  };
}

/**
 * A frame source over files, folders and file-name patterns (see {@link listFrameFiles}).
 * Headers are read now; a file with an unknown or damaged header counts as one frame whose read
 * fails with the error naming the file.
 */
export function openFrameFiles(inputs: string | readonly string[]): FrameSource {
  const keep: { tiff: { path: string; stack: TiffStack } | null } = { tiff: null };
  return sourceFromContainers(listFrameFiles(inputs).map((p) => {
    try {
      return fileContainer(p, keep);
    } catch (err) {
      // A file whose header cannot be read stands for one frame that fails when read, so that a
      // damaged file in a long series is reported by its frame and does not stop the run.
      const error = err instanceof Error ? err : new Error(String(err));
      return { name: p, count: 1, unit: "frame", read: () => { throw error; } } satisfies FrameContainer;
    }
  }));
}
