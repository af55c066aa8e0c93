/**
 * Minimal argv parser: `command [positionals] [--flag] [--key value | --key=value]`.
 * Unknown options are errors so that a typo never changes behaviour silently.
 */
import { ForelightError } from '../core/errors.ts';

export interface ParsedArgs {
  readonly command: string | undefined;
  readonly positionals: readonly string[];
  readonly options: Readonly<Record<string, string | true>>;
  /** Every value of each option that takes values, in command-line order. */
  readonly values: Readonly<Record<string, readonly string[]>>;
}

export interface OptionSpec {
  /** Options that take a value. */
  readonly values: readonly string[];
  /** Options that are plain switches. */
  readonly flags: readonly string[];
  /** Options that may be given more than once (each value kept); any other given twice is an error. */
  readonly repeatable?: readonly string[];
}

export function parseArgs(argv: readonly string[], specFor: (command: string | undefined) => OptionSpec): ParsedArgs {
  const command = argv[0] && !argv[0].startsWith('-') ? argv[0] : undefined;
  const rest = command ? argv.slice(1) : argv;
  const spec = specFor(command);
  const positionals: string[] = [];
  const options: Record<string, string | true> = {};
  const values: Record<string, string[]> = {};
  for (let i = 0; i < rest.length; i++) {
    const arg = rest[i];
    if (!arg.startsWith('--')) {
      positionals.push(arg);
      continue;
    }
    const eq = arg.indexOf('=');
    const name = arg.slice(2, eq < 0 ? undefined : eq);
    if (spec.flags.includes(name) || name === 'help') {
      options[name] = true;
    } else if (spec.values.includes(name)) {
      const value = eq >= 0 ? arg.slice(eq + 1) : rest[++i];
      if (value === undefined) throw usageError(`option --${name} needs a value`);
      if (values[name] && !spec.repeatable?.includes(name)) throw usageError(`option --${name} is given more than once`);
      options[name] = value;
      (values[name] ??= []).push(value);
    } else {
      throw usageError(`unknown option --${name} for '${command ?? ''}'`);
    }
  }
  return { command, positionals, options, values };
}

export function usageError(message: string): ForelightError {
  return new ForelightError('cli', 'usage', message, "run 'forelight --help' for the commands and options");
}

export function stringOption(args: ParsedArgs, name: string): string | undefined {
  const v = args.options[name];
  return typeof v === 'string' ? v : undefined;
}

/** Every value of a repeatable option, in order (none: empty). */
export function stringOptions(args: ParsedArgs, name: string): readonly string[] {
  return args.values[name] ?? [];
}

/** The value of `--name`, one of `allowed` (undefined when not given); any other value is a usage error listing them. */
export function choiceOption<T extends string>(args: ParsedArgs, name: string, allowed: readonly T[]): T | undefined {
  const given = stringOption(args, name);
  const value = allowed.find((a) => a === given);
  if (given !== undefined && value === undefined) throw usageError(`--${name} must be one of ${allowed.join(', ')}, got '${given}'`);
  return value;
}
