/**
 * Geography and daily climatology of the invented island of Veloria (South Atlantic, ~14°S–5°S, 5°W–5°E).
 * Everything here is invented for the demo: smooth analytic fields chosen to look like a southern-hemisphere
 * tropical maritime climate (warm season Nov–Mar, rains Dec–Apr, hot lowlands, cooler highlands).
 * No real data or place is represented.
 */
import { axis, type GridSpec } from './cf-gridded-file.ts';

/** Static properties of every grid cell, C order (lat slowest). */
export interface CellGeography {
  readonly cells: number;
  /** False for the few corner cells stored as _FillValue (open sea / outside the analysis domain). */
  readonly valid: Uint8Array;
  readonly elevationKm: Float64Array;
  /** 0..1 weight of the hot south-western lowlands (Kessan Lowlands, Tulva Delta). */
  readonly lowland: Float64Array;
  /** 0..1 weight of the wet north-eastern Orrin Coast. */
  readonly orrin: Float64Array;
  /** East–west pattern −1..1 used for spatially varying anomalies. */
  readonly eastWest: Float64Array;
}

/** The Veloria domain 4°S→16°S (descending), 6°W→6°E, at `resolutionDeg`. */
export function veloriaGrid(resolutionDeg: number): GridSpec {
  const n = Math.round(12 / resolutionDeg) + 1;
  return { lats: axis(-4, -resolutionDeg, n), lons: axis(-6, resolutionDeg, n) };
}

const gauss = (lat: number, lon: number, lat0: number, lon0: number, sLat: number, sLon: number): number =>
  Math.exp(-((lat - lat0) ** 2 / (2 * sLat * sLat) + (lon - lon0) ** 2 / (2 * sLon * sLon)));

export function describeCells(grid: GridSpec): CellGeography {
  const cells = grid.lats.length * grid.lons.length;
  const g = {
    cells,
    valid: new Uint8Array(cells),
    elevationKm: new Float64Array(cells),
    lowland: new Float64Array(cells),
    orrin: new Float64Array(cells),
    eastWest: new Float64Array(cells),
  };
  let c = 0;
  for (const lat of grid.lats) {
    for (const lon of grid.lons) {
      g.valid[c] = ((lat + 10) / 6) ** 2 + (lon / 6) ** 2 > 1.7 ? 0 : 1;
      g.elevationKm[c] = 1.1 * gauss(lat, lon, -7.75, 0, 1.3, 1.6);
      g.lowland[c] = gauss(lat, lon, -11.5, -0.5, 1.8, 2.8);
      g.orrin[c] = gauss(lat, lon, -7.25, 3, 1.2, 1.3);
      g.eastWest[c] = Math.max(-1, Math.min(1, lon / 6));
      c++;
    }
  }
  return g;
}

/** Day of year (1..366) of a UTC day number (days since 1970-01-01). */
export function dayOfYear(dayNumber: number): number {
  const d = new Date(dayNumber * 86_400_000);
  return Math.floor((dayNumber * 86_400_000 - Date.UTC(d.getUTCFullYear(), 0, 1)) / 86_400_000) + 1;
}

/** Seasonal factors of one UTC day, shared by all cells. */
export interface Season {
  /** −1..1 warm-season factor, peaking in early February. */
  readonly warm: number;
  /** 0.15..1 rainy-season factor (rains Dec–Apr, peak Jan–Feb). */
  readonly rainSeason: number;
}

export function seasonOf(dayNumber: number): Season {
  const doy = dayOfYear(dayNumber);
  return {
    warm: Math.cos((2 * Math.PI * (doy - 40)) / 365.25),
    rainSeason: 0.15 + 0.85 * Math.max(0, Math.cos((2 * Math.PI * (doy - 45)) / 365.25)) ** 0.7,
  };
}

/** Daily climatological means of one cell on one day. */
export interface DailyClimate {
  tmaxC: number;
  tminC: number;
  dewpointC: number;
  precipMmPerDay: number;
}

/** Fills `out` with the climatology of cell `c` in season `s` (no allocation in the hot loop). */
export function climatologyOf(g: CellGeography, c: number, s: Season, out: DailyClimate): void {
  const tmaxC = 31 + 2.2 * g.lowland[c] - 4.5 * g.elevationKm[c] + 1.2 * s.warm - 0.8 * (s.rainSeason - 0.5);
  const tminC = tmaxC - (9.5 - 2.5 * s.rainSeason);
  out.tmaxC = tmaxC;
  out.tminC = tminC;
  out.dewpointC = tminC - 0.8 - 2.5 * (1 - s.rainSeason);
  out.precipMmPerDay = (4.5 + 1.25 * (g.eastWest[c] + 1) + 4 * g.elevationKm[c] + 3 * g.orrin[c]) * s.rainSeason;
}
