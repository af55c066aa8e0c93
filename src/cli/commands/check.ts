/** `forelight check`: validate a configuration, print every problem as file:line:column, exit 2 when any. */
import { checkConfigFile } from '../../config/load-config.ts';
import { EXIT } from '../../schedule/exit-codes.ts';
import { stringOption, type ParsedArgs } from '../args.ts';

export async function checkCommand(args: ParsedArgs): Promise<number> {
  const { config, problems } = await checkConfigFile(stringOption(args, 'config'));
  for (const p of problems) process.stderr.write(p + '\n');
  if (!config) {
    process.stderr.write(`forelight: ${problems.length} problem(s) in the configuration\n`);
    return EXIT.configInvalid;
  }
  process.stdout.write(
    `${config.file}: ok — ${config.sources.length} sources, ${config.regions.length} regions, ${config.teams.length} teams, ` +
      `${config.indicators.length} indicators, ${config.stages.length} stages, ${config.rules.length} rules\n`,
  );
  return EXIT.ok;
}
