#!/usr/bin/env node
// Before the tests: checks that every Debian package in .ci/debian-packages.txt is installed. Run as root, it installs
// the missing ones itself (apt-get update, then apt-get install -y); otherwise it stops at once with the one command to
// run, so the suite never fails halfway through on a missing reference tool.
import { execFileSync, spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const listFile = join(dirname(fileURLToPath(import.meta.url)), '..', '.ci', 'debian-packages.txt');
const wanted = readFileSync(listFile, 'utf8')
  .split('\n')
  .map((l) => l.replace(/#.*/, '').trim())
  .filter(Boolean);

function installed(pkg) {
  const r = spawnSync('dpkg-query', ['-W', '-f=${Status}', pkg], { encoding: 'utf8' });
  return r.status === 0 && r.stdout.includes('install ok installed');
}

if (spawnSync('dpkg-query', ['--version']).error) {
  process.stderr.write(`preflight: no dpkg-query here (not Debian); install the tools of ${listFile} with your package manager\n`);
  process.exit(0);
}
const missing = wanted.filter((p) => !installed(p));
if (missing.length === 0) process.exit(0);
const line = `apt-get update && apt-get install -y ${missing.join(' ')}`;
if (process.getuid?.() !== 0) {
  process.stderr.write(`preflight: the tests need Debian packages that are not installed; run:\n  sudo ${line}\n`);
  process.exit(1);
}
process.stderr.write(`preflight: installing ${missing.length} missing Debian package(s): ${missing.join(' ')}\n`);
const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
execFileSync('apt-get', ['update'], { stdio: ['ignore', 'inherit', 'inherit'], env });
execFileSync('apt-get', ['install', '-y', ...missing], { stdio: ['ignore', 'inherit', 'inherit'], env });
