/**
 * Indicator `params:` are validated when the configuration loads, against the params schema each kind declares
 * (src/indicators/kinds/), with exact messages and 1-based line:column in fixtures/bad-indicator-params.yaml
 * (positions counted by hand in that file). Before the registry a bad parameter only surfaced during a run.
 */
import { describe, expect, it } from 'vitest';
import { checkConfigFile, loadConfig } from '../../src/config/load-config.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { fixture } from './helpers.ts';

const F = 'test/config/fixtures/bad-indicator-params.yaml';

describe('indicator params checked at load (fixtures/bad-indicator-params.yaml)', async () => {
  const result = await checkConfigFile(fixture('bad-indicator-params.yaml'));

  it('reports each wrong parameter at its value or key, and nothing for the valid ones', () => {
    expect(result.config).toBeUndefined();
    expect(result.diagnostics.map(formatDiagnostic)).toEqual([
      // heat-index basis: an enum of the feels-like kinds
      `${F}:37:22: "tmin" is not one of: tmax, tmean — use one of: tmax, tmean`,
      `${F}:44:23: "severity" is not one of: ehf, severity-ratio — use one of: ehf, severity-ratio`,
      // hot-days-run: a type error at the value, a misspelt key at the key
      `${F}:51:32: expected number, got "warm" — Fixed daily threshold in degC; default: the climatology's day-of-year threshold.`,
      `${F}:51:38: unknown key "quantitty" — remove it or fix the spelling; allowed here: quantity, day-threshold-c`,
      `${F}:58:15: unknown key "basis" — remove it or fix the spelling; tmax-mean takes no parameters.`,
      // malaria: lag-months 3 fails the schema, so the cross-parameter rules are not asked about this indicator
      `${F}:65:43: 3 is not one of: 1, 2 — use one of: 1, 2`,
      // rules between parameters (the kind's checkParams), in the operators' spelling of the keys
      `${F}:72:13: indicator "mal-r0": params.temperature-model mordecai-2013 is fitted for P. falciparum only — use species falciparum, or the craig-1999 or martens-detinova model`,
      `${F}:79:13: indicator "mal-cut": params.marginal-at 0.8 is not below params.suitable-at 0.5 — make marginal-at < suitable-at`,
    ]);
  });

  it('schema findings carry config-schema, the rules between parameters config-indicator', () => {
    expect(result.diagnostics.map((d) => `${d.place.line} ${d.code}`)).toEqual([
      '37 config-schema',
      '44 config-schema',
      '51 config-schema',
      '51 config-schema',
      '58 config-schema',
      '65 config-schema',
      '72 config-indicator',
      '79 config-indicator',
    ]);
  });
});

describe('valid params reach the indicators typed and camelCased', () => {
  it('the shipped malaria indicator carries species, lagMonths and the relative R0 temperature term (Mordecai et al. 2013)', async () => {
    const config = await loadConfig();
    const malaria = config.indicators.find((i) => i.kind === 'malaria-suitability');
    expect(malaria?.params).toEqual({ species: 'falciparum', lagMonths: 1, temperatureModel: 'mordecai-2013' });
  });
});
