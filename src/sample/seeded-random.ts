/**
 * Deterministic pseudo-random numbers for the synthetic inputs: mulberry32 (Tommy Ettinger, 2017, public-domain
 * 32-bit generator) and the Box–Muller transform (Box & Muller, 1958, "A note on the generation of random
 * normal deviates", Ann. Math. Statist. 29:610). Same seed → same sequence on every platform.
 */

export interface SeededRandom {
  /** Uniform on [0, 1). */
  uniform(): number;
  /** Standard normal. */
  normal(): number;
}

/** A 32-bit seed mixed from a number and labels, so each file/variable gets an independent stream. */
export function deriveSeed(seed: number, ...labels: readonly (string | number)[]): number {
  let h = (seed ^ 0x9e3779b9) >>> 0;
  for (const ch of labels.join('/')) {
    h = Math.imul(h ^ ch.charCodeAt(0), 0x85ebca6b) >>> 0;
    h = (h ^ (h >>> 13)) >>> 0;
  }
  return h;
}

export function createRandom(seed: number): SeededRandom {
  let a = seed >>> 0;
  let spare = NaN;
  const uniform = (): number => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = (): number => {
    if (!Number.isNaN(spare)) {
      const s = spare;
      spare = NaN;
      return s;
    }
    const u = 1 - uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    const theta = 2 * Math.PI * uniform();
    spare = r * Math.sin(theta);
    return r * Math.cos(theta);
  };
  return { uniform, normal };
}

/**
 * Unit-variance first-order autoregressive series x[t] = φ x[t-1] + sqrt(1-φ²) ε[t], φ = exp(-1/τ) for an
 * e-folding time τ in steps; x[0] is drawn from the stationary distribution.
 */
export function ar1Series(rng: SeededRandom, length: number, efoldSteps: number): Float64Array {
  const phi = Math.exp(-1 / efoldSteps);
  const innovation = Math.sqrt(1 - phi * phi);
  const x = new Float64Array(length);
  let v = rng.normal();
  for (let t = 0; t < length; t++) {
    if (t > 0) v = phi * v + innovation * rng.normal();
    x[t] = v;
  }
  return x;
}
