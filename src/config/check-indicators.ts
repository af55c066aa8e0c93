/**
 * Semantic checks on indicators: one threshold form, units that fit the indicator kind, and the quantities
 * each kind needs mapped by every source (and the observations) of its tiers.
 */
import { QUANTITIES_NEEDED, THRESHOLD_UNITS, isIndicatorKind } from './indicator-needs.ts';
import { list, obj, text, type RawObject } from './raw-access.ts';
import type { IndicatorKind } from './types.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';

export function checkIndicators(raw: RawObject): ConfigProblem[] {
  const out: ConfigProblem[] = [];
  list(raw.indicators).forEach((ind, i) => {
    const o = obj(ind);
    const id = text(o.id) ?? `#${i + 1}`;
    const kind = o.kind;
    const thresholds: [string, unknown][] = [['', o.threshold], ...Object.entries(obj(o['region-thresholds']))];
    for (const [region, th] of thresholds) {
      const at = region === '' ? pointerOf('indicators', i, 'threshold') : pointerOf('indicators', i, 'region-thresholds', region);
      if (th === undefined) continue;
      out.push(...checkThreshold(obj(th), at, id, isIndicatorKind(kind) ? kind : undefined));
    }
    if (!isIndicatorKind(kind)) return;
    const tiers = list(o.tiers);
    const mapping: [string, RawObject][] = list(raw.sources)
      .map((s, j): [string, RawObject, unknown] => [pointerOf('sources', j), obj(s), obj(s).tier])
      .filter(([, , tier]) => tiers.includes(tier))
      .map(([p, s]) => [p, s]);
    if (raw.observations !== undefined && raw.observations !== null) mapping.push([pointerOf('observations'), obj(raw.observations)]);
    for (const [at, holder] of mapping) {
      const variables = obj(holder.variables);
      const name = text(holder.id) ? `source ${text(holder.id)}` : 'the observations';
      for (const anyOf of QUANTITIES_NEEDED[kind]) {
        if (anyOf.some((q) => text(variables[q]) !== undefined)) continue;
        out.push(problem(at + '/variables', `indicator ${id} (${kind}) needs ${anyOf.join(' or ')}, which ${name} does not map`, `add ${anyOf[0]}: <variable name in the file> under variables`));
      }
    }
  });
  return out;
}

function checkThreshold(th: RawObject, at: string, id: string, kind: IndicatorKind | undefined): ConfigProblem[] {
  const hasP = th.percentile !== undefined;
  const hasV = th.value !== undefined;
  if (hasP && (hasV || th.units !== undefined)) return [problem(at, `threshold of ${id} mixes percentile with value/units`, 'write either { percentile: 90 } or { value: 39, units: degC }')];
  if (!hasP && !hasV) return [problem(at, `threshold of ${id} has neither percentile nor value`, 'write either { percentile: 90 } or { value: 39, units: degC }')];
  if (hasP || kind === undefined) return [];
  const units = text(th.units);
  const family = THRESHOLD_UNITS[kind];
  if (units === undefined) return [problem(at, `threshold value of ${id} has no units`, `add units: ${family.canonical}`)];
  if (!Object.hasOwn(family.accepted, units)) {
    return [problem(at + '/units', `units "${units}" do not fit indicator ${id} (${kind})`, `use ${Object.keys(family.accepted).join(', ')}`)];
  }
  return [];
}
