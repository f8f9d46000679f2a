// Small seeded pseudo-random generator so that bootstrap intervals are reproducible:
// the same data and seed give the same interval on the server, in the browser and in
// tests. Statistical quality is ample for resampling; it is not for cryptography.

/** mulberry32 generator: returns a function yielding uniform numbers in [0, 1). */
export function mulberry32(seed: number): () => number {
  if (!Number.isFinite(seed)) throw new RangeError(`mulberry32: seed must be a finite number (got ${seed})`);
  let state = Math.trunc(seed) >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
