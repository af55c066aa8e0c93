/**
 * Exact area on the sphere of (grid cell ∩ polygon).
 *
 * Geometry model: polygon edges are straight lines in longitude/latitude (RFC 7946 §3.1.1: "a line between two
 * positions is a straight Cartesian line … in the coordinate reference system"), and a grid cell is the
 * longitude/latitude rectangle between its bounds (its north and south edges are parallels, which are straight
 * lines in that plane too). Clipping therefore happens in the (λ, φ) plane, exactly, with the Sutherland–Hodgman
 * algorithm (Sutherland & Hodgman 1974, "Reentrant polygon clipping", CACM 17(1)) against the cell's four
 * half-planes; the clipped rings may contain zero-width slivers along the cell edges, which carry no area.
 *
 * Area of a clipped ring on the unit sphere, by Green's theorem: A = ∬ cos φ dφ dλ = −∮ (sin φ − sin φ0) dλ
 * (counter-clockwise positive; φ0 is any constant, chosen inside the cell to avoid cancellation). Along a
 * straight segment (λ1, φ1) → (λ2, φ2) the integral is exact in closed form:
 *   ∫ sin φ dλ = Δλ · sin(m) · sin(h)/h,  m = (φ1 + φ2)/2, h = (φ2 − φ1)/2   (h → 0: Δλ · sin φ1).
 * No approximation beyond floating point; valid for any latitudes in [−90°, 90°] and cells of any size.
 * Holes are subtracted (|outer ∩ cell| − Σ |hole ∩ cell|), so either winding order gives the same area.
 */
import type { Ring } from '../config/types.ts';

const DEG = Math.PI / 180;

/** sin(h)/h − 1, accurate near 0. */
function sincMinusOne(h: number): number {
  const h2 = h * h;
  return Math.abs(h) < 1e-3 ? -h2 / 6 + (h2 * h2) / 120 : Math.sin(h) / h - 1;
}

/** Signed spherical area (steradians, counter-clockwise positive) of a ring given as flat [λ0, φ0, λ1, φ1, …] in degrees. */
export function ringAreaSr(xy: ArrayLike<number>, n: number, refLatDeg: number): number {
  if (n < 3) return 0;
  const phi0 = refLatDeg * DEG;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const j = i + 1 === n ? 0 : i + 1;
    const dLon = (xy[2 * j] - xy[2 * i]) * DEG;
    if (dLon === 0) continue;
    const p1 = xy[2 * i + 1] * DEG;
    const p2 = xy[2 * j + 1] * DEG;
    const m = (p1 + p2) / 2;
    const h = (p2 - p1) / 2;
    // sin(m)·sinc(h) − sin φ0 = (sin m − sin φ0) + sin m · (sinc h − 1), the first term without cancellation.
    const diff = 2 * Math.cos((m + phi0) / 2) * Math.sin((m - phi0) / 2) + Math.sin(m) * sincMinusOne(h);
    sum += dLon * diff;
  }
  return -sum;
}

/** Reusable buffers for clipping (no allocation per cell). */
export class Clipper {
  private a = new Float64Array(64);
  private b = new Float64Array(64);
  /** Number of points of the last result, which is in `out`. */
  n = 0;
  out: Float64Array = this.a;

  private grow(size: number): void {
    if (this.a.length >= size) return;
    const len = Math.max(size, 2 * this.a.length);
    this.a = new Float64Array(len);
    this.b = new Float64Array(len);
  }

  /**
   * Clips the flat ring `src` (n points, not repeating the first) to lo ≤ coordinate `axis` (0 = λ, 1 = φ) ≤ hi,
   * leaving the result in `out`/`n`. `src` may be `out` of a previous call.
   */
  clip(src: Float64Array, n: number, axis: 0 | 1, lo: number, hi: number): void {
    this.grow(4 * n + 8);
    const mid = src === this.a ? this.b : this.a;
    const m = clipHalf(src, n, axis, lo, 1, mid);
    const dst = mid === this.a ? this.b : this.a;
    this.n = clipHalf(mid, m, axis, hi, -1, dst);
    this.out = dst;
  }

  /** Copies a ring into the working buffer (first point not repeated). */
  load(ring: Ring, lonShift: number): Float64Array {
    const n = ring.length - 1;
    this.grow(4 * n + 8);
    const buf = this.a;
    for (let i = 0; i < n; i++) {
      buf[2 * i] = ring[i][0] + lonShift;
      buf[2 * i + 1] = ring[i][1];
    }
    this.n = n;
    this.out = buf;
    return buf;
  }
}

/** One Sutherland–Hodgman pass: keeps side·(coord − edge) ≥ 0. Returns the point count written to `dst`. */
function clipHalf(src: Float64Array, n: number, axis: 0 | 1, edge: number, side: 1 | -1, dst: Float64Array): number {
  if (n === 0) return 0;
  let k = 0;
  let px = src[2 * (n - 1)];
  let py = src[2 * (n - 1) + 1];
  let pIn = side * ((axis === 0 ? px : py) - edge) >= 0;
  for (let i = 0; i < n; i++) {
    const cx = src[2 * i];
    const cy = src[2 * i + 1];
    const cIn = side * ((axis === 0 ? cx : cy) - edge) >= 0;
    if (cIn !== pIn) {
      const pc = axis === 0 ? px : py;
      const cc = axis === 0 ? cx : cy;
      const t = (edge - pc) / (cc - pc);
      dst[2 * k] = axis === 0 ? edge : px + t * (cx - px);
      dst[2 * k + 1] = axis === 0 ? py + t * (cy - py) : edge;
      k++;
    }
    if (cIn) {
      dst[2 * k] = cx;
      dst[2 * k + 1] = cy;
      k++;
    }
    px = cx;
    py = cy;
    pIn = cIn;
  }
  return k;
}

/** Latitude-strip piece of one ring: clipped once per grid row, then per column. */
export function clipStrip(clipper: Clipper, ring: Ring, lonShift: number, south: number, north: number): Float64Array {
  const src = clipper.load(ring, lonShift);
  clipper.clip(src, clipper.n, 1, south, north);
  return clipper.out.slice(0, 2 * clipper.n);
}

/** |area| in steradians of a strip piece (flat ring) clipped to west ≤ λ ≤ east. */
export function pieceCellArea(clipper: Clipper, piece: Float64Array, west: number, east: number, refLat: number): number {
  const n = piece.length / 2;
  if (n < 3) return 0;
  clipper.clip(piece, n, 0, west, east);
  return Math.abs(ringAreaSr(clipper.out, clipper.n, refLat));
}
