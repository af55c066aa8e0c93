/**
 * What was averaged, for operators and the archive (`forelight regions`): a GeoJSON preview (RFC 7946) with each
 * region's outline and the grid cells it uses, weights as properties, and an SVG map of the same (plate carrée,
 * longitude east to the right, north up). Cells are drawn in the region's longitude frame.
 */
import { shapeBounds, shapeRingSets } from '../config/region-shape.ts';
import type { RegionConfig, Ring } from '../config/types.ts';
import { escapeXml } from './safe-text.ts';

type Box = readonly [number, number, number, number];

export interface UsedCell {
  /** Cell rectangle in degrees: west, south, east, north (east may exceed 180 on 0..360 grids). */
  readonly bounds: readonly [number, number, number, number];
  /** Share of the region's mean, 0–1 (weights sum to 1). */
  readonly weight: number;
  /** Area counted for the region, km² (the overlap, or the whole cell under the centre rule). */
  readonly km2: number;
}

export interface RegionOnGrid {
  readonly region: RegionConfig;
  readonly cells: readonly UsedCell[];
  readonly coveredKm2: number;
  readonly regionKm2: number;
  readonly largestCellKm2: number;
  /** True when the region is much smaller than a cell it falls in (pipeline/region-report.ts SMALL_REGION_SHARE). */
  readonly small: boolean;
}

export interface SourceRegions {
  readonly source: string;
  readonly file: string;
  readonly regions: readonly RegionOnGrid[];
  /** One line per region without a cell on this grid. */
  readonly problems: readonly string[];
}

/** A cell's rectangle shifted by a multiple of 360° next to the region. */
function framedCell(cell: UsedCell, r: RegionOnGrid): Box {
  const b = shapeBounds(r.region.shape);
  const [w, s, e, n] = cell.bounds;
  const k = Math.round(((b.west + b.east) / 2 - (w + e) / 2) / 360);
  return [w + 360 * k, s, e + 360 * k, n];
}

const rect = ([w, s, e, n]: Box): Ring => [
  [w, s],
  [e, s],
  [e, n],
  [w, n],
  [w, s],
];
const round = (v: number, d = 6) => Number(v.toFixed(d));

/** FeatureCollection of region outlines (kind "region") and the cells they use (kind "cell", with weight). */
export function regionPreviewGeoJson(report: SourceRegions): object {
  const features: object[] = [];
  for (const r of report.regions) {
    features.push({
      type: 'Feature',
      properties: {
        kind: 'region',
        source: report.source,
        id: r.region.id,
        name: r.region.name,
        cells: r.cells.length,
        area_km2: round(r.regionKm2, 1),
        covered_km2: round(r.coveredKm2, 1),
        much_smaller_than_a_cell: r.small,
      },
      geometry: { type: 'MultiPolygon', coordinates: shapeRingSets(r.region.shape) },
    });
    for (const c of r.cells) {
      features.push({
        type: 'Feature',
        properties: { kind: 'cell', source: report.source, region: r.region.id, weight: round(c.weight, 9), km2: round(c.km2, 3) },
        geometry: { type: 'Polygon', coordinates: [rect(framedCell(c, r))] },
      });
    }
  }
  return { type: 'FeatureCollection', features };
}

/** SVG map of every region and its cells (cell opacity ∝ weight within its region), ~900 px wide. */
export function regionMapSvg(report: SourceRegions, title: string): string {
  const boxes = report.regions.flatMap((r) => [
    shapeBounds(r.region.shape),
    ...r.cells.map((c) => {
      const [w, s, e, n] = framedCell(c, r);
      return { west: w, south: s, east: e, north: n };
    }),
  ]);
  const [w, s, e, n] = [
    Math.min(...boxes.map((b) => b.west)),
    Math.min(...boxes.map((b) => b.south)),
    Math.max(...boxes.map((b) => b.east)),
    Math.max(...boxes.map((b) => b.north)),
  ];
  const pad = 0.03 * Math.max(e - w, n - s, 1e-3);
  const scale = 900 / (e - w + 2 * pad);
  const x = (lon: number) => ((lon - w + pad) * scale).toFixed(1);
  const y = (lat: number) => ((n + pad - lat) * scale).toFixed(1);
  const height = Math.ceil((n - s + 2 * pad) * scale);
  const parts: string[] = [];
  for (const r of report.regions) {
    const top = Math.max(...r.cells.map((c) => c.weight));
    for (const c of r.cells) {
      const [cw, cs, ce, cn] = framedCell(c, r);
      parts.push(
        `<rect x="${x(cw)}" y="${y(cn)}" width="${((ce - cw) * scale).toFixed(1)}" height="${((cn - cs) * scale).toFixed(1)}" fill="#4a78a8" fill-opacity="${(0.15 + (0.6 * c.weight) / top).toFixed(3)}" stroke="#4a78a8" stroke-width="0.5"><title>${escapeXml(`${r.region.id}: weight ${(100 * c.weight).toFixed(1)} %`)}</title></rect>`,
      );
    }
  }
  for (const r of report.regions) {
    const d = shapeRingSets(r.region.shape)
      .flat()
      .map((ring) => 'M' + ring.map(([lon, lat]) => `${x(lon)},${y(lat)}`).join('L') + 'Z')
      .join('');
    const b = shapeBounds(r.region.shape);
    parts.push(
      `<path d="${d}" fill="none" stroke="#1d1d1d" stroke-width="1.2" fill-rule="evenodd"><title>${escapeXml(`${r.region.name} (${r.region.id}): ${r.cells.length} cells`)}</title></path>`,
    );
    parts.push(
      `<text x="${x((b.west + b.east) / 2)}" y="${y((b.south + b.north) / 2)}" font-size="11" text-anchor="middle" fill="#1d1d1d">${escapeXml(r.region.id)}</text>`,
    );
  }
  return `<svg xmlns="http://www.w3.org/2000/svg" width="900" height="${height}" viewBox="0 0 900 ${height}" role="img" aria-label="${escapeXml(title)}"><title>${escapeXml(title)}</title>${parts.join('')}</svg>\n`;
}
