// Team and national bulletins from the fixed Veloria sample run (test/render/fixtures/sample-run.ts).
import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Bulletin } from '../../src/bulletin-types.ts';
import { ForelightError } from '../../src/core/errors.ts';
import { renderBulletins, type RenderedRun } from '../../src/render/render-bulletins.ts';
import { applyTypography } from '../../src/render/typography.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

let out: RenderedRun;
const byTeam = (team: string): Bulletin => out.bulletins.find((b) => b.team === team)!;
/** Intl puts no-break, thin and narrow no-break spaces in dates, percentages and units; compare with plain spaces. */
const plain = (team: string): string => byTeam(team).text.replace(/[\u00a0\u2009\u202f]/g, ' ');

beforeAll(async () => {
  out = await renderBulletins(sampleConfig(), sampleRun());
});

describe('renderBulletins on the sample run', () => {
  it('one bulletin per team, in the team locale, addressed to its recipients', () => {
    expect(out.bulletins.map((b) => `${b.team}:${b.locale}`)).toEqual([
      'kessan-health:en',
      'marrow-health:en',
      'tulva-health:fr',
      'orrin-health:en',
      'national-desk:en',
    ]);
    expect(byTeam('national-desk').to).toEqual(['desk@health.veloria.example', 'epidemiology@health.veloria.example']);
  });

  it('subjects name the date and each region stage with label and glyph', () => {
    expect(byTeam('kessan-health').subject).toBe('Republic of Veloria heat and malaria outlook, 30 Nov 2026 — Kessan Lowlands: Brace ◑');
    expect(byTeam('tulva-health').subject.replace(/[\u00a0\u202f]/g, ' ')).toBe(
      'République de Veloria — perspectives chaleur et paludisme, 30 nov. 2026 — Tulva Delta : Vigilant ◔',
    );
    expect(byTeam('national-desk').subject).toBe('Republic of Veloria heat and malaria summary, 30 Nov 2026 — Brace ◑: Kessan Lowlands');
  });

  it('team bulletins cover only their regions; the national summary covers all four', () => {
    expect(byTeam('kessan-health').text).not.toContain('MARROW HIGHLANDS');
    for (const name of ['KESSAN LOWLANDS', 'MARROW HIGHLANDS', 'TULVA DELTA', 'ORRIN COAST'])
      expect(byTeam('national-desk').text).toContain(name);
  });

  it('every bulletin carries every caution of its locale, in HTML and text', () => {
    const cfg = sampleConfig();
    for (const b of out.bulletins) {
      for (const c of cfg.cautions[b.locale].map((x) => applyTypography(b.locale, x))) {
        expect(b.text).toContain(c);
        expect(b.html).toContain(c.replace(/'/g, '&#39;'));
      }
    }
  });

  it('refuses to render when a locale in use has no cautions', async () => {
    const cfg = sampleConfig({ cautions: { en: sampleConfig().cautions.en, fr: [] } });
    await expect(renderBulletins(cfg, sampleRun())).rejects.toThrow(/no caution text for locale "fr"/);
    await expect(renderBulletins(cfg, sampleRun())).rejects.toBeInstanceOf(ForelightError);
  });

  it('first screen: hazard in plain words with its threshold, dates, chance against the normal year with the configured word, how sure', () => {
    const k = plain('kessan-health');
    expect(k).toContain(
      'Hot days (3-day average of daily highs), above 34.2 °C, higher than in 9 of 10 past years\nWhen: 3 – 5 Dec\nHow likely: 70% chance, likely (in a normal year 10%), highest on Fri 4 Dec\nHow sure: Fairly sure',
    );
    expect(plain('tulva-health')).toContain('Probabilité : 68 % de probabilité, probable (une année normale : 30 %)');
    // Order of the first screen (issue: stage, hazard and dates, how likely, how sure, action, what changed, outlook).
    const order = [
      '==== KESSAN LOWLANDS: ◑ Brace',
      'Hot days',
      'When:',
      'How likely:',
      'How sure:',
      'What your team should do now:',
      'Since the last bulletin:',
      'Outlook',
    ].map((x) => k.indexOf(x));
    expect(order.every((v, i) => v >= 0 && (i === 0 || v > order[i - 1]))).toBe(true);
  });

  it('outlook strip: one row per hazard, days / weeks / months, glyph and chance; "not forecast" where a hazard has no range', () => {
    expect(plain('kessan-health')).toContain(' - Hot days (3-day average of daily highs): ◑ 70% / ◔ 44% / ○ 32%');
    // Its months are a perfect-model estimate only: never used to raise a stage, so no usable chance ('–', * = no proven skill).
    expect(plain('kessan-health')).toContain(' - Weather favouring malaria: not forecast / not forecast / ○ –*');
  });

  it('short tables merge consecutive leads with the same stage; the full per-lead table is left to the archive', () => {
    const k = plain('kessan-health');
    expect(k).toContain('1 – 2 Dec: ○ Quiet, 17–30% (normal year 10%)');
    expect(k).toContain('3 – 5 Dec: ◑ Brace, 60–70% (normal year 10%)');
    expect(k).not.toMatch(/^ +Fri 4 Dec: /m);
    expect(k).toContain('Every day, week and month with all its numbers is on the archive page and in run.json.');
  });

  it('no jargon above the technical note; the note at the end has method, threshold and skill', () => {
    for (const team of ['kessan-health', 'marrow-health', 'orrin-health', 'national-desk']) {
      const t = plain(team);
      const [body, note] = t.split('HOW THIS WAS WORKED OUT');
      expect(note, team).toBeDefined();
      expect(body, team).not.toMatch(/\btiers?\b|hindcast|quantile|degC|percentile|Rothfusz|lead (day|week|month)|ROC/i);
      expect(note).toMatch(/90th percentile of the model's own climate \(hindcasts/);
    }
    expect(plain('kessan-health')).toContain(
      'Skill over 20 past years: fair Brier skill score 0.23 to 0.43; a lead raises a stage only when the lower end of the 90 % interval',
    );
  });

  it('says plainly when a range has no demonstrated skill, and when skill is a model-only estimate', () => {
    const k = plain('kessan-health');
    expect(k).toContain(
      '15 – 28 Dec: ○ Quiet, 16–24% (normal year 10%), not used for the stage: no demonstrated skill at this range, treat as normal',
    );
    expect(k).toContain('(potential skill: model against itself, no observations, never used to raise a stage)');
    expect(plain('tulva-health')).toContain(
      'non retenu pour le niveau : fiabilité non démontrée à cette échéance, considérer comme normal',
    );
  });

  it('uses the team-specific actions when configured, else the default', () => {
    expect(byTeam('tulva-health').text).toContain(
      'Revoir les plans, vérifier les stocks de moustiquaires et de tests rapides dans le delta.',
    );
    expect(byTeam('kessan-health').text).toContain('Alert clinics and community health workers');
    expect(byTeam('national-desk').text).toContain('Inform the ministry duty officer');
  });

  it('says what changed and why, which forecasts were used (late source flagged) and the next issue date', () => {
    const t = plain('kessan-health');
    expect(t).toContain(
      'Since the last bulletin: Raised from ◔ Mindful to ◑ Brace. Hot days (3-day average of daily highs) over the next days: 70% chance for Fri 4 Dec, against 10% in a normal year.',
    );
    expect(t).toContain('Sub-seasonal forecast: the newer forecast was late, so this bulletin is based on the forecast of 26 Nov 2026');
    expect(t).toContain('Short-range forecast: forecast of 30 Nov 2026');
    expect(t).toContain('Next bulletin: 3 Dec 2026.');
    expect(plain('orrin-health')).toContain('Lowered from ◔ Mindful to ○ Quiet.');
  });

  it('embeds one PNG chart per region × indicator as a CID attachment referenced by the HTML', () => {
    const b = byTeam('kessan-health');
    expect(b.attachments.map((a) => a.cid)).toEqual(['kessan-lowlands-tmax-3day@forelight', 'kessan-lowlands-malaria-pf@forelight']);
    for (const a of b.attachments) {
      expect(Buffer.from(a.content.subarray(0, 8)).toString('hex')).toBe('89504e470d0a1a0a'); // PNG signature (ISO/IEC 15948)
      expect(b.html).toContain(`src="cid:${a.cid}"`);
    }
  });

  it('plain-text bulletins match their snapshots (en team, fr team)', async () => {
    await expect(byTeam('kessan-health').text).toMatchFileSnapshot('./__snapshots__/kessan-health.txt');
    await expect(byTeam('tulva-health').text).toMatchFileSnapshot('./__snapshots__/tulva-health.txt');
  });
});

describe('exercise and empty tiers', () => {
  it('an exercise run is marked in the subject and body', async () => {
    const r = await renderBulletins(sampleConfig({ teams: sampleConfig().teams.slice(0, 1) }), { ...sampleRun(), mode: 'exercise' });
    expect(r.bulletins[0].subject).toMatch(/^\[EXERCISE\] /);
    expect(r.bulletins[0].html).toContain('EXERCISE — made from sample data for practice. Take no action.');
    expect(r.bulletins[0].text).toMatch(/^\*\*\* EXERCISE/);
  });

  it('a tier without any lead (source missing) still renders', async () => {
    const run = sampleRun();
    const k = run.regions[0];
    const emptied = { ...run, regions: [{ ...k, perTier: k.perTier.map((t, i) => (i === 1 ? { ...t, probabilities: [] } : t)) }] };
    const r = await renderBulletins(sampleConfig({ teams: sampleConfig().teams.slice(0, 1) }), emptied);
    expect(r.bulletins[0].text).toContain('   Coming weeks · Stage for this range: ◔ Mindful');
  });
});

describe('templates', () => {
  it('an operator override in config.templates wins over the shipped file; the rest still come from the shipped set', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-tpl-'));
    writeFileSync(join(dir, 'team.txt.njk'), 'Custom bulletin for {{ team.name }}\n');
    const r = await renderBulletins(sampleConfig({ templates: dir, teams: sampleConfig().teams.slice(0, 1) }), sampleRun());
    const k = r.bulletins.find((b) => b.team === 'kessan-health')!;
    expect(k.text).toBe('Custom bulletin for Kessan Lowlands District Health Office\n');
    expect(k.html).toContain('Read before acting');
    // One message overridden in the operator's catalogue; the rest from the shipped one.
    mkdirSync(join(dir, 'messages'));
    writeFileSync(join(dir, 'messages', 'en.yaml'), 'cautions.heading: "Before you act"\n');
    const r2 = await renderBulletins(sampleConfig({ templates: dir, teams: sampleConfig().teams.slice(0, 1) }), sampleRun());
    expect(r2.bulletins[0].html).toContain('Before you act');
    expect(r2.bulletins[0].html).toContain('What your team should do now');
  });

  it('an undefined variable in a template fails the run (throwOnUndefined)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-tpl-'));
    writeFileSync(join(dir, 'team.txt.njk'), '{{ team.nickname }}\n');
    await expect(renderBulletins(sampleConfig({ templates: dir }), sampleRun())).rejects.toThrow(/template team\.txt\.njk .* failed/);
  });
});

