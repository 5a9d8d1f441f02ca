// Options of the `legwork` commands: one parser, so that every command rejects misuse with the same
// messages (which main() recognises to print the command's help after them).

import { parseArgs } from 'node:util';
import { CliInputError } from './io';

/** What a value-taking option is called in a "missing" message: `missing --out DIR`. */
export type ValueName = 'FILE' | 'DIR';

/** Parsed options: every named option as given (or undefined), the required ones present and non-empty. */
export type CommandOptions<N extends string, R extends N> = { [K in N]?: string } & { [K in R]: string };

/**
 * Parses `--name VALUE` options and `-h/--help` (no positionals); returns null when help is asked for,
 * before any required option is checked. Required options are checked in the order given, and any
 * misuse throws CliInputError.
 */
export function parseCommandOptions<const N extends string, R extends N = never>(
  argv: string[],
  names: readonly N[],
  required: { readonly [K in R]: ValueName },
): CommandOptions<N, R> | null {
  const options: Record<string, { type: 'string' } | { type: 'boolean'; short: string }> = {};
  for (const name of names) options[name] = { type: 'string' };
  options.help = { type: 'boolean', short: 'h' };
  let values: Record<string, unknown>;
  try {
    values = parseArgs({ args: argv, options, strict: true, allowPositionals: false }).values;
  } catch (e) {
    throw new CliInputError((e as Error).message);
  }
  if (values.help) return null;
  for (const [name, valueName] of Object.entries<ValueName>(required)) {
    if (!values[name]) throw new CliInputError(`missing --${name} ${valueName}`);
  }
  return values as CommandOptions<N, R>;
}
