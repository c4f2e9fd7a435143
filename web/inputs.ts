// The page's inputs: files chosen, a folder chosen, or files and folders dropped, in natural
// order of their paths. Every file's header is read here (so a file that is not a frame is named
// at once); one-frame files go to the workers as bytes, stacks are read frame by frame here.
import { naturalCompare, sourceFromBytes, type FrameSource } from "../src/index";

const FRAME_EXTENSIONS = /\.(png|apng|tif|tiff|npy)$/i;
const TABLE_EXTENSIONS = /\.(csv|tsv|txt)$/i;

export interface PickedFile {
  /** Path inside a chosen folder, or the file name. */
  path: string;
  file: File;
  /** Came from inside a folder (other files there are skipped quietly). */
  inFolder: boolean;
}

export interface InputFile {
  name: string;
  bytes: Uint8Array;
  size: number;
  /** Frames it holds (0 when it could not be read). */
  count: number;
  /** Why it could not be read. */
  error?: string;
  /** For files of several frames: read one frame in the page. */
  source?: FrameSource;
}

export interface FrameRef {
  file: number;
  /** Frame inside the file. */
  k: number;
  where: string;
}

export interface Inputs {
  files: InputFile[];
  frames: FrameRef[];
  /** A field table found among the dropped files. */
  table?: { name: string; text: string };
  /** Files in folders that are not frames. */
  skipped: number;
}

/** Files of a drop, walking into folders. */
export async function filesOfDrop(data: DataTransfer): Promise<PickedFile[]> {
  const out: PickedFile[] = [];
  const entries: FileSystemEntry[] = [];
  for (const item of Array.from(data.items)) {
    const entry = item.kind === "file" ? item.webkitGetAsEntry?.() : null;
    if (entry) entries.push(entry);
  }
  if (entries.length === 0) {
    for (const file of Array.from(data.files)) out.push({ path: file.name, file, inFolder: false });
    return out;
  }
  const walk = async (entry: FileSystemEntry, prefix: string, inFolder: boolean): Promise<void> => {
    if (entry.isFile) {
      const file = await new Promise<File>((resolve, reject) => (entry as FileSystemFileEntry).file(resolve, reject));
      out.push({ path: prefix + entry.name, file, inFolder });
    } else if (entry.isDirectory) {
      const reader = (entry as FileSystemDirectoryEntry).createReader();
      for (;;) {
        const batch = await new Promise<FileSystemEntry[]>((resolve, reject) => reader.readEntries(resolve, reject));
        if (batch.length === 0) break;
        for (const child of batch) await walk(child, `${prefix}${entry.name}/`, true);
      }
    }
  };
  for (const entry of entries) await walk(entry, "", false);
  return out;
}

/** Files of an `<input type=file>` (with `webkitdirectory`, paths are inside the folder). */
export function filesOfInput(input: HTMLInputElement): PickedFile[] {
  return Array.from(input.files ?? []).map((file) => ({
    path: file.webkitRelativePath || file.name, file, inFolder: Boolean(file.webkitRelativePath),
  }));
}

export async function readInputs(picked: PickedFile[]): Promise<Inputs> {
  const sorted = [...picked].sort((a, b) => naturalCompare(a.path, b.path));
  const files: InputFile[] = [];
  const frames: FrameRef[] = [];
  let table: Inputs["table"];
  let skipped = 0;
  for (const p of sorted) {
    const base = p.path.split("/").pop() ?? p.path;
    if (base.startsWith(".")) { skipped++; continue; }
    if (TABLE_EXTENSIONS.test(base)) {
      if (!table) table = { name: p.path, text: await p.file.text() };
      else skipped++;
      continue;
    }
    if (p.inFolder && !FRAME_EXTENSIONS.test(base)) { skipped++; continue; }
    const bytes = new Uint8Array(await p.file.arrayBuffer());
    const entry: InputFile = { name: p.path, bytes, size: bytes.length, count: 0 };
    try {
      const source = sourceFromBytes([{ name: p.path, bytes }]);
      entry.count = source.count;
      if (source.count > 1) entry.source = source;
      for (let k = 0; k < source.count; k++) {
        frames.push({ file: files.length, k, where: source.describe(k) });
      }
    } catch (error) {
      entry.error = error instanceof Error ? error.message : String(error);
    }
    files.push(entry);
  }
  return { files, frames, ...(table ? { table } : {}), skipped };
}

/** Column names of a delimited table's first row (comma, tab or semicolon; "..." quoting). */
export function tableColumns(text: string): string[] {
  const line = text.replace(/^\ufeff/, "").split(/\r?\n|\r/, 1)[0] ?? "";
  const counts = { ",": 0, "\t": 0, ";": 0 } as Record<string, number>;
  let quoted = false;
  for (const c of line) {
    if (c === '"') quoted = !quoted;
    else if (!quoted && c in counts) counts[c]!++;
  }
  const delimiter = (["\t", ";", ","] as const).reduce((a, b) => (counts[b]! > counts[a]! ? b : a), ",");
  const cells: string[] = [];
  let cell = "";
  quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i]!;
    if (quoted) {
      if (c === '"' && line[i + 1] === '"') { cell += '"'; i++; } else if (c === '"') quoted = false; else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === delimiter) { cells.push(cell.trim()); cell = ""; } else cell += c;
  }
  cells.push(cell.trim());
  return cells.filter((c) => c !== "");
}
