/**
 * Seeded uniform random numbers for reproducible resampling (bootstrap intervals): mulberry32, a public-domain
 * 32-bit generator by Tommy Ettinger (common practice, no formal publication). Same seed, same sequence, on
 * every machine, so a skill interval printed today can be reproduced exactly.
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
