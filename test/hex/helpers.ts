// Hexagonal frames for tests: drawn as rows of '#' (up) and '.' (down) in offset rows (odd rows
// shifted right by half a site; whitespace in a drawing is ignored, so odd rows may be indented
// to show it), and the lattice's symmetries through axial coordinates.
import type { Frame } from "../../src/types";

export type Bits = Frame & { data: Uint8Array };

export function hexGrid(...rows: string[]): Bits {
  const lines = rows.flatMap((r) => r.split("\n")).map((r) => r.replace(/\s+/g, "")).filter((r) => r.length > 0);
  const height = lines.length, width = lines[0]!.length;
  const data = new Uint8Array(width * height);
  lines.forEach((line, y) => {
    if (line.length !== width) throw new Error(`hex grid row ${y} has ${line.length} sites, expected ${width}`);
    for (let x = 0; x < width; x++) data[y * width + x] = line[x] === "#" ? 1 : 0;
  });
  return { width, height, data };
}

/** Offset (x, y) -> axial (a, b): the site sits at a + b/2 along x and b sqrt(3)/2 down. */
export function toAxial(x: number, y: number): [number, number] {
  return [x - Math.floor(y / 2), y];
}
export function fromAxial(a: number, b: number): [number, number] {
  return [a + Math.floor(b / 2), b];
}

/** Rotation by 60 degrees about site (cx, cy) (cy even), into a frame of the same size; sites leaving it are an error. */
export function rotate60(f: Bits, cx: number, cy: number, background = 0): Bits {
  const { width: w, height: h } = f;
  const out = new Uint8Array(w * h).fill(background);
  const [ca, cb] = toAxial(cx, cy);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    const v = f.data[y * w + x]!;
    if (v === background) continue;
    const [a, b] = toAxial(x, y);
    const da = a - ca, db = b - cb;
    // e1 -> e2, e2 -> e2 - e1 for e1 = (1, 0), e2 = (1/2, sqrt(3)/2).
    const [nx, ny] = fromAxial(ca - db, cb + da + db);
    if (nx < 0 || ny < 0 || nx >= w || ny >= h) throw new Error("rotate60: a site left the frame");
    out[ny * w + nx] = v;
  }
  return { width: w, height: h, data: out };
}

/** Sites of an offset-row frame whose physical position satisfies `inside(X, Y)` are up. */
export function hexShape(w: number, h: number, inside: (X: number, Y: number) => boolean): Bits {
  const data = new Uint8Array(w * h);
  const r = Math.sqrt(3) / 2;
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) data[y * w + x] = inside(x + (y & 1) / 2, y * r) ? 1 : 0;
  return { width: w, height: h, data };
}

export function squareShape(w: number, h: number, inside: (X: number, Y: number) => boolean): Bits {
  const data = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) data[y * w + x] = inside(x, y) ? 1 : 0;
  return { width: w, height: h, data };
}
