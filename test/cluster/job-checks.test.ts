/**
 * A job is checked by the worker before it reads a file for it (common practice, no source: never trust what
 * crosses a queue). Each job kind is built as the coordinator builds it, sent through JSON as Redis carries it,
 * then damaged one way at a time; the refusal is one `cluster-job-invalid` naming the job and the place.
 */
import { describe, expect, it } from 'vitest';
import { checkJob } from '../../src/cluster/job-checks.ts';
import { checkRegionAnswer, REGION_JOB, toWireRegionJob } from '../../src/cluster/region-jobs.ts';
import { START_JOB } from '../../src/cluster/start-jobs.ts';
import { ForelightError, InputError } from '../../src/core/errors.ts';
import { pairKey } from '../../src/core/keys.ts';
import type { StartRequest } from '../../src/pipeline/hindcast-starts.ts';
import { sampleConfig, sampleRegions } from '../render/fixtures/sample-config.ts';

const config = sampleConfig({ population: null });
const problem = new InputError('read-failed', 'obs.nc', 'cannot open the file (ENOENT)', 'check the path');
const north = pairKey('kessan-lowlands', 'tmax-3day');
const source = {
  id: 'veloria-ens',
  tier: 'days',
  variables: { tmax: 'tasmax' },
} as const;

const extractJob = { path: 'fc.nc', request: { quantities: { tmax: 'tasmax' }, regions: sampleRegions, tier: 'days', startIndex: 0 } };
const startJob: StartRequest = {
  config: { regions: config.regions, indicators: config.indicators, observations: null, population: null, weightsCacheDir: 'cache/w' },
  source,
  start: { year: 2006, start: '03-01', path: 'hc_2006.nc', files: ['hc_2006.nc'], referenceTime: '2006-03-01T00:00:00Z' },
  byVariable: [['tasmax', [['hc_2006.nc']]]],
  forecastCells: [['kessan-lowlands', 12]],
};
const leads = [{ tier: 'days', index: 1, start: '2006-03-01', end: '2006-03-01' }] as const;
const regionJob = toWireRegionJob({
  config: { ...config, regions: [config.regions[0]] },
  source: { ...source, name: 'Veloria ensemble', forecast: ['fc_{date}.nc'], priority: 1, lookbackDays: 3 },
  starts: [
    {
      year: 2006,
      start: '03-01',
      path: 'hc_2006.nc',
      pairs: new Map([
        [north, { units: 'degC', hindcast: { leads: [...leads], members: 2, values: Float64Array.of(31, 32) }, observed: null }],
      ]),
    },
  ],
  observedProblems: [[north, problem.diagnostic]],
  forecastLeadOne: [[north, '2006-03-01']],
});

const viaJson = (data: unknown) => JSON.parse(JSON.stringify(data));
const jobs = { extract: extractJob, [START_JOB]: startJob, [REGION_JOB]: regionJob } as const;

describe('checkJob (a job as a worker takes it from Redis)', () => {
  for (const [name, data] of Object.entries(jobs)) {
    it(`accepts a ${name} job as the coordinator sends it`, () => {
      expect(checkJob({ id: 'j1', name, data: viaJson(data) })).toEqual({ kind: name, data: viaJson(data) });
    });
  }

  // [kind, what is damaged, the damage, where the refusal points]
  const damaged: [keyof typeof jobs, string, (d: ReturnType<typeof viaJson>) => void, RegExp][] = [
    ['extract', 'no path', (d) => delete d.path, /must have required property 'path'/],
    ['extract', 'no region', (d) => (d.request.regions = []), /\/request\/regions must NOT have fewer than 1 items/],
    ['extract', 'a variable name that is a number', (d) => (d.request.quantities.tmax = 7), /\/request\/quantities\/tmax must be string/],
    ['extract', 'a negative start index', (d) => (d.request.startIndex = -1), /\/request\/startIndex must be >= 0/],
    [START_JOB, 'a year as text', (d) => (d.start.year = '2006'), /\/start\/year must be integer/],
    [
      START_JOB,
      'a cell count pair without its count',
      (d) => d.forecastCells[0].pop(),
      /\/forecastCells\/0 must NOT have fewer than 2 items/,
    ],
    [START_JOB, 'no source id', (d) => delete d.source.id, /\/source must have required property 'id'/],
    [
      REGION_JOB,
      'lead values cut short',
      (d) => (d.starts[0].pairs[0][1].hindcast.values = d.starts[0].pairs[0][1].hindcast.values.slice(0, 12)),
      /\/starts\/0\/pairs\/0\/1\/hindcast\/values does not hold 2 values/,
    ],
    [
      REGION_JOB,
      'two regions in one job',
      (d) => d.config.regions.push(d.config.regions[0]),
      /\/config\/regions must NOT have more than 1 items/,
    ],
    [
      REGION_JOB,
      'an observation problem that is not a diagnostic',
      (d) => (d.observedProblems[0][1] = { code: 'x' }),
      /\/observedProblems\/0\/1 is not a diagnostic/,
    ],
    [REGION_JOB, 'a lead-one day that is no date', (d) => (d.forecastLeadOne[0][1] = 'soon'), /\/forecastLeadOne\/0\/1 must match pattern/],
  ];
  for (const [name, what, damage, where] of damaged) {
    it(`refuses a ${name} job with ${what}: one cluster-job-invalid naming the job and the place`, () => {
      const data = viaJson(jobs[name]);
      damage(data);
      let thrown: unknown;
      try {
        checkJob({ id: 'job-42', name, data });
      } catch (err) {
        thrown = err;
      }
      expect(thrown).toBeInstanceOf(ForelightError);
      const d = (thrown as ForelightError).diagnostic;
      expect(d.code).toBe('cluster-job-invalid');
      expect(d.message).toContain(`cluster job job-42 (${name})`);
      expect(d.message).toMatch(where);
      expect(d.hint).toMatch(/same Forelight release/);
    });
  }

  it('refuses a job of a kind no worker knows', () => {
    expect(() => checkJob({ id: 'job-7', name: 'extract-v2', data: viaJson(extractJob) })).toThrow(
      /cluster job job-7 \(extract-v2\).*not one of/,
    );
  });
});

describe('checkRegionAnswer (a region answer read back from Redis)', () => {
  it('accepts the climates text and refuses an answer without it, saying where', () => {
    expect(checkRegionAnswer({ climates: '[]' })).toEqual({ ok: true, value: { climates: '[]' } });
    expect(checkRegionAnswer({ climates: 3 })).toEqual({ ok: false, why: '/climates must be string' });
    expect(checkRegionAnswer(null)).toMatchObject({ ok: false, why: '/ must be object' });
  });
});
