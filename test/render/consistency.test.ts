/**
 * The consistency checker (render/consistency.ts) on the sample run: nothing found in the views as rendered, and
 * each kind of contradiction found when seeded into a view (stage, rows, probability words, skill wording,
 * threshold, no forecast) or into the decision the render stage receives. The probability-word bands are the
 * configured ones (sample config); the rest are this project's own rules, no source.
 */
import { describe, expect, it } from 'vitest';
import { checkRegionView, type ContradictionKind } from '../../src/render/consistency.ts';
import type { RegionOutcome } from '../../src/render/model.ts';
import { buildRegionView, type RegionView } from '../../src/render/region-view.ts';
import { renderBulletins } from '../../src/render/render-bulletins.ts';
import { createTemplateEnv } from '../../src/render/template-env.ts';
import { type LeadView } from '../../src/render/view-model.ts';
import { noForecastView, toStageView } from '../../src/render/stage-view.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

const config = sampleConfig();
const env = createTemplateEnv(config.templates);
const run = sampleRun();
const outcome = (id: string): RegionOutcome => run.regions.find((r) => r.region.id === id)!;
const view = (id: string, locale = 'en'): RegionView => buildRegionView(config, outcome(id), locale, 'default', env.t(locale));
const kinds = (id: string, v: RegionView, locale = 'en'): ContradictionKind[] => [
  ...new Set(checkRegionView(config, outcome(id), v, locale, env.t(locale)).map((c) => c.kind)),
];

/** The view with one lead of one range replaced. */
function withLead(v: RegionView, tier: string, index: number, change: (l: LeadView) => LeadView): RegionView {
  return {
    ...v,
    tiers: v.tiers.map((tv) =>
      tv.tier !== tier || tv.indicatorId !== 'tmax-3day' ? tv : { ...tv, leads: tv.leads.map((l) => (l.index === index ? change(l) : l)) },
    ),
  };
}