describe('hostile names from YAML', () => {
  const evil = '<script>alert(1)</script>Kessan\r\nBcc: x@y.example';

  it('cannot inject HTML (autoescape) or mail headers (CR/LF stripped from the subject)', async () => {
    const cfg = sampleConfig();
    const run = sampleRun();
    const regions = run.regions.map((r) => (r.region.id === 'kessan-lowlands' ? { ...r, region: { ...r.region, name: evil } } : r));
    const teams = cfg.teams.filter((t) => t.id === 'kessan-health').map((t) => ({ ...t, name: `Team <b>x</b>\r\nX-Injected: 1` }));
    const r = await renderBulletins({ ...cfg, teams }, { ...run, regions });
    const b = r.bulletins.find((x) => x.team === 'kessan-health')!;
    expect(b.html).not.toContain('<script>');
    expect(b.html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(b.html).not.toContain('<b>x</b>');
    expect(b.subject).not.toMatch(/[\r\n\u0000-\u001f]/);
    expect(b.subject).toContain('<script>alert(1)</script>Kessan Bcc: x@y.example: Brace ◑');
    expect(r.archive.bodyHtml).not.toContain('<script>');
    for (const a of r.capAlerts) expect(a.xml).not.toContain('<script>');
  });

  it('rejects a recipient address carrying extra header lines', async () => {
    const cfg = sampleConfig();
    const teams = cfg.teams.map((t) =>
      t.id === 'orrin-health' ? { ...t, recipients: ['alerts@orrin.health.veloria.example\r\nBcc: x@y.example'] } : t,
    );
    await expect(renderBulletins({ ...cfg, teams }, sampleRun())).rejects.toThrow(
      /team "orrin-health" recipient .* is not a single e-mail address/,
    );
  });
});
