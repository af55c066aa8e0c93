/**
 * The technical note's trend sentence (render/trend-words.ts), en and fr: a trend told from zero is named with its
 * direction and rate; one that is not says "no clear trend in the past N years" with the fitted rates, never
 * "allowing for the cooling trend". Wording is this project's own, no source.
 */
import { describe, expect, it } from 'vitest';
import { createTemplateEnv } from '../../src/render/template-env.ts';
import { trendLine } from '../../src/render/trend-words.ts';
import type { LeadProbability, TrendFit } from '../../src/probability-types.ts';
import { sampleConfig } from './fixtures/sample-config.ts';

const env = createTemplateEnv(sampleConfig().templates);
const fit = (perDecade: number, applied: boolean): TrendFit => ({ perDecade, standardErrorPerDecade: 0.2, criticalT: 1.734, applied });
const lead = (hindcast: TrendFit, observed: TrendFit | null) =>
  ({ climateTrend: { onYear: 2026, firstYear: 2006, lastYear: 2025, hindcast, observed, units: 'degC' } }) as unknown as LeadProbability;

describe('trendLine', () => {
  it('noise slopes not told from zero: "no clear trend" with the fitted rates, no direction (en, fr)', () => {
    const rows = [lead(fit(-0.31, false), fit(-1.2, false))];
    const en = trendLine(env.t('en'), 'en', rows)!;
    expect(en).toMatch(/^No clear trend in the past 20 years \(2006–2025\): .*as they are/);
    expect(en).toMatch(/[−-]0\.31\u00a0°C per decade in past forecasts, [−-]1\.20\u00a0°C observed/);
    expect(en).not.toMatch(/cooling|warming|allowing/);
    expect(trendLine(env.t('fr'), 'fr', rows)).toMatch(/^Pas de tendance nette sur les 20 dernières années/);
  });

  it('a trend told from zero names its direction and rate; an unclear observed trend is said to be used as it is', () => {
    const en = trendLine(env.t('en'), 'en', [lead(fit(0.3, true), fit(0.1, false))])!;
    expect(en).toMatch(/allowing for the warming trend of the past 20 years/);
    expect(en).toMatch(/\+0\.30.* per decade in past forecasts\); observations show no clear trend and are used as they are\.$/);
    const fr = trendLine(env.t('fr'), 'fr', [lead(fit(0.3, true), fit(0.1, false))])!;
    expect(fr).toMatch(/tendance au réchauffement.*les observations ne montrent pas de tendance nette/);
  });
});

describe('trendLine never names one direction beside rates of the other sign, and says "rising" for non-temperatures', () => {
  it('past forecasts cooling, observations warming, both applied: no single direction word (en, fr)', () => {
    const rows = [lead(fit(-0.3, true), fit(0.4, true))];
    const en = trendLine(env.t('en'), 'en', rows)!;
    expect(en).toMatch(/allowing for the trends \(past forecasts and observations differ in sign\) of the past 20 years/);
    expect(en).not.toMatch(/warming|cooling/);
    const fr = trendLine(env.t('fr'), 'fr', rows)!;
    expect(fr).toMatch(/de signe différent entre prévisions rétrospectives et observations/);
    expect(fr).not.toMatch(/réchauffement|refroidissement/);
  });

  it('an indicator in % with a trend told from zero rises, it does not warm', () => {
    const pct = { climateTrend: { onYear: 2026, firstYear: 2006, lastYear: 2025, hindcast: fit(2, true), observed: null, units: '%' } };
    const en = trendLine(env.t('en'), 'en', [pct as unknown as LeadProbability])!;
    expect(en).toMatch(/allowing for the rising trend/);
    expect(trendLine(env.t('fr'), 'fr', [pct as unknown as LeadProbability])).toMatch(/tendance à la hausse/);
  });

  it('no fit at all in past forecasts: the note says too few years, never "fitted none"', () => {
    const none = { climateTrend: { onYear: 2026, firstYear: 2025, lastYear: 2025, hindcast: null, observed: null, units: 'degC' } };
    const en = trendLine(env.t('en'), 'en', [none as unknown as LeadProbability])!;
    expect(en).toMatch(/\(too few years to fit a trend to past forecasts, not told apart/);
    expect(trendLine(env.t('fr'), 'fr', [none as unknown as LeadProbability])).toMatch(/trop peu d'années pour ajuster/);
    expect(en).not.toMatch(/none/);
  });
});