describe('checkRegionView', () => {
  it.each(['kessan-lowlands', 'marrow-highlands', 'tulva-delta', 'orrin-coast'])(
    'finds nothing in the rendered view of %s (en, fr)',
    (id) => {
      expect(checkRegionView(config, outcome(id), view(id), 'en', env.t('en'))).toEqual([]);
      expect(checkRegionView(config, outcome(id), view(id, 'fr'), 'fr', env.t('fr'))).toEqual([]);
    },
  );

  it('stage: the region shown at another stage than decided', () => {
    const v = view('kessan-lowlands');
    expect(kinds('kessan-lowlands', { ...v, stage: toStageView(config.stages[3], 3, 'en', 'default') })).toContain('stage');
  });

  it('rows: a row pointing above its range stage without a word of why', () => {
    const actNow = toStageView(config.stages[3], 3, 'en', 'default');
    const v = withLead(view('kessan-lowlands'), 'days', 2, (l) => ({ ...l, reached: actNow, note: '' }));
    expect(kinds('kessan-lowlands', v)).toEqual(['rows']);
    // The same row with its reason is consistent.
    const said = withLead(view('kessan-lowlands'), 'days', 2, (l) => ({ ...l, reached: actNow, note: 'capped at ◑ Brace for this range' }));
    expect(kinds('kessan-lowlands', said)).toEqual([]);
  });

  it('rows: a stage raised one step by persistence is backed by rows that point higher and wait for confirmation', () => {
    const v = view('kessan-lowlands');
    const tv = v.tiers.find((t) => t.stage.rank > 0 && t.stage.rank < config.stages.length - 1)!;
    const above = toStageView(config.stages[tv.stage.rank + 1], tv.stage.rank + 1, 'en', 'default');
    const rows = (use: LeadView['use']) => ({
      ...v,
      tiers: v.tiers.map((t) =>
        t !== tv
          ? t
          : { ...t, leads: t.leads.map((l) => ({ ...l, use, reached: above, note: 'waiting for confirmation in the next bulletin' })) },
      ),
    });
    expect(kinds('kessan-lowlands', rows('awaiting'))).not.toContain('rows');
    // The same rows withheld by the skill gate back nothing.
    expect(kinds('kessan-lowlands', rows('no-skill'))).toContain('rows');
  });

  it('rows: rows on which persistence raised the stage in this run say so, and the "not used yet" wording is a contradiction', () => {
    // kessan-lowlands weeks is mindful by week 2; here persistence raised it from quiet while week 2 points to brace.
    const base = outcome('kessan-lowlands');
    const i = base.perTier.findIndex((x) => x.tier === 'weeks' && x.indicator.id === 'tmax-3day');
    const tier = base.perTier[i];
    const uses = tier.probabilities.map((p) =>
      p.lead.index === 2
        ? { index: 2, kind: 'awaiting' as const, reachedId: 'brace', supportsId: 'brace' }
        : { index: p.lead.index, kind: 'counted' as const, reachedId: 'quiet', supportsId: 'quiet' },
    );
    const wait = { direction: 'raise' as const, towardsId: 'brace', runs: 0, needed: 2, raisedFromId: 'quiet' };
    const raised = { ...tier, decision: { ...tier.decision, rawStageId: 'brace', wait, leadUses: uses } };
    const o: RegionOutcome = { ...base, perTier: base.perTier.map((x, j) => (j === i ? raised : x)) };
    for (const locale of ['en', 'fr']) {
      const t = env.t(locale);
      const v = buildRegionView(config, o, locale, 'default', t);
      const row = v.tiers.find((x) => x.tier === 'weeks' && x.indicatorId === 'tmax-3day')!.leads.find((l) => l.index === 2)!;
      expect(row.note).toMatch(locale === 'en' ? /^raised the stage to .* Mindful.*waits for confirmation/ : /^a relevé le niveau/);
      expect(checkRegionView(config, o, v, locale, t).filter((c) => c.kind === 'rows')).toEqual([]);
      const old = t('use.awaiting', { glyph: '◑', label: 'Brace', runs: 0, needed: 2, left: 2 });
      const contradicting = withLead(v, 'weeks', 2, (l) => ({ ...l, note: old }));
      expect(checkRegionView(config, o, contradicting, locale, t).map((c) => c.kind)).toContain('rows');
    }
    // Held, not raised (persistence kept the last stage): the same old wording is right and not flagged.
    const held = { ...raised, decision: { ...raised.decision, wait: { ...wait, runs: 1, raisedFromId: undefined } } };
    const h: RegionOutcome = { ...base, perTier: base.perTier.map((x, j) => (j === i ? held : x)) };
    const hv = buildRegionView(config, h, 'en', 'default', env.t('en'));
    expect(hv.tiers.find((x) => x.tier === 'weeks' && x.indicatorId === 'tmax-3day')!.leads[1].note).toMatch(/^not used for the stage yet/);
    expect(checkRegionView(config, h, hv, 'en', env.t('en')).filter((c) => c.kind === 'rows')).toEqual([]);
  });

  it('rows: an outlook cell whose chance points above its stage without the "+" mark', () => {
    const v = view('kessan-lowlands');
    const actNow = toStageView(config.stages[3], 3, 'en', 'default');
    const outlook = v.outlook.map((row, i) =>
      i > 0 ? row : { ...row, cells: row.cells.map((c, j) => (j === 0 && c?.lead ? { ...c, lead: { ...c.lead, reached: actNow } } : c)) },
    );
    expect(kinds('kessan-lowlands', { ...v, outlook })).toEqual(['rows']);
    const marked = outlook.map((row, i) =>
      i > 0 ? row : { ...row, cells: row.cells.map((c, j) => (j === 0 && c ? { ...c, mark: '+' } : c)) },
    );
    expect(kinds('kessan-lowlands', { ...v, outlook: marked })).toEqual([]);
  });

  it('words: "very unlikely" printed for 70 % (configured band: likely)', () => {
    const v = withLead(view('kessan-lowlands'), 'days', 4, (l) => ({ ...l, word: 'very unlikely' }));
    expect(kinds('kessan-lowlands', v)).toContain('words');
    const h = view('kessan-lowlands');
    expect(kinds('kessan-lowlands', { ...h, headline: { ...h.headline!, chance: '90%' } })).toEqual(['words']);
  });

  it('skill: "fairly sure" on a lead the skill gate withheld, and a headline how-sure sentence from other figures', () => {
    const v = withLead(view('kessan-lowlands'), 'weeks', 3, (l) => ({ ...l, sure: 'high' }));
    expect(kinds('kessan-lowlands', v)).toEqual(['skill']);
    const h = view('kessan-lowlands');
    expect(
      kinds('kessan-lowlands', {
        ...h,
        headline: { ...h.headline!, sure: env.t('en')('sure.high', { years: 20, events: 99, score: '0.9', low: '0.8', high: '1' }) },
      }),
    ).toEqual(['skill']);
  });

  it("threshold: the headline prints a threshold that is not its lead's", () => {
    const h = view('kessan-lowlands');
    expect(kinds('kessan-lowlands', { ...h, headline: { ...h.headline!, threshold: '33.6\u00a0°C' } })).toEqual(['threshold']);
  });

  it('no forecast: "No forecast could be used" or the no-forecast state beside forecast values', () => {
    const v = view('orrin-coast');
    expect(kinds('orrin-coast', { ...v, headline: null })).toEqual(['no-forecast']);
    expect(kinds('orrin-coast', { ...v, stage: noForecastView(env.t('en')) })).toContain('no-forecast');
  });
});

describe('renderBulletins runs the checker on every render', () => {
  it('a decision whose stage no row supports is reported in run.json as bulletin-contradiction, the bulletins still rendered', async () => {
    const seeded = sampleRun();
    const orrin = seeded.regions.find((r) => r.region.id === 'orrin-coast')!;
    const brace = config.stages[2];
    const broken: RegionOutcome = {
      ...orrin,
      stage: brace,
      perTier: orrin.perTier.map((t, i) => (i === 0 ? { ...t, decision: { ...t.decision, stageId: 'brace', rawStageId: 'brace' } } : t)),
    };
    const rendered = await renderBulletins(config, { ...seeded, regions: seeded.regions.map((r) => (r === orrin ? broken : r)) });
    expect(rendered.bulletins.length).toBeGreaterThan(0);
    expect(rendered.contradictions.length).toBeGreaterThan(0);
    expect(
      rendered.contradictions.every(
        (d) => d.code === 'bulletin-contradiction' && d.severity === 'error' && d.place.region === 'orrin-coast',
      ),
    ).toBe(true);
    expect(rendered.contradictions.map((d) => d.message).join('\n')).toMatch(
      /tmax-3day days: stage brace is backed by no row and says no reason/,
    );
    const json = JSON.parse(rendered.json) as { problems: { code: string }[] };
    expect(json.problems.filter((p) => p.code === 'bulletin-contradiction')).toHaveLength(rendered.contradictions.length);
    const clean = await renderBulletins(config, sampleRun());
    expect(clean.contradictions).toEqual([]);
  });
});
