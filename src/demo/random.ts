// Seeded pseudo-random numbers for generated data (mulberry32; Box-Muller normals).

/** Uniform numbers in [0, 1) from a 32-bit seed (mulberry32). */
export function uniformSource(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal numbers (Box-Muller) from a 32-bit seed. */
export function normalSource(seed: number): () => number {
  const u = uniformSource(seed);
  let spare: number | undefined;
  return () => {
    if (spare !== undefined) { const s = spare; spare = undefined; return s; }
    let r = 0, a = 0;
    do { r = u(); } while (r <= 1e-300);
    a = u();
    const m = Math.sqrt(-2 * Math.log(r));
    spare = m * Math.sin(2 * Math.PI * a);
    return m * Math.cos(2 * Math.PI * a);
  };
}
