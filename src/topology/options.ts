// Options of a frame analysis, their defaults and their validation.
import { checkChoice, checkNumber, checkPositive } from "../frame";
import type { ThresholdOption } from "../prep/threshold";
import type { SpectrumOptions } from "../spectrum/options";
import type { SkeletonOptions } from "./skeleton-analysis";

/** Skeleton options set per analysis (sides, connectivity and pixel size come from the frame options). */
export type FrameSkeletonOptions = Pick<SkeletonOptions, "spurFactor" | "junctionMergeFactor" | "bubbleMaxAspect" | "thinning">;

export type Boundary = "open" | "periodic" | "periodic-x" | "periodic-y";
/**
 * Connectivity of the up phase; the down phase gets the complement (8 <-> 4) so that the two
 * phases' topologies agree. `'saddle'` decides each diagonal quad from the grey samples: the
 * diagonal pair on whose side the quad's mean falls is joined (asymptotic decider).
 *
 * ```
 *  8-connected       4-connected       a diagonal quad   # . <- up pair (#) joined under 8,
 *   # # #               #               (saddle)         . #    down pair (.) joined under 4
 *   # o #             # o #
 *   # # #               #
 * ```
 */
export type Connectivity = 8 | 4 | "saddle";

/**
 * Lattice of the samples. `'square'`: sample (x, y) at (x, y). `'hex'`: a hexagonal (triangular)
 * lattice stored in offset rows: row y is shifted right by half a site when y is odd, so site
 * (x, y) sits at (x + (y & 1) / 2, y * sqrt(3) / 2) in lattice constants, and its six neighbours
 * are (x +- 1, y) and, in rows y +- 1, (x - 1 + (y & 1), y +- 1) and (x + (y & 1), y +- 1).
 * `pixelSize` is then the lattice constant (nearest-neighbour distance); each site covers
 * sqrt(3)/2 pixelSize^2. Both phases are six-connected (`connectivity` is not used). A periodic
 * y side needs an even height, periodic sides at least 3 sites (x) and 4 rows (y).
 */
export type Grid = "square" | "hex";

export interface FrameOptions {
  /** Lattice of the samples: square pixels or offset-row hexagonal sites (see Grid). @default 'square' */
  grid?: Grid;
  /** Level between down and up in sample units, `'otsu'` per frame, or `'zero'`. @default 'otsu' */
  threshold?: ThresholdOption;
  /** Take dark samples as up (by default bright = up). @default false */
  invert?: boolean;
  /** Connectivity of the up phase (down gets the other one). @default 8 */
  connectivity?: Connectivity;
  /** Open image sides, or periodic ones (simulations on a torus). @default 'open' */
  boundary?: Boundary;
  /** Domains smaller than this many pixels are absorbed into the surrounding phase. @default 0 */
  minDomainArea?: number;
  /** Length of one pixel in `unit`; lengths, areas and densities are reported in it. @default 1 */
  pixelSize?: number;
  /** Name of the length unit. @default 'px' (or 'unit' when pixelSize is given without one) */
  unit?: string;
  /** Keep a copy of the label image (domain ids 1..K) in the result. @default false */
  keepLabels?: boolean;
  /**
   * Power spectrum, period, correlation length and orientational order of the frame, or
   * `'off'`. By default of the +-1 phase map; `{signal: 'grey'}` uses the samples. Pixel size,
   * unit and boundary come from the frame options. @default {}
   */
  spectrum?: "off" | Omit<SpectrumOptions, "pixelSize" | "lengthUnit" | "boundary">;
  /**
   * Skeletons, ends and junctions, and the kind of every domain (bubble, stripe, labyrinth),
   * or `'off'`. @default {}
   */
  skeleton?: "off" | FrameSkeletonOptions;
}

export interface ResolvedFrameOptions {
  grid: Grid;
  threshold: ThresholdOption;
  invert: boolean;
  connectivity: Connectivity;
  boundary: Boundary;
  minDomainArea: number;
  pixelSize: number;
  unit: string;
  keepLabels: boolean;
  spectrum: "off" | Omit<SpectrumOptions, "pixelSize" | "lengthUnit" | "boundary">;
  skeleton: "off" | FrameSkeletonOptions;
}

