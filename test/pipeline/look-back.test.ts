/**
 * Per-source look-back for a late or older forecast (YAML `look-back-days`, default one issue interval of the
 * tier: 35 days for monthly seasonal issues, 10 otherwise; common practice, no source), and the message naming
 * the pattern and the dates tried when nothing is found.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { checkConfigFile, loadConfig } from '../../src/config/load-config.ts';
import { resolveInputs } from '../../src/pipeline/inputs.ts';
import { readAll } from '../../src/pipeline/read-stage.ts';
import { fixture, minimalVariant, writeTemp } from '../config/helpers.ts';

const SOURCE = '    tier: weeks\n    forecast-files: data/w_{date}.nc\n    priority: 1\n';

/** minimal.yaml with every tier set to `tier` and `lookBack` lines added to its source. */
function variant(tier: string, lookBack: string): string {
  const text = readFileSync(fixture('minimal.yaml'), 'utf8')
    .replace(SOURCE, `${SOURCE}${lookBack}`)
    .replaceAll('tier: weeks', `tier: ${tier}`)
    .replace('tiers: [weeks]', `tiers: [${tier}]`);
  return writeTemp(`look-back-${tier}-${lookBack.length}.yaml`, text);
}

/** A config whose one source has `tier` and optional look-back-days, with one forecast file dated `fileDate`. */
async function setUp(tier: string, lookBack: string, fileDate: string) {
  const file = variant(tier, lookBack);
  const dir = join(file, '..', 'data');
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, `w_${fileDate.replaceAll('-', '')}.nc`), 'not read in this test');
  return loadConfig(file);
}

describe('look-back-days', () => {
  it("a months source finds last month's issue by default (35 days); a weeks source does not (10 days) and says what it tried", async () => {
    const seasonal = await setUp('months', '', '2026-10-25');
    expect(seasonal.sources[0].lookbackDays).toBe(35);
    const [found] = await resolveInputs(seasonal, '2026-11-26');
    expect(found).toMatchObject({ date: '2026-10-25', stale: true });

    const weekly = await setUp('weeks', '', '2026-10-25');
    expect(weekly.sources[0].lookbackDays).toBe(10);
    const inputs = await resolveInputs(weekly, '2026-11-26');
    expect(inputs[0].path).toBeNull();
    const read = await readAll(weekly, '2026-11-26', inputs);
    expect(read.problems).toHaveLength(1);
    const line = read.problems[0].message;
    expect(line).toMatch(
      /no forecast of source 'weekly': tried .*data\/w_20261126\.nc and every date back to .*data\/w_20261116\.nc \(2026-11-26 to 2026-11-16, look-back-days 10\)/,
    );
    expect(line).toMatch(/larger look-back-days/);
  });

  it('look-back-days set in the YAML is used, and the file it then finds is the one the message would have named', async () => {
    const config = await setUp('weeks', '    look-back-days: 40\n', '2026-10-25');
    expect(config.sources[0].lookbackDays).toBe(40);
    expect((await resolveInputs(config, '2026-11-26'))[0]).toMatchObject({ date: '2026-10-25', stale: true });
  });

  it('a negative look-back-days is a check error at its YAML line and column', async () => {
    const file = minimalVariant(SOURCE, `${SOURCE}    look-back-days: -3\n`);
    const problems = (await checkConfigFile(file)).diagnostics.map(formatDiagnostic);
    expect(problems, problems.join('\n')).toHaveLength(1);
    expect(problems[0]).toMatch(/:9:\d+: .*look-back-days/);
  });
});
