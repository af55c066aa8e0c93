/**
 * Timing helpers of the benchmark: run a command as a child, measure its wall time and peak resident set
 * size and CPU time (GNU time `%M`, `%U`, `%S`, i.e. getrusage ru_maxrss of the child and the descendants it waited for), and
 * describe the machine.
 */
import { execFileSync, spawn } from 'node:child_process';
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface Measurement {
  readonly seconds: number;
  /** Peak RSS in KiB, or NaN when GNU time is not installed. */
  readonly maxRssKb: number;
  /** User + system CPU seconds of the child and its waited-for descendants (GNU time `%U + %S`), or NaN. */
  readonly cpuSeconds: number;
  readonly stdout: string;
}

const GNU_TIME = '/usr/bin/time';

/** Runs `argv` to completion; throws with its stderr tail when it fails. */
export async function measure(argv: readonly string[], cwd: string): Promise<Measurement> {
  const rssFile = join(tmpdir(), `forelight-bench-rss-${process.pid}.txt`);
  const withTime = existsSync(GNU_TIME) ? [GNU_TIME, '-f', '%M %U %S', '-o', rssFile, ...argv] : [...argv];
  const began = performance.now();
  const { code, stdout, stderr } = await new Promise<{ code: number | null; stdout: string; stderr: string }>((resolve, reject) => {
    const child = spawn(withTime[0], withTime.slice(1), { cwd, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    child.stdout.on('data', (d: Buffer) => (out += d.toString()));
    child.stderr.on('data', (d: Buffer) => (err += d.toString()));
    child.on('error', reject);
    child.on('close', (c) => resolve({ code: c, stdout: out, stderr: err }));
  });
  const seconds = (performance.now() - began) / 1000;
  if (code !== 0) {
    const lines = stderr.trim().split('\n');
    const why = lines.find((l) => /^\w*Error\b|^Error:|^Warning|^cdo/.test(l.trim())) ?? lines.at(-1) ?? '';
    throw new Error(`${argv.slice(0, 3).join(' ')} … exited with ${code}: ${why.trim()}`);
  }
  let [maxRssKb, cpuSeconds] = [NaN, NaN];
  if (existsSync(rssFile)) {
    const [rss, user, sys] = (readFileSync(rssFile, 'utf8').trim().split('\n').at(-1) ?? '').split(' ').map(Number);
    [maxRssKb, cpuSeconds] = [rss, user + sys];
    rmSync(rssFile);
  }
  return { seconds, maxRssKb, cpuSeconds, stdout };
}

/** Median; NaN when empty or when any run failed (NaN). */
export const median = (xs: readonly number[]): number => {
  if (xs.length === 0 || xs.some(Number.isNaN)) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
};

function firstLine(cmd: string, args: readonly string[]): string {
  try {
    return execFileSync(cmd, args, { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] })
      .split('\n')[0]
      .trim();
  } catch {
    return `${cmd}: not available`;
  }
}

/** nproc, CPU model, memory, Node, CDO, Python/numpy/netCDF4 versions. */
export function describeMachine(): string[] {
  const cpuinfo = readFileSync('/proc/cpuinfo', 'utf8');
  const model = /model name\s*:\s*(.+)/.exec(cpuinfo)?.[1] ?? 'unknown CPU';
  const memKb = Number(/MemTotal:\s*(\d+)/.exec(readFileSync('/proc/meminfo', 'utf8'))?.[1] ?? NaN);
  return [
    `cpu: ${model}, nproc ${firstLine('nproc', [])}, memory ${(memKb / 1048576).toFixed(1)} GiB`,
    `node ${process.version}; ${firstLine('cdo', ['--version'])}`,
    `python: ${firstLine('/usr/bin/python3', ['-c', 'import sys,numpy,netCDF4;print(sys.version.split()[0],"numpy",numpy.__version__,"netCDF4",netCDF4.__version__,"libnetcdf",netCDF4.__netcdf4libversion__)'])}`,
  ];
}
