// CAP 1.2 alerts. Every alert is validated against the OASIS CAP 1.2 XML schema (test/reference/CAP-v1.2.xsd,
// OASIS Standard 1 July 2010) with the Debian reference tool xmllint:
//   xmllint --noout --schema test/reference/CAP-v1.2.xsd FILE
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildCapAlerts, capCertainty, capLocalMidnight, capPolygons, capUtc } from '../../src/render/cap.ts';
import { createTemplateEnv } from '../../src/render/template-env.ts';
import type { CapAlert, PreviousIssue } from '../../src/render/model.ts';
import { renderBulletins } from '../../src/render/render-bulletins.ts';
import { sampleConfig, sampleRegions } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

const XSD = new URL('../reference/CAP-v1.2.xsd', import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'forelight-cap-'));

function xmllint(files: string[]): { status: number | null; stderr: string } {
  const r = spawnSync('xmllint', ['--noout', '--schema', XSD, ...files], { encoding: 'utf8' });
  return { status: r.status, stderr: r.stderr };
}

function save(name: string, xml: string): string {
  const path = join(dir, name);
  writeFileSync(path, xml);
  return path;
}

let alerts: CapAlert[];
beforeAll(async () => {
  ({ capAlerts: alerts } = await renderBulletins(sampleConfig(), sampleRun()));
});

describe('CAP 1.2 alerts of the sample run', () => {
  it('one alert per region × indicator above the lowest stage (Kessan heat, Marrow heat, Tulva malaria)', () => {
    expect(alerts.map((a) => `${a.region}/${a.indicator}/${a.msgType}`)).toEqual([
      'kessan-lowlands/tmax-3day/Alert',
      'marrow-highlands/tmax-3day/Alert',
      'tulva-delta/malaria-pf/Alert',
    ]);
  });

  it('every alert validates against the OASIS CAP 1.2 schema (xmllint)', () => {
    const files = alerts.map((a) => save(`${a.id}.xml`, a.xml));
    const r = xmllint(files);
    expect(r.stderr).not.toMatch(/fails to validate|error/i);
    expect(r.status).toBe(0);
  });

  it('xmllint catches an invalid certainty value and a missing required <event>', () => {
    const bad1 = save('bad-certainty.xml', alerts[0].xml.replace(/<certainty>[A-Za-z]+<\/certainty>/g, '<certainty>Probable</certainty>'));
    const bad2 = save('bad-event.xml', alerts[0].xml.replace(/<event>[^<]*<\/event>/g, ''));
    for (const f of [bad1, bad2]) {
      const r = xmllint([f]);
      expect(r.status).not.toBe(0);
      expect(r.stderr).toMatch(/fails to validate/);
    }
  });

  it('identifiers are unique and stable for the same run', () => {
    const again = buildCapAlerts(sampleConfig(), createTemplateEnv(''), sampleRun());
    expect(again.map((a) => a.id)).toEqual(alerts.map((a) => a.id));
    expect(new Set(alerts.map((a) => a.id)).size).toBe(alerts.length);
  });

  it('has the namespace, sent without fractional seconds, status Actual, scope Restricted, Health + Met', () => {
    const xml = alerts[0].xml;
    expect(xml).toContain('<alert xmlns="urn:oasis:names:tc:emergency:cap:1.2">');
    expect(xml).toContain('<sent>2026-11-30T06:30:00-00:00</sent>');
    expect(xml).toContain('<status>Actual</status>');
    expect(xml).toMatch(/<scope>Restricted<\/scope><restriction>[^<]+<\/restriction>/);
    expect(xml).toContain('<category>Health</category><category>Met</category>');
  });

  it('Kessan Brace: severity/urgency from the stage cap config, onset/expires from the deciding lead (day 4 = Fri 4 Dec local)', () => {
    const xml = alerts[0].xml;
    expect(xml).toContain('<urgency>Expected</urgency><severity>Moderate</severity><certainty>Likely</certainty>');
    expect(xml).toContain('<onset>2026-12-04T00:00:00+01:00</onset><expires>2026-12-05T00:00:00+01:00</expires>');
    expect(xml).toContain('<polygon>-12,-3.5 -9,-3.5 -9,-0.5 -12,-0.5 -12,-3.5</polygon>');
  });

  it('Tulva alert carries one <info> per language of its audience (fr team, en national desk)', () => {
    const tulva = alerts.find((a) => a.region === 'tulva-delta')!;
    expect([...tulva.xml.matchAll(/<language>([a-z]+)<\/language>/g)].map((m) => m[1])).toEqual(['fr', 'en']);
  });

  it('exercise runs are marked status Exercise with a note', () => {
    const capAlerts = buildCapAlerts(sampleConfig(), createTemplateEnv(''), { ...sampleRun(), mode: 'exercise' });
    expect(capAlerts[0].xml).toContain('<status>Exercise</status>');
    expect(capAlerts[0].xml).toMatch(/<note>EXERCISE[^<]*<\/note>/);
    expect(xmllint([save('exercise.xml', capAlerts[0].xml)]).status).toBe(0);
  });

  it('Update and Cancel reference the earlier alert as "sender,identifier,sent" and validate', () => {
    const previous: PreviousIssue = {
      runId: '2026-11-26-a',
      alerts: [
        {
          region: 'kessan-lowlands',
          indicator: 'tmax-3day',
          sender: 'forelight@health.veloria.example',
          id: 'forelight.2026-11-26-a.kessan-lowlands.tmax-3day',
          sent: '2026-11-26T06:30:00-00:00',
          stageId: 'mindful',
        },
        {
          region: 'orrin-coast',
          indicator: 'tmax-3day',
          sender: 'forelight@health.veloria.example',
          id: 'forelight.2026-11-26-a.orrin-coast.tmax-3day',
          sent: '2026-11-26T06:30:00-00:00',
          stageId: 'mindful',
        },
      ],
    };
    const capAlerts = buildCapAlerts(sampleConfig(), createTemplateEnv(''), sampleRun(), previous);
    const kessan = capAlerts.find((a) => a.region === 'kessan-lowlands')!;
    const orrin = capAlerts.find((a) => a.region === 'orrin-coast')!;
    expect(kessan.msgType).toBe('Update');
    expect(kessan.xml).toContain(
      '<references>forelight@health.veloria.example,forelight.2026-11-26-a.kessan-lowlands.tmax-3day,2026-11-26T06:30:00-00:00</references>',
    );
    expect(orrin.msgType).toBe('Cancel');
    expect(orrin.xml).toContain(
      '<references>forelight@health.veloria.example,forelight.2026-11-26-a.orrin-coast.tmax-3day,2026-11-26T06:30:00-00:00</references>',
    );
    expect(xmllint(capAlerts.map((a) => save(`prev-${a.id}.xml`, a.xml))).status).toBe(0);
  });

  it('after a Cancel, a new rise is a fresh Alert without references; nothing is sent while it stays at the lowest stage', () => {
    const cancelled: PreviousIssue = {
      runId: '2026-11-26-a',
      alerts: [
        {
          region: 'kessan-lowlands',
          indicator: 'tmax-3day',
          sender: 'forelight@health.veloria.example',
          id: 'x.kessan',
          sent: '2026-11-26T06:30:00-00:00',
          stageId: 'quiet',
        },
        {
          region: 'orrin-coast',
          indicator: 'tmax-3day',
          sender: 'forelight@health.veloria.example',
          id: 'x.orrin',
          sent: '2026-11-26T06:30:00-00:00',
          stageId: 'quiet',
        },
      ],
    };
    const capAlerts = buildCapAlerts(sampleConfig(), createTemplateEnv(''), sampleRun(), cancelled);
    const kessan = capAlerts.find((a) => a.region === 'kessan-lowlands')!;
    expect(kessan.msgType).toBe('Alert');
    expect(kessan.xml).not.toContain('<references>');
    expect(capAlerts.some((a) => a.region === 'orrin-coast')).toBe(false);
  });
});

