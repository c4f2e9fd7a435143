// The raw exports of the kernel module (assembly/index.ts). Pointers and sizes are numbers.
export interface KernelExports {
  memory: WebAssembly.Memory;
  heapMark(): number;
  heapRelease(mark: number): void;
  heapAlloc(bytes: number): number;
  memoryBytes(): number;
  setGeometry(w: number, h: number, px: number, py: number, rule: number): void;
  setBuffers(phase: number, labels: number, parents: number, quads: number): void;
  thresholdU8(src: number, n: number, cut: number, invert: number): void;
  thresholdU16(src: number, n: number, cut: number, invert: number): void;
  thresholdF32(src: number, n: number, level: number, invert: number): number;
  histogramInt(src: number, n: number, bytesPerSample: number, hist: number): void;
  rangeF32(src: number, n: number, out: number): number;
  histogramF32(src: number, n: number, lo: number, hi: number, bins: number, hist: number): void;
  saddleQuads(src: number, kind: number, level: number, invert: number, quads: number): void;
  bindSpecks(labelAreas: number, componentAreas: number, componentPhases: number, marks: number): void;
  componentAreas(components: number): void;
  markSpecks(components: number, phase: number, minArea: number): number;
  absorbMarked(components: number, phase: number): number;
  labelScan(): number;
  bindComponents(q: number, sx: number, sy: number, wf: number, fin: number): void;
  resolvePeriodic(k: number): number;
  bindDomains(table: number): void;
  fillTrigTables(): void;
  measureRuns(K: number, periodic: number): void;
  measureQuads(): void;
  bindQuadAccumulators(acc: number): void;
  fft2Bytes(w: number, h: number): number;
  fft2InitScratchBytes(w: number, h: number): number;
  fft2Init(plan: number, w: number, h: number, tmp: number): number;
  fft2TRe(plan: number): number;
  fft2TIm(plan: number): number;
  fft2TStride(plan: number): number;
  fft2Forward(plan: number, src: number): number;
  spectrumPrepare(src: number, w: number, h: number, winX: number, winY: number, stats: number): number;
  spectrumRadial(plan: number, bins: number, sx: number, sy: number, sums: number, counts: number): number;
  spectrumRing(plan: number, rLo: number, rHi: number, sx: number, sy: number, angleBins: number, hist: number, moments: number): number;
  spectrumPowerCentred(plan: number, scale: number, out: number): number;
  spectrumLoadBinary(src: number, n: number, dst: number): number;
  spectrumTableBytes(w: number, ts: number, bins: number): number;
  spectrumAccumulatorBytes(bins: number): number;
  spectrumBinTable(table: number, w: number, h: number, ts: number, bins: number, sx: number, sy: number, counts: number, tre: number, tim: number, acc: number, sums: number): number;
  spectrumProfile(tre: number, tim: number, table: number, w: number, ts: number, bins: number, acc: number, sums: number): number;
  structureTensorSums(src: number, w: number, h: number, periodic: number, out: number): number;
  [more: string]: unknown;
}

// Skeleton kernels (assembly/thin.ts, assembly/edt.ts).
export interface SkeletonKernelExports {
  bindThin(skeleton: number, list: number, candidates: number, table: number): void;
  thinPhase(phase: number): number;
  thinFinish(n: number): void;
  thinBits(work: number): number;
  binarize(p: number, n: number): void;
  thinBitsBytes(width: number, height: number): number;
  thinByDistance(distance: number, counts: number, levels: number): number;
  distancePhases(out: number, vertical: number, scratch: number, cap: number): void;
}

// Skeleton pixel adjacency and the walk of the skeleton graph (assembly/skeleton-graph.ts).
export interface SkeletonGraphKernelExports {
  skeletonNeighbours(skeleton: number, neighbours: number, degrees: number, list: number): number;
  skeletonWalk(
    neighbours: number, degrees: number, list: number, count: number, distance: number, owner: number, geometry: number,
    nodes: number, nodeCap: number, branches: number, branchCap: number, stack: number, out: number, pairs: number,
  ): number;
  skeletonNeighboursCompact(
    skeleton: number, distance: number, index: number, list: number,
    compactNeighbours: number, compactDegrees: number, compactDistance: number, identity: number,
    labels: number, compactLabels: number,
  ): number;
  neighbourBitsBytes(width: number, height: number): number;
  skeletonNeighboursBits(
    skeleton: number, distance: number, work: number, list: number, compactNeighbours: number, compactDegrees: number,
    compactDistance: number, identity: number, labels: number, compactLabels: number,
  ): number;
  skeletonCompact(
    neighbours: number, degrees: number, list: number, count: number, distance: number, index: number,
    compactNeighbours: number, compactDegrees: number, compactDistance: number, identity: number,
  ): void;
  domainTotals(labels: number, phase: number, distance: number, n: number, count: number, area: number, maxDistance: number, domainPhase: number): number;
}

// Hexagonal frames (assembly/hex-label.ts, assembly/hex-thin.ts).
export interface HexKernelExports {
  hexBindLabel(labelParents: number, componentParents: number, shiftsX: number, shiftsY: number, windings: number, domainIds: number): void;
  hexLabel(): number;
  hexMeasure(K: number, columns: number, stats: number, trig: number): void;
  hexAbsorb(phase: number, minArea: number): number;
  hexThin(skeleton: number, candidates: number, list: number): number;
  hexSkeletonDistance(skeleton: number, distance: number, offsets: number, lengths: number, count: number, cap: number): void;
  hexSkeletonNeighbours(skeleton: number, neighbours: number, degrees: number, list: number): number;
}

// Runs of label pairs between two frames (assembly/overlap.ts).
export interface OverlapKernelExports {
  overlapPairs(
    prev: number, cur: number, n: number, prevCount: number, maxCur: number, prevPhase: number, curPhase: number,
    table: number, capacity: number, memo: number, outA: number, outB: number, outN: number,
  ): number;
}
