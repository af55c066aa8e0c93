/**
 * Throw-away PostgreSQL and Redis servers for the scale-out tests, on loopback ports, in temporary folders, started
 * and stopped by the tests themselves (Debian's `postgresql` and `redis-server`, listed in .ci/debian-packages.txt).
 * PostgreSQL refuses to run as root, so as root the cluster is created and run as the `postgres` user, with its data,
 * socket and log folders owned by it.
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { chownSync, existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir, userInfo } from 'node:os';
import { join } from 'node:path';

/** A free TCP port on 127.0.0.1 (asked of the kernel, then released). */
export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      srv.close(() => (typeof addr === 'object' && addr ? resolve(addr.port) : reject(new Error('no port'))));
    });
  });
}

function postgresBin(tool: string): string {
  const root = '/usr/lib/postgresql';
  const versions = existsSync(root)
    ? readdirSync(root)
        .filter((v) => /^\d+$/.test(v))
        .sort((a, b) => Number(b) - Number(a))
    : [];
  for (const v of versions) if (existsSync(join(root, v, 'bin', tool))) return join(root, v, 'bin', tool);
  throw new Error(`PostgreSQL's ${tool} not found under ${root}: apt-get install postgresql`);
}

export interface TestPostgres {
  readonly port: number;
  readonly user: string;
  readonly password: string;
  /** URL of database `name` (created first if `create`), without the password. */
  url(name: string): string;
  createDatabase(name: string): void;
  stop(): void;
}

export async function startPostgres(): Promise<TestPostgres> {
  const asRoot = userInfo().uid === 0;
  const dir = mkdtempSync(join(tmpdir(), 'forelight-pg-'));
  const port = await freePort();
  const user = 'forelight';
  const password = 'test-only-secret';
  const pwfile = join(dir, 'pw');
  writeFileSync(pwfile, `${password}\n`);
  if (asRoot) {
    chownSync(dir, Number(execFileSync('id', ['-u', 'postgres']).toString()), Number(execFileSync('id', ['-g', 'postgres']).toString()));
    chownSync(pwfile, Number(execFileSync('id', ['-u', 'postgres']).toString()), Number(execFileSync('id', ['-g', 'postgres']).toString()));
  }
  const run = (tool: string, args: string[]): string => {
    const [cmd, argv] = asRoot ? ['runuser', ['-u', 'postgres', '--', postgresBin(tool), ...args]] : [postgresBin(tool), args];
    return execFileSync(cmd, argv, { stdio: ['ignore', 'pipe', 'pipe'] }).toString();
  };
  const data = join(dir, 'data');
  run('initdb', ['-D', data, '-U', user, '--auth=scram-sha-256', `--pwfile=${pwfile}`, '--no-sync', '-E', 'UTF8']);
  run('pg_ctl', [
    '-D',
    data,
    '-l',
    join(dir, 'log'),
    '-w',
    '-t',
    '60',
    '-o',
    `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off -c synchronous_commit=off -c full_page_writes=off`,
    'start',
  ]);
  const psql = (sql: string): void => {
    execFileSync(
      postgresBin('psql'),
      ['-h', '127.0.0.1', '-p', String(port), '-U', user, '-d', 'postgres', '-v', 'ON_ERROR_STOP=1', '-c', sql],
      { env: { ...process.env, PGPASSWORD: password }, stdio: ['ignore', 'pipe', 'pipe'] },
    );
  };
  return {
    port,
    user,
    password,
    url: (name) => `postgres://${user}@127.0.0.1:${port}/${name}`,
    createDatabase: (name) => psql(`CREATE DATABASE ${name}`),
    stop: () => {
      try {
        run('pg_ctl', ['-D', data, '-m', 'immediate', 'stop']);
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    },
  };
}

export interface TestRedis {
  readonly port: number;
  readonly url: string;
  stop(): Promise<void>;
}

export async function startRedis(): Promise<TestRedis> {
  const dir = mkdtempSync(join(tmpdir(), 'forelight-redis-'));
  const port = await freePort();
  const child: ChildProcess = spawn(
    'redis-server',
    ['--port', String(port), '--bind', '127.0.0.1', '--save', '', '--appendonly', 'no', '--dir', dir],
    { stdio: ['ignore', 'pipe', 'pipe'] },
  );
  await new Promise<void>((resolve, reject) => {
    let out = '';
    const timer = setTimeout(() => reject(new Error(`redis-server did not start: ${out}`)), 20_000);
    child.stdout!.on('data', (b: Buffer) => {
      out += b.toString();
      if (out.includes('Ready to accept connections')) {
        clearTimeout(timer);
        resolve();
      }
    });
    child.once('error', (e) => {
      clearTimeout(timer);
      reject(new Error(`redis-server could not start (${e.message}): apt-get install redis-server`));
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`redis-server exited ${code}: ${out}`));
    });
  });
  return {
    port,
    url: `redis://127.0.0.1:${port}`,
    stop: async () => {
      child.kill('SIGTERM');
      await new Promise((r) => (child.exitCode !== null ? r(null) : child.once('exit', r)));
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
