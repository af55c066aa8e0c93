/** Semantic checks: duplicate ids and references to ids that do not exist (teams, regions, indicators, stages, tiers). */
import { ids, known, list, obj, oneOf, text, type RawObject } from './raw-access.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';

const ID_LISTS = [
  ['sources', 'source'],
  ['regions', 'region'],
  ['teams', 'team'],
  ['indicators', 'indicator'],
  ['stage-ladder', 'stage'],
  ['trigger-rules', 'rule'],
] as const;

export function checkDuplicateIds(raw: RawObject): ConfigProblem[] {
  const out: ConfigProblem[] = [];
  for (const [key, what] of ID_LISTS) {
    const first = new Map<string, number>();
    ids(raw[key]).forEach((id, i) => {
      if (id === undefined) return;
      const j = first.get(id);
      if (j === undefined) first.set(id, i);
      else
        out.push(
          problem(pointerOf(key, i, 'id'), `duplicate ${what} id "${id}" (also entry ${j + 1} of ${key})`, `give each ${what} its own id`),
        );
    });
  }
  return out;
}

/** `setRegionIds`: ids of the regions read from boundary files (regions: entries with boundaries:). */
export function checkReferences(
  raw: RawObject,
  _schemaProblems: readonly unknown[] = [],
  setRegionIds: readonly string[] = [],
): ConfigProblem[] {
  const out: ConfigProblem[] = [];
  const teams = known(ids(raw.teams));
  const regions = known([...ids(raw.regions), ...setRegionIds]);
  const indicators = known(ids(raw.indicators));
  const stages = known(ids(raw['stage-ladder']));
  const sourceTiers = known(list(raw.sources).map((s) => text(obj(s).tier)));

  list(raw.regions).forEach((r, i) => {
    list(obj(r).teams).forEach((t, j) => {
      if (typeof t === 'string' && !teams.has(t))
        out.push(problem(pointerOf('regions', i, 'teams', j), `unknown team "${t}"`, oneOf(teams)));
    });
  });

  list(raw.indicators).forEach((ind, i) => {
    const o = obj(ind);
    for (const region of Object.keys(obj(o['region-thresholds']))) {
      if (!regions.has(region))
        out.push(problem(pointerOf('indicators', i, 'region-thresholds', region), `unknown region "${region}"`, oneOf(regions), 'key'));
    }
    list(o.tiers).forEach((tier, j) => {
      if (typeof tier === 'string' && !sourceTiers.has(tier)) {
        out.push(
          problem(
            pointerOf('indicators', i, 'tiers', j),
            `no source has tier ${tier}`,
            `add a source with tier: ${tier} or remove ${tier} from this indicator's tiers`,
          ),
        );
      }
    });
  });

  list(raw['stage-ladder']).forEach((s, i) => {
    for (const audience of Object.keys(obj(obj(s).actions))) {
      if (audience !== 'default' && !teams.has(audience)) {
        out.push(
          problem(
            pointerOf('stage-ladder', i, 'actions', audience),
            `unknown team "${audience}" in actions`,
            `use default or a team id: ${[...teams].join(', ')}`,
            'key',
          ),
        );
      }
    }
  });

  const indicatorTiers = new Map(list(raw.indicators).map((ind) => [text(obj(ind).id), list(obj(ind).tiers)]));
  list(raw['trigger-rules']).forEach((r, i) => {
    const o = obj(r);
    const ind = text(o.indicator);
    const stage = text(o.stage);
    const tier = text(o.tier);
    if (ind !== undefined && !indicators.has(ind))
      out.push(problem(pointerOf('trigger-rules', i, 'indicator'), `unknown indicator "${ind}"`, oneOf(indicators)));
    else if (ind !== undefined && tier !== undefined && !indicatorTiers.get(ind)?.includes(tier)) {
      out.push(
        problem(
          pointerOf('trigger-rules', i, 'tier'),
          `indicator ${ind} is not computed for tier ${tier}`,
          `add ${tier} to the tiers of indicator ${ind} or change this rule's tier`,
        ),
      );
    }
    if (stage !== undefined && !stages.has(stage))
      out.push(problem(pointerOf('trigger-rules', i, 'stage'), `unknown stage "${stage}"`, oneOf(stages)));
  });

  for (const [tier, stage] of Object.entries(obj(obj(raw.escalation)['tier-caps']))) {
    if (typeof stage === 'string' && !stages.has(stage))
      out.push(problem(pointerOf('escalation', 'tier-caps', tier), `unknown stage "${stage}"`, oneOf(stages)));
  }
  return out;
}
