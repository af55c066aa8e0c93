/**
 * Real open boundaries for tests and the benchmark: Natural Earth 1:110m Admin 0 countries (version 4.1.0,
 * public domain, naturalearthdata.com), as redistributed in TopoJSON by the npm package world-atlas 2.0.2 (ISC),
 * turned into a GeoJSON FeatureCollection with topojson-client (ISC).
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { feature } from 'topojson-client';

export interface NaturalEarthCollection {
  readonly type: 'FeatureCollection';
  readonly features: { type: 'Feature'; id?: string; properties: { name: string }; geometry: { type: string; coordinates: unknown } }[];
}

/** The 177 countries of countries-110m.json as GeoJSON (Feature id = ISO 3166-1 numeric code). */
export function naturalEarthCountries(scale: '110m' | '50m' = '110m'): NaturalEarthCollection {
  const path = createRequire(import.meta.url).resolve(`world-atlas/countries-${scale}.json`);
  const topo = JSON.parse(readFileSync(path, 'utf8')) as Parameters<typeof feature>[0];
  return feature(topo, topo.objects.countries as Parameters<typeof feature>[1]) as unknown as NaturalEarthCollection;
}
