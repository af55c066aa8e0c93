/**
 * The indicator registry: every kind's definition (src/indicators/kinds/, listed in kinds/all.ts), and what is
 * derived from it — the kinds, their params types, units and needs, and the lookup the compute dispatch uses.
 */
import type { IndicatorDefinition, IndicatorSpec } from './definition.ts';
import { KIND_DEFINITIONS } from './kinds/all.ts';

type AnyDefinition = (typeof KIND_DEFINITIONS)[number];

export type IndicatorKind = AnyDefinition['kind'];

type ParamsOf<D> = D extends IndicatorDefinition<infer _K, infer P> ? P : never;

/** The camelCase `params` of kind K, as its definition declares them. */
export type IndicatorParams<K extends IndicatorKind> = ParamsOf<Extract<AnyDefinition, { kind: K }>>;

/** IndicatorSpec of any kind, discriminated by `kind`. */
export type AnyIndicatorSpec = { [K in IndicatorKind]: IndicatorSpec<K, IndicatorParams<K>> }[IndicatorKind];

export const INDICATOR_DEFINITIONS: readonly AnyDefinition[] = KIND_DEFINITIONS;

export const INDICATOR_KINDS: readonly IndicatorKind[] = KIND_DEFINITIONS.map((d) => d.kind);

const BY_KIND = new Map<string, AnyDefinition>(KIND_DEFINITIONS.map((d) => [d.kind, d]));

export function isIndicatorKind(v: unknown): v is IndicatorKind {
  return typeof v === 'string' && BY_KIND.has(v);
}

/** The definition of kind K. */
export function indicatorDefinition<K extends IndicatorKind>(kind: K): IndicatorDefinition<K, IndicatorParams<K>> {
  // The map is filled from KIND_DEFINITIONS by kind, so the entry for K is the definition of K.
  return BY_KIND.get(kind) as unknown as IndicatorDefinition<K, IndicatorParams<K>>;
}

/**
 * Default of an indicator's `trend-climate`: on for kinds that need no rainfall (temperatures and heat indices,
 * whose hindcast years warm with the climate), off for rain-driven kinds (malaria suitability), whose trends are
 * weak against their year-to-year noise and bounded by 0 (our choice, common practice, no source).
 */
export function defaultTrendClimate(kind: IndicatorKind): boolean {
  return !indicatorDefinition(kind).needs.some((alternatives) => alternatives.includes('precip'));
}
