/**
 * `forelight` command-line entry: parses argv, dispatches to one command module, maps errors to a one-line
 * message on stderr and an exit code (see src/core/exit-codes.ts).
 */
import { formatDiagnostic } from '../core/diagnostics.ts';
import { describeError, ForelightError, ConfigError } from '../core/errors.ts';
import { parseArgs, usageError, type OptionSpec, type ParsedArgs } from './args.ts';
import { EXIT } from '../core/exit-codes.ts';

interface CommandDef {
  readonly summary: string;
  readonly usage: string;
  readonly spec: OptionSpec;
  readonly run: (args: ParsedArgs) => Promise<number>;
}

const CONFIG: OptionSpec = { values: ['config'], flags: [] };

const COMMANDS: Readonly<Record<string, CommandDef>> = {
  demo: {
    summary: 'generate the sample scenario (if missing, or always with --fresh) and run it end to end into the outbox',
    usage: 'forelight demo [--fresh]',
    spec: { values: [], flags: ['fresh'] },
    run: async (a) => (await import('./commands/demo.ts')).demoCommand(a),
  },
  run: {
    summary: 'one pass now over the newest inputs: read, compute, decide, render, deliver',
    usage: 'forelight run [--config FILE]... [--date YYYY-MM-DD] [--force] [--dry-run] [--cluster redis://HOST:PORT]',
    spec: { values: ['config', 'date', 'cluster'], flags: ['force', 'dry-run'], repeatable: ['config'] },
    run: async (a) => (await import('./commands/run.ts')).runCommand(a),
  },
  check: {
    summary: 'validate a configuration and report every problem as file:line:column',
    usage: 'forelight check [--config FILE]',
    spec: CONFIG,
    run: async (a) => (await import('./commands/check.ts')).checkCommand(a),
  },
  extract: {
    summary: 'print the decoded, area-weighted region series of one file as JSON',
    usage:
      'forelight extract <file> --var NAME (--box S,N,W,E | --regions FILE [--id-property P] [--name-property P]) [--daily max|min|mean|sum] [--utc-offset H | --time-zone ZONE] [--cells overlap|centre] [--reference-time DATE] [--start K] [--population RASTER [--population-variable V] [--population-values people-per-pixel|people-per-km2]] --json',
    spec: {
      values: [
        'var',
        'box',
        'regions',
        'id-property',
        'name-property',
        'daily',
        'utc-offset',
        'time-zone',
        'cells',
        'reference-time',
        'start',
        'population',
        'population-variable',
        'population-values',
      ],
      flags: ['json'],
    },
    run: async (a) => (await import('./commands/extract.ts')).extractCommand(a),
  },
  regions: {
    summary: "per source grid: each region's cells, covered area and warnings; writes a GeoJSON preview and an SVG map",
    usage: 'forelight regions [--config FILE] [--out DIR]',
    spec: { values: ['config', 'out'], flags: [] },
    run: async (a) => (await import('./commands/regions.ts')).regionsCommand(a),
  },
  skill: {
    summary:
      'print the hindcast skill table (Brier skill score with its 90 % interval, events, ROC area, skill gate) per source, region, indicator and lead',
    usage: 'forelight skill [--config FILE] [--date YYYY-MM-DD] [--source ID] [--region ID] [--indicator ID] [--csv] [--detail]',
    spec: { values: ['config', 'date', 'source', 'region', 'indicator'], flags: ['csv', 'detail'] },
    run: async (a) => (await import('./commands/skill.ts')).skillCommand(a),
  },
  explain: {
    summary: 'show the chain from inputs to stage for one region, indicator and tier',
    usage: 'forelight explain --region ID --indicator ID --tier days|weeks|months [--config FILE] [--date YYYY-MM-DD]',
    spec: { values: ['config', 'date', 'region', 'indicator', 'tier'], flags: [] },
    run: async (a) => (await import('./commands/explain.ts')).explainCommand(a),
  },
  diff: {
    summary: 'dry run: which stages would change against the last issued bulletin, without sending',
    usage: 'forelight diff [--config FILE] [--date YYYY-MM-DD]',
    spec: { values: ['config', 'date'], flags: [] },
    run: async (a) => (await import('./commands/diff.ts')).diffCommand(a),
  },
  backtest: {
    summary: 'replay the configured rules over every hindcast start and count stages, hits, misses, false alarms',
    usage: 'forelight backtest [--config FILE] [--date YYYY-MM-DD] [--csv]',
    spec: { values: ['config', 'date'], flags: ['csv'] },
    run: async (a) => (await import('./commands/backtest.ts')).backtestCommand(a),
  },
  serve: {
    summary: 'service mode: run on the configured schedule until stopped (SIGTERM)',
    usage: 'forelight serve [--config FILE]... [--cluster redis://HOST:PORT]',
    spec: { values: ['config', 'cluster'], flags: [], repeatable: ['config'] },
    run: async (a) => (await import('./commands/serve.ts')).serveCommand(a),
  },
  ledger: {
    summary: "bring the ledger (SQLite file or PostgreSQL database) to this version's schema",
    usage: 'forelight ledger migrate [--config FILE]',
    spec: CONFIG,
    run: async (a) => (await import('./commands/ledger.ts')).ledgerCommand(a),
  },
  status: {
    summary: 'last run, its result, next run and failures',
    usage: 'forelight status [--config FILE] [--cluster redis://HOST:PORT]',
    spec: { values: ['config', 'cluster'], flags: [] },
    run: async (a) => (await import('./commands/status.ts')).statusCommand(a),
  },
  worker: {
    summary: 'cluster worker: read files for the coordinators of --cluster until SIGTERM',
    usage: 'forelight worker --cluster redis://HOST:PORT [--config FILE] [--concurrency N] [--lock-seconds S]',
    spec: { values: ['cluster', 'config', 'concurrency', 'lock-seconds'], flags: [] },
    run: async (a) => (await import('./commands/worker.ts')).workerCommand(a),
  },
};