describe('CAP field helpers', () => {
  it('certainty: p > 0.5 Likely, exactly 0.5 Possible (CHECKS.md §13), p ~ 0 Unlikely (our 0.05 cut, no source)', () => {
    expect(capCertainty(0.51)).toBe('Likely');
    expect(capCertainty(0.5)).toBe('Possible');
    expect(capCertainty(0.2)).toBe('Possible');
    expect(capCertainty(0.04)).toBe('Unlikely');
    expect(capCertainty(0)).toBe('Unlikely');
  });

  it('dateTime matches the CAP pattern \\d\\d\\d\\d-\\d\\d-\\d\\dT\\d\\d:\\d\\d:\\d\\d[-,+]\\d\\d:\\d\\d (schema), UTC as -00:00 (CAP 1.2 §3.3.2)', () => {
    expect(capUtc('2026-11-30T06:30:00.123Z')).toBe('2026-11-30T06:30:00-00:00');
    expect(capUtc('2026-11-30T07:30:00+01:00')).toBe('2026-11-30T06:30:00-00:00');
    expect(capLocalMidnight('2026-12-04', { utcOffsetHours: 1 })).toBe('2026-12-04T00:00:00+01:00');
    expect(capLocalMidnight('2026-12-04', { utcOffsetHours: -3.5 })).toBe('2026-12-04T00:00:00-03:30');
    // IANA zones with daylight saving (tz database rules): Lisbon is UTC+1 in summer, UTC+0 in winter; Cairo
    // skips 00:00–01:00 on 2026-04-24 (last Friday of April, Egypt's 2023 law), so that day starts at 01:00+03:00.
    expect(capLocalMidnight('2026-07-01', { utcOffsetHours: 0, timeZone: 'Europe/Lisbon' })).toBe('2026-07-01T00:00:00+01:00');
    expect(capLocalMidnight('2026-12-04', { utcOffsetHours: 0, timeZone: 'Europe/Lisbon' })).toBe('2026-12-04T00:00:00+00:00');
    expect(capLocalMidnight('2026-04-24', { utcOffsetHours: 0, timeZone: 'Africa/Cairo' })).toBe('2026-04-24T01:00:00+03:00');
  });

  it('polygons put latitude first and close the ring; the Marrow box crossing 0° keeps its signs', () => {
    expect(capPolygons(sampleRegions[1])).toEqual(['-9,-1.5 -6.5,-1.5 -6.5,1.5 -9,1.5 -9,-1.5']);
    const open = {
      ...sampleRegions[2],
      shape: {
        kind: 'polygon' as const,
        ring: [
          [0.5, -13.5],
          [3.5, -13.5],
          [2, -10.5],
        ] as const,
      },
    };
    expect(capPolygons(open)).toEqual(['-13.5,0.5 -13.5,3.5 -10.5,2 -13.5,0.5']);
    const islands = {
      ...sampleRegions[2],
      shape: {
        kind: 'multipolygon' as const,
        polygons: [
          [
            [
              [179, -1],
              [181, -1],
              [181, 1],
              [179, -1],
            ] as const,
          ],
          [
            [
              [10, 0],
              [11, 0],
              [11, 1],
              [10, 0],
            ] as const,
          ],
        ],
      },
    };
    expect(capPolygons(islands)).toEqual(['-1,179 -1,-179 1,-179 -1,179', '0,10 0,11 1,11 0,10']);
  });
});
