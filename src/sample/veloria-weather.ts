/**
 * Synthetic daily weather of Veloria: one "true" anomaly history (what the observations show) and
 * ensemble members that share a lead-dependent part of it, so hindcasts have real but imperfect skill.
 *
 * Anomaly model (invented for the demo): a temperature group (tasmax, tasmin, tdps) and a rain group, each
 * with two fast unit AR(1) modes (e-folding 4 days; uniform and east–west patterns) and one slow mode
 * (e-folding 45 days). A member started on day s keeps a fraction ρ of the truth and replaces the rest by
 * its own noise of the same variance (reliable by construction): ρ_fast = 0.97·exp(−lead/7 days),
 * ρ_slow = 0.55. On top come the 2026 scenario signals (heat spell, Orrin Coast wet anomaly).
 */
import { ar1Series, createRandom, deriveSeed, type SeededRandom } from './seeded-random.ts';
import { climatologyOf, seasonOf, type CellGeography, type DailyClimate } from './veloria-climate.ts';

const DAY_MS = 86_400_000;
export const dayNumberOf = (iso: string): number => Math.round(Date.parse(`${iso}T00:00:00Z`) / DAY_MS);

/** The truth history spans every target day of the sample files. */
const TRUTH_FIRST = dayNumberOf('2006-01-01');
const TRUTH_DAYS = dayNumberOf('2028-01-01') - TRUTH_FIRST;

/** Anomaly standard deviations (K; rain: natural-log multiplier). */
const SIGMA = {
  tmax: { fast: 1.3, slow: 0.5, local: 0.5 },
  tmin: { fast: 0.8, slow: 0.4, local: 0.4 },
  dewpoint: { fast: 0.9, slow: 0.4, local: 0.5 },
  rain: { fast: 0.5, slow: 0.35 },
};
/** 2026 heat-spell peak amplitudes over the lowlands (K). */
const HEAT_AMPLITUDE = { tmax: 4.5, tmin: 2.5, dewpoint: 1.2 };
/** 2026 Orrin Coast wet anomaly: log rain multiplier and dewpoint rise (K) at full strength. */
const WET_AMPLITUDE = { rainLog: 0.7, dewpoint: 0.6 };

/** Fast, slow mode series of one group: [fast uniform, fast east–west, slow]. */
type Modes = readonly [Float64Array, Float64Array, Float64Array];

export interface TruthHistory {
  readonly heat: Modes;
  readonly rain: Modes;
}

const modes = (rng: SeededRandom, n: number): Modes => [ar1Series(rng, n, 4), ar1Series(rng, n, 4), ar1Series(rng, n, 45)];

export function createTruth(seed: number): TruthHistory {
  const rng = createRandom(deriveSeed(seed, 'truth'));
  return { heat: modes(rng, TRUTH_DAYS), rain: modes(rng, TRUTH_DAYS) };
}

const smoothstep = (x: number): number => (x <= 0 ? 0 : x >= 1 ? 1 : x * x * (3 - 2 * x));

/** Trapezoid 0→1→0 over day numbers: rise a→b, hold b→c, fall c→d. */
function trapezoid(day: number, a: number, b: number, c: number, d: number): number {
  if (day <= a || day >= d) return 0;
  if (day < b) return smoothstep((day - a) / (b - a));
  if (day <= c) return 1;
  return 1 - smoothstep((day - c) / (d - c));
}

const HEAT_DAYS = ['2026-11-28', '2026-12-06', '2026-12-14', '2026-12-21'].map(dayNumberOf);
const WET_DAYS = ['2026-12-05', '2027-01-05', '2027-03-31', '2027-04-30'].map(dayNumberOf);
const heatSpell = (day: number): number => trapezoid(day, HEAT_DAYS[0], HEAT_DAYS[1], HEAT_DAYS[2], HEAT_DAYS[3]);
const wetSpell = (day: number): number => trapezoid(day, WET_DAYS[0], WET_DAYS[1], WET_DAYS[2], WET_DAYS[3]);

/** How strongly the members of a forecast issued on `issueDay` carry the heat spell: 0.45 on 11-23 → 1 on 11-30. */
function heatConfidence(issueDay: number): number {
  return Math.max(0.45, Math.min(1, 0.45 + ((issueDay - dayNumberOf('2026-11-23')) * 0.55) / 7));
}

/** How a source's model differs from the truth. */
export interface ModelTraits {
  readonly biasK: number;
  readonly precipFactor: number;
  /** 'flux': daily mean kg m-2 s-1; 'accumulated': m since the reference time (de-accumulate to get days). */
  readonly precip: 'flux' | 'accumulated';
}

/** One member's (or the truth's) anomaly state of one day, in units of SIGMA. */
interface DayState {
  fast0: number;
  fast1: number;
  slow: number;
  rainFast0: number;
  rainFast1: number;
  rainSlow: number;
  heat: number;
  wet: number;
}

