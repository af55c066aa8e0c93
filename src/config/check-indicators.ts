/**
 * Semantic checks on indicators: one threshold form, units that fit the indicator kind, the rules between
 * parameters the kind's params schema cannot state, and the quantities each kind needs mapped by every source (and
 * the observations) of its tiers. Kinds, units and needs come from the indicator registry.
 */
import { ForelightError } from '../core/errors.ts';
import { indicatorDefinition, isIndicatorKind, type AnyIndicatorSpec, type IndicatorKind } from '../indicators/registry.ts';
import { paramsFromYaml } from './build-config.ts';
import { list, num, obj, text, type RawObject } from './raw-access.ts';
import { thresholdUnits } from './threshold-units.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';

/** `schemaProblems`: the schema's findings; an indicator whose params already failed it is not checked again. */
export function checkIndicators(raw: RawObject, schemaProblems: readonly ConfigProblem[] = []): ConfigProblem[] {
  const out: ConfigProblem[] = [];
  list(raw.indicators).forEach((ind, i) => {
    const o = obj(ind);
    const id = text(o.id) ?? `#${i + 1}`;
    const kind = o.kind;
    const thresholds: [string, unknown][] = [['', o.threshold], ...Object.entries(obj(o['region-thresholds']))];
    const value = obj(o['region-value']);
    const share = value['share-above'] !== undefined;
    for (const [region, th] of thresholds) {
      const at = region === '' ? pointerOf('indicators', i, 'threshold') : pointerOf('indicators', i, 'region-thresholds', region);
      if (th === undefined) continue;
      out.push(...checkThreshold(obj(th), at, id, isIndicatorKind(kind) ? kind : undefined, share));
    }
    if (value.weights === 'population' && (raw.population === undefined || raw.population === null)) {
      out.push(
        problem(
          pointerOf('indicators', i, 'region-value', 'weights'),
          `indicator ${id} weights its regions by population, but no population raster is configured`,
          'add population: { file: people.tif } (NetCDF or GeoTIFF, WGS 84 longitude/latitude), or write weights: area',
        ),
      );
    }
    if (!isIndicatorKind(kind)) return;
    const paramsAt = pointerOf('indicators', i, 'params');
    if (!schemaProblems.some((p) => p.pointer === paramsAt || p.pointer.startsWith(paramsAt + '/'))) {
      out.push(...checkParams(kind, id, o, paramsAt));
    }
    const tiers = list(o.tiers);
    const mapping: [string, RawObject][] = list(raw.sources)
      .map((s, j): [string, RawObject, unknown] => [pointerOf('sources', j), obj(s), obj(s).tier])
      .filter(([, , tier]) => tiers.includes(tier))
      .map(([p, s]) => [p, s]);
    if (raw.observations !== undefined && raw.observations !== null) mapping.push([pointerOf('observations'), obj(raw.observations)]);
    for (const [at, holder] of mapping) {
      const variables = obj(holder.variables);
      const name = text(holder.id) ? `source ${text(holder.id)}` : 'the observations';
      for (const anyOf of indicatorDefinition(kind).needs) {
        if (anyOf.some((q) => text(variables[q]) !== undefined)) continue;
        out.push(
          problem(
            at + '/variables',
            `indicator ${id} (${kind}) needs ${anyOf.join(' or ')}, which ${name} does not map`,
            `add ${anyOf[0]}: <variable name in the file> under variables`,
          ),
        );
      }
    }
  });
  return out;
}

function checkThreshold(th: RawObject, at: string, id: string, kind: IndicatorKind | undefined, share: boolean): ConfigProblem[] {
  const hasP = th.percentile !== undefined;
  const hasV = th.value !== undefined;
  if (hasP && (hasV || th.units !== undefined))
    return [
      problem(at, `threshold of ${id} mixes percentile with value/units`, 'write either { percentile: 90 } or { value: 39, units: degC }'),
    ];
  if (!hasP && !hasV)
    return [
      problem(at, `threshold of ${id} has neither percentile nor value`, 'write either { percentile: 90 } or { value: 39, units: degC }'),
    ];
  if (hasP || kind === undefined) return [];
  const units = text(th.units);
  const family = thresholdUnits(kind, share);
  if (units === undefined) return [problem(at, `threshold value of ${id} has no units`, `add units: ${family.canonical}`)];
  if (!Object.hasOwn(family.accepted, units)) {
    return [
      problem(
        at + '/units',
        `units "${units}" do not fit indicator ${id} (${kind}${share ? ', a share of the region above region-value.share-above' : ''})`,
        `use ${Object.keys(family.accepted).join(', ')}`,
      ),
    ];
  }
  return [];
}

/** The kind's own rules between parameters (e.g. a temperature model fitted for one species only). */
function checkParams(kind: IndicatorKind, id: string, o: RawObject, at: string): ConfigProblem[] {
  // Only called once the params passed the kind's params schema, so they have the kind's params type.
  const spec = { id, kind, windowDays: num(o['window-days']) ?? 1, params: paramsFromYaml(obj(o.params)) } as AnyIndicatorSpec;
  try {
    indicatorDefinition(spec.kind).checkParams?.(spec);
    return [];
  } catch (err) {
    if (!(err instanceof ForelightError)) throw err;
    const yaml = yamlNames(Object.keys((indicatorDefinition(kind).params.properties ?? {}) as object));
    return [problem(at, yaml(err.diagnostic.message), yaml(err.diagnostic.hint))];
  }
}

/** Rewrites the camelCase parameter names of a computation message as operators write them (temperature-model). */
function yamlNames(keys: readonly string[]): (text: string) => string {
  const byCamel = new Map(keys.map((k) => [Object.keys(paramsFromYaml({ [k]: 0 }))[0], k]));
  return (text) => text.replace(/\b[a-z]+[A-Z][A-Za-z]*\b/g, (word) => byCamel.get(word) ?? word);
}
