/**
 * Semantic checks on wording: every locale a team reads needs stage labels, meanings, default actions,
 * cautions, probability words and (when `country:` is per locale) the country's name; team-specific actions need the team's locale; bands ascend.
 */
import { list, num, obj, text, type RawObject } from './raw-access.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';

/** locale → first team id using it. */
function teamLocales(raw: RawObject): Map<string, string> {
  const m = new Map<string, string>();
  for (const t of list(raw.teams)) {
    const locale = text(obj(t).locale);
    const id = text(obj(t).id);
    if (locale !== undefined && id !== undefined && !m.has(locale)) m.set(locale, id);
  }
  return m;
}

export function checkTexts(raw: RawObject): ConfigProblem[] {
  const out: ConfigProblem[] = [];
  const locales = teamLocales(raw);
  const teamLocale = new Map(list(raw.teams).map((t) => [text(obj(t).id), text(obj(t).locale)]));

  list(raw['stage-ladder']).forEach((s, i) => {
    const o = obj(s);
    const id = text(o.id) ?? `#${i + 1}`;
    const actions = obj(o.actions);
    if (Object.keys(actions).length === 0) {
      out.push(
        problem(pointerOf('stage-ladder', i, 'actions'), `stage ${id} has no actions`, 'add actions: default: with a text per locale'),
      );
    }
    for (const [locale, team] of locales) {
      for (const field of ['label', 'meaning'] as const) {
        if (text(obj(o[field])[locale]) === undefined) {
          out.push(
            problem(
              pointerOf('stage-ladder', i, field),
              `stage ${id} has no ${field} in ${locale} (read by team ${team})`,
              `add ${locale}: under ${field}`,
            ),
          );
        }
      }
      if (Object.keys(actions).length > 0 && text(obj(actions.default)[locale]) === undefined) {
        out.push(
          problem(
            pointerOf('stage-ladder', i, 'actions'),
            `stage ${id} has no default action in ${locale} (read by team ${team})`,
            `add ${locale}: under actions: default:`,
          ),
        );
      }
    }
    for (const [audience, texts] of Object.entries(actions)) {
      const locale = teamLocale.get(audience);
      if (audience === 'default' || locale === undefined) continue;
      if (text(obj(texts)[locale]) === undefined) {
        out.push(
          problem(
            pointerOf('stage-ladder', i, 'actions', audience),
            `actions for team ${audience} have no text in ${locale}, the team's locale`,
            `add ${locale}: under actions: ${audience}:`,
          ),
        );
      }
    }
  });

  if (raw.country !== null && typeof raw.country === 'object') {
    for (const [locale, team] of locales) {
      if (text(obj(raw.country)[locale]) === undefined)
        out.push(problem(pointerOf('country'), `country has no name in ${locale} (read by team ${team})`, `add ${locale}: under country:`));
    }
  }

  const cautions = obj(raw.cautions);
  for (const [locale, team] of locales) {
    if (cautions[locale] === undefined) {
      out.push(
        problem(
          pointerOf('cautions'),
          `no cautions in ${locale} (read by team ${team})`,
          `add ${locale}: with the caution paragraphs in that language`,
          'key',
        ),
      );
    }
  }
  for (const [locale, paragraphs] of Object.entries(cautions)) {
    const items = list(paragraphs);
    if (items.length === 0)
      out.push(
        problem(
          pointerOf('cautions', locale),
          `cautions in ${locale} are empty`,
          'write at least one caution paragraph; bulletins never go out without cautions',
        ),
      );
    items.forEach((p, j) => {
      if (typeof p === 'string' && p.trim() === '')
        out.push(
          problem(pointerOf('cautions', locale, j), `caution ${j + 1} in ${locale} is empty`, 'write the caution text or delete the entry'),
        );
    });
  }

  const bands = list(raw['probability-words']);
  let previous = 0;
  bands.forEach((b, i) => {
    const o = obj(b);
    const last = i === bands.length - 1;
    const below = num(o.below);
    if (last && o.below !== undefined) {
      out.push(
        problem(
          pointerOf('probability-words', i, 'below'),
          'the last probability band must not have `below`',
          'delete below: from the last band; it covers everything up to 1',
        ),
      );
    } else if (!last && o.below === undefined) {
      out.push(
        problem(
          pointerOf('probability-words', i),
          'only the last probability band may omit `below`',
          "add below: with the band's upper bound",
        ),
      );
    } else if (below !== undefined && below <= previous) {
      out.push(
        problem(
          pointerOf('probability-words', i, 'below'),
          `band bound ${below} is not above the previous bound ${previous}`,
          'list bands lowest first with increasing bounds',
        ),
      );
    }
    if (below !== undefined) previous = below;
    for (const [locale, team] of locales) {
      if (text(o[locale]) === undefined)
        out.push(
          problem(
            pointerOf('probability-words', i),
            `probability band ${i + 1} has no word in ${locale} (read by team ${team})`,
            `add ${locale}: to this band`,
          ),
        );
    }
  });
  return out;
}
