// run.json: full numbers for downstream systems (shape documented in src/render/run-json.ts).
import { beforeAll, describe, expect, it } from 'vitest';
import { renderBulletins } from '../../src/render/render-bulletins.ts';
import { RUN_JSON_SCHEMA } from '../../src/render/run-json.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

let doc: any;
beforeAll(async () => {
  doc = JSON.parse((await renderBulletins(sampleConfig({ teams: sampleConfig().teams.slice(0, 1) }), sampleRun())).json);
});

describe('run.json', () => {
  it('carries the run header, ladder and CAP identifiers', () => {
    expect(doc.schema).toBe(RUN_JSON_SCHEMA);
    expect(doc).toMatchObject({ runId: '2026-11-30-a', issuedAt: '2026-11-30T06:30:00Z', mode: 'live', nextIssue: '2026-12-03' });
    expect(doc.forecastDates[1]).toEqual({
      source: 'subseasonal',
      name: 'Sub-seasonal ensemble',
      referenceTime: '2026-11-26T00:00:00Z',
      basedOnOlder: true,
    });
    expect(doc.stages.map((s: { id: string }) => s.id)).toEqual(['quiet', 'mindful', 'brace', 'act-now']);
    expect(doc.capAlerts).toHaveLength(3);
  });

  it('keeps every LeadProbability field and the decision with its deciding lead, numbers unrounded', () => {
    const input = sampleRun().regions[0].perTier[0];
    const tier = doc.regions[0].tiers[0];
    expect(tier.probabilities).toEqual(JSON.parse(JSON.stringify(input.probabilities)));
    expect(Object.keys(tier.probabilities[0]).sort()).toEqual([
      'baseRate',
      'calibrated',
      'flags',
      'indicator',
      'lead',
      'members',
      'operator',
      'probability',
      'region',
      'skill',
      'source',
      'threshold',
      'validMembers',
    ]);
    expect(tier.probabilities[2].probability).toBe(19 / 30);
    expect(tier.decision.stageId).toBe('brace');
    expect(tier.decision.lead.lead).toEqual({ tier: 'days', index: 4, start: '2026-12-04', end: '2026-12-04' });
  });

  it('writes NaN as null', async () => {
    const run = sampleRun();
    const p = run.regions[0].perTier[0].probabilities[0];
    const broken = {
      ...run,
      regions: [{ ...run.regions[0], perTier: [{ ...run.regions[0].perTier[0], probabilities: [{ ...p, probability: Number.NaN }] }] }],
    };
    const json = JSON.parse((await renderBulletins(sampleConfig({ teams: [] }), broken)).json);
    expect(json.regions[0].tiers[0].probabilities[0].probability).toBeNull();
  });
});
