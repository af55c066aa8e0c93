// The shipped default ladder (config/forelight.yaml, owned by the config helper) must give every stage a label,
// a meaning and default actions in every shipped language, and every shipped language its cautions — otherwise
// renderBulletins refuses to render. Read by path with the `yaml` package so this check does not depend on the
// config loader; tolerant of `stage-ladder` / `stages` as the key name.
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { SHIPPED_MESSAGES } from '../../src/render/catalogue.ts';

const YAML_PATH = fileURLToPath(new URL('../../config/forelight.yaml', import.meta.url));
const shippedLocales = readdirSync(SHIPPED_MESSAGES)
  .filter((f) => f.endsWith('.yaml'))
  .map((f) => f.replace(/\.yaml$/, ''))
  .sort();

type Stage = {
  id: string;
  label?: Record<string, string>;
  meaning?: Record<string, string>;
  actions?: Record<string, Record<string, string>>;
};

describe('shipped default ladder in config/forelight.yaml', () => {
  it('shipped message catalogues are en and fr', () => {
    expect(shippedLocales).toEqual(['en', 'fr']);
  });

  it.skipIf(!existsSync(YAML_PATH))(
    'every stage has label, meaning and default actions in every shipped language; cautions non-empty',
    () => {
      const doc = parse(readFileSync(YAML_PATH, 'utf8')) as Record<string, unknown>;
      const stages = (doc['stage-ladder'] ?? doc.stages) as Stage[] | undefined;
      expect(Array.isArray(stages), 'config/forelight.yaml has no stage-ladder list').toBe(true);
      expect(stages!.length).toBeGreaterThanOrEqual(2);
      const cautions = doc.cautions as Record<string, string[]>;
      const country = doc.country as string | Record<string, string>;
      const missing: string[] = [];
      for (const locale of shippedLocales) {
        if (typeof country === 'object' && !country[locale]) missing.push(`country.${locale}`);
        if (!cautions?.[locale]?.filter((c) => String(c).trim() !== '').length) missing.push(`cautions.${locale}`);
        for (const s of stages!) {
          if (!s.label?.[locale]) missing.push(`${s.id}.label.${locale}`);
          if (!s.meaning?.[locale]) missing.push(`${s.id}.meaning.${locale}`);
          if (!s.actions?.default?.[locale]) missing.push(`${s.id}.actions.default.${locale}`);
        }
      }
      expect(missing).toEqual([]);
    },
  );
});
