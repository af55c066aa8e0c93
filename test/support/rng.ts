/** Seeded test randomness: mulberry32 (shared with the bootstrap, src/calibrate/seeded-random.ts) and Box-Muller normals. */
export { mulberry32 } from '../../src/calibrate/seeded-random.ts';

export function normal(rand: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
}