const KNOWN = new Set([
  "grid", "threshold", "invert", "connectivity", "boundary", "minDomainArea", "pixelSize", "unit",
  "keepLabels", "spectrum", "skeleton",
]);

export function resolveFrameOptions(options: FrameOptions = {}): ResolvedFrameOptions {
  if (options === null || typeof options !== "object") {
    throw new Error(`options: expected an object, got ${String(options)}`);
  }
  for (const key of Object.keys(options)) {
    if (!KNOWN.has(key)) {
      throw new Error(`options.${key}: unknown option (known: ${[...KNOWN].join(", ")})`);
    }
  }
  const grid = checkChoice("options.grid", options.grid ?? "square", ["square", "hex"] as const);
  const threshold = options.threshold ?? "otsu";
  if (typeof threshold === "number") {
    if (!Number.isFinite(threshold)) {
      throw new Error(`options.threshold: expected a finite number, "otsu" or "zero", got ${threshold}`);
    }
  } else {
    checkChoice("options.threshold", threshold, ["otsu", "zero"] as const);
  }
  const invert = options.invert ?? false;
  if (typeof invert !== "boolean") {
    throw new Error(`options.invert: expected true or false, got ${String(invert)}`);
  }
  const connectivity = checkChoice("options.connectivity", options.connectivity ?? 8, [8, 4, "saddle"] as const);
  const boundary = checkChoice(
    "options.boundary", options.boundary ?? "open", ["open", "periodic", "periodic-x", "periodic-y"] as const,
  );
  const minDomainArea = checkNumber("options.minDomainArea", options.minDomainArea ?? 0, 0);
  if (!Number.isInteger(minDomainArea)) {
    throw new Error(`options.minDomainArea: expected a whole number of pixels, got ${minDomainArea}`);
  }
  const pixelSize = checkPositive("options.pixelSize", options.pixelSize ?? 1);
  const unit = options.unit ?? (options.pixelSize === undefined ? "px" : "unit");
  if (typeof unit !== "string" || unit.length === 0) {
    throw new Error(`options.unit: expected a non-empty string, got ${String(unit)}`);
  }
  const keepLabels = options.keepLabels ?? false;
  const spectrum = options.spectrum ?? {};
  if (spectrum !== "off" && (spectrum === null || typeof spectrum !== "object")) {
    throw new Error(`options.spectrum: expected "off" or an object of spectrum options, got ${String(spectrum)}`);
  }
  for (const key of ["pixelSize", "lengthUnit", "boundary"]) {
    if (spectrum !== "off" && key in spectrum) {
      throw new Error(`options.spectrum.${key}: set it on the frame options (options.${key === "lengthUnit" ? "unit" : key})`);
    }
  }
  const skeleton = options.skeleton ?? {};
  if (skeleton !== "off") {
    if (skeleton === null || typeof skeleton !== "object") {
      throw new Error(`options.skeleton: expected "off" or an object of skeleton options, got ${String(skeleton)}`);
    }
    for (const key of Object.keys(skeleton)) {
      if (!["spurFactor", "junctionMergeFactor", "bubbleMaxAspect", "thinning"].includes(key)) {
        throw new Error(`options.skeleton.${key}: unknown or set on the frame options (known: spurFactor, junctionMergeFactor, bubbleMaxAspect, thinning)`);
      }
    }
  }
  return { grid, threshold, invert, connectivity, boundary, minDomainArea, pixelSize, unit, keepLabels, spectrum, skeleton };
}

/**
 * Checks that a frame of this shape can carry a hexagonal lattice with these sides: a periodic y
 * side needs an even number of rows (the row parity must agree across the wrap) and at least 4,
 * a periodic x side at least 3 sites (so no site is its own neighbour).
 */
export function checkHexShape(width: number, height: number, boundary: Boundary, where = "frame"): void {
  const px = boundary === "periodic" || boundary === "periodic-x";
  const py = boundary === "periodic" || boundary === "periodic-y";
  if (py && height % 2 !== 0) {
    throw new Error(`${where}: a hexagonal frame periodic in y needs an even height (odd rows are shifted by half a site), got ${height}`);
  }
  if (py && height < 4) throw new Error(`${where}: a hexagonal frame periodic in y needs at least 4 rows, got ${height}`);
  if (px && width < 3) throw new Error(`${where}: a hexagonal frame periodic in x needs at least 3 sites a row, got ${width}`);
}
