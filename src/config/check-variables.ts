/**
 * Semantic checks on the `variables:` maps of the sources and the observations: quantities that are only usable
 * together (specific humidity gives a dewpoint only with the pressure it was measured at) are mapped together.
 */
import { list, obj, text, type RawObject } from './raw-access.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';

/** Each quantity → the quantity it cannot be used without. */
const NEEDS_COMPANION: Readonly<Record<string, string>> = {
  'specific-humidity': 'surface-pressure',
  'surface-pressure': 'specific-humidity',
};

export function checkVariables(raw: RawObject): ConfigProblem[] {
  const holders: [string, string, RawObject][] = list(raw.sources).map((s, i) => [
    pointerOf('sources', i, 'variables'),
    `source ${text(obj(s).id) ?? `#${i + 1}`}`,
    obj(obj(s).variables),
  ]);
  if (raw.observations !== undefined && raw.observations !== null)
    holders.push([pointerOf('observations', 'variables'), 'the observations', obj(obj(raw.observations).variables)]);
  const out: ConfigProblem[] = [];
  for (const [at, name, variables] of holders) {
    for (const [quantity, companion] of Object.entries(NEEDS_COMPANION)) {
      if (text(variables[quantity]) === undefined || text(variables[companion]) !== undefined) continue;
      out.push(
        problem(
          `${at}/${quantity}`,
          `${name} maps ${quantity} but not ${companion}: the dewpoint is derived from the two together`,
          `add ${companion}: <variable name in the file> under variables (e.g. sp for surface pressure, q2m for 2 m specific humidity), or map dewpoint or rh instead`,
        ),
      );
    }
  }
  return out;
}