export function helpText(): string {
  const width = Math.max(...Object.keys(COMMANDS).map((k) => k.length));
  const lines = Object.entries(COMMANDS).map(([name, c]) => `  ${name.padEnd(width)}  ${c.summary}`);
  return [
    'forelight — ensemble forecasts to graded heat-health and malaria-suitability bulletins',
    '',
    'Commands:',
    ...lines,
    '',
    'Without --config the embedded sample configuration (config/forelight.yaml) is used.',
    "Run 'forelight <command> --help' for its options.",
  ].join('\n');
}

export async function main(argv: readonly string[]): Promise<number> {
  try {
    const name = argv[0];
    if (!name || name === '--help' || name === '-h' || name === 'help') {
      process.stdout.write(helpText() + '\n');
      return EXIT.ok;
    }
    const def = COMMANDS[name];
    if (!def) throw usageError(`unknown command '${name}'`);
    const args = parseArgs(argv, () => def.spec);
    if (args.options.help) {
      process.stdout.write(`${def.summary}\nusage: ${def.usage}\n`);
      return EXIT.ok;
    }
    return await def.run(args);
  } catch (err) {
    if (err instanceof ConfigError) {
      for (const d of err.diagnostics) process.stderr.write(formatDiagnostic(d) + '\n');
      process.stderr.write(`forelight: configuration has ${err.diagnostics.length} problem(s); nothing was computed or sent\n`);
      return EXIT.configInvalid;
    }
    process.stderr.write(`forelight: ${describeError(err)}\n`);
    if (err instanceof ForelightError) {
      if (err.code === 'run-in-progress') return EXIT.locked;
      return err.stage === 'cli' ? EXIT.usage : err.stage === 'read' ? EXIT.inputProblem : EXIT.unexpected;
    }
    return EXIT.unexpected;
  }
}