/** Writes the four fields (tasmax, tasmin, tdps in K; precipitation) of one day into `out[v][offset + c]`. */
function writeDay(
  g: CellGeography,
  rng: SeededRandom,
  day: number,
  s: DayState,
  traits: ModelTraits,
  accum: Float64Array,
  out: readonly Float32Array[],
  offset: number,
): void {
  const season = seasonOf(day);
  const clim: DailyClimate = { tmaxC: 0, tminC: 0, dewpointC: 0, precipMmPerDay: 0 };
  const pWet = 0.35 + 0.45 * season.rainSeason;
  const rainVar = SIGMA.rain.fast ** 2 * 1.25 + SIGMA.rain.slow ** 2;
  for (let c = 0; c < g.cells; c++) {
    const i = offset + c;
    if (!g.valid[c]) {
      out[0][i] = out[1][i] = out[2][i] = out[3][i] = NaN;
      continue;
    }
    climatologyOf(g, c, season, clim);
    const fast = s.fast0 + 0.7 * s.fast1 * g.eastWest[c];
    const slow = s.slow * (1 + 0.3 * g.lowland[c]);
    const heat = s.heat * g.lowland[c];
    const tmaxC =
      clim.tmaxC +
      traits.biasK +
      SIGMA.tmax.fast * fast +
      SIGMA.tmax.slow * slow +
      SIGMA.tmax.local * rng.normal() +
      HEAT_AMPLITUDE.tmax * heat;
    const tminC =
      clim.tminC +
      traits.biasK +
      SIGMA.tmin.fast * fast +
      SIGMA.tmin.slow * slow +
      SIGMA.tmin.local * rng.normal() +
      HEAT_AMPLITUDE.tmin * heat;
    const dewC =
      clim.dewpointC +
      SIGMA.dewpoint.fast * fast +
      SIGMA.dewpoint.slow * slow +
      SIGMA.dewpoint.local * rng.normal() +
      HEAT_AMPLITUDE.dewpoint * heat +
      WET_AMPLITUDE.dewpoint * s.wet * g.orrin[c];
    const rainLog =
      SIGMA.rain.fast * (s.rainFast0 + 0.7 * s.rainFast1 * g.eastWest[c]) +
      SIGMA.rain.slow * s.rainSlow +
      WET_AMPLITUDE.rainLog * s.wet * g.orrin[c] -
      rainVar / 2;
    const meanMm = clim.precipMmPerDay * traits.precipFactor * Math.exp(rainLog);
    const rainMm = rng.uniform() < pWet ? (meanMm / pWet) * -Math.log(1 - rng.uniform()) : 0;
    out[0][i] = tmaxC + 273.15;
    out[1][i] = Math.min(tminC, tmaxC - 1) + 273.15;
    out[2][i] = Math.min(dewC, tmaxC - 1) + 273.15;
    if (traits.precip === 'flux') out[3][i] = rainMm / 86_400;
    else out[3][i] = accum[c] += rainMm / 1000;
  }
}

/** A run of days of one member (or of the truth) starting at day number `start`. */
export interface RunSpec {
  readonly geography: CellGeography;
  readonly start: number;
  readonly days: number;
  readonly traits: ModelTraits;
}

/**
 * Fills one member's slabs (`out[v]`: days × cells) for a forecast issued on `run.start`. `streamTag` names
 * the file, so every (file, member) has its own reproducible random stream.
 */
export function fillMember(
  truth: TruthHistory,
  run: RunSpec,
  seed: number,
  streamTag: string,
  member: number,
  out: readonly Float32Array[],
): void {
  const rng = createRandom(deriveSeed(seed, streamTag, member));
  const own = { heat: modes(rng, run.days), rain: modes(rng, run.days) };
  const heatFactor = Math.max(0, Math.min(1.5, heatConfidence(run.start) + 0.3 * rng.normal()));
  const wetFactor = Math.max(0, Math.min(1.5, 0.8 + 0.3 * rng.normal()));
  const rhoSlow = 0.55;
  const keepSlow = Math.sqrt(1 - rhoSlow * rhoSlow);
  const accum = new Float64Array(run.geography.cells);
  const s: DayState = { fast0: 0, fast1: 0, slow: 0, rainFast0: 0, rainFast1: 0, rainSlow: 0, heat: 0, wet: 0 };
  for (let t = 0; t < run.days; t++) {
    const day = run.start + t;
    const j = day - TRUTH_FIRST;
    const rho = 0.97 * Math.exp(-t / 7);
    const keep = Math.sqrt(1 - rho * rho);
    s.fast0 = rho * truth.heat[0][j] + keep * own.heat[0][t];
    s.fast1 = rho * truth.heat[1][j] + keep * own.heat[1][t];
    s.slow = rhoSlow * truth.heat[2][j] + keepSlow * own.heat[2][t];
    s.rainFast0 = rho * truth.rain[0][j] + keep * own.rain[0][t];
    s.rainFast1 = rho * truth.rain[1][j] + keep * own.rain[1][t];
    s.rainSlow = rhoSlow * truth.rain[2][j] + keepSlow * own.rain[2][t];
    s.heat = heatSpell(day) * heatFactor;
    s.wet = wetSpell(day) * wetFactor;
    writeDay(run.geography, rng, day, s, run.traits, accum, out, t * run.geography.cells);
  }
}

/** A day-by-day filler of the observations (the truth itself plus local noise), first day `start`. */
export function observedFiller(
  truth: TruthHistory,
  geography: CellGeography,
  start: number,
  seed: number,
): (t: number, out: readonly Float32Array[]) => void {
  const rng = createRandom(deriveSeed(seed, 'observed'));
  const traits: ModelTraits = { biasK: 0, precipFactor: 1, precip: 'flux' };
  const accum = new Float64Array(geography.cells);
  const s: DayState = { fast0: 0, fast1: 0, slow: 0, rainFast0: 0, rainFast1: 0, rainSlow: 0, heat: 0, wet: 0 };
  return (t, out) => {
    const day = start + t;
    const j = day - TRUTH_FIRST;
    [s.fast0, s.fast1, s.slow] = [truth.heat[0][j], truth.heat[1][j], truth.heat[2][j]];
    [s.rainFast0, s.rainFast1, s.rainSlow] = [truth.rain[0][j], truth.rain[1][j], truth.rain[2][j]];
    s.heat = heatSpell(day);
    s.wet = wetSpell(day);
    writeDay(geography, rng, day, s, traits, accum, out, 0);
  };
}
