// `legwork`: the pure motion computations on local files. Each command is a module in ./commands
// exporting `summary` (one line), `help` and `run(argv, io)`; adding one is a file plus a line in
// the table below.

import { realpathSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { TrackFileError } from '../../shared/motion/track-reader';
import * as check from './commands/check';
import * as cue from './commands/cue';
import * as fk from './commands/fk';
import * as ik from './commands/ik';
import * as processCommand from './commands/process';
import * as verify from './commands/verify';
import type { CliIo } from './io';
import { CAUTION, CliInputError, EXIT, processIo } from './io';
import { runPackageWorkerIfAsked } from './package-worker';

/** A `legwork` subcommand. */
export interface Command {
  summary: string;
  help: string;
  run(argv: string[], io: CliIo): Promise<number>;
}

/** Subcommands by name, in the order `--help` lists them. */
export const commands: Record<string, Command> = {
  ik,
  fk,
  cue,
  check,
  process: processCommand,
  verify,
};

/** The top-level help text. */
export function usage(): string {
  const width = Math.max(...Object.keys(commands).map((k) => k.length));
  const lines = Object.entries(commands).map(([name, c]) => `  ${name.padEnd(width)}  ${c.summary}`);
  return `Usage: legwork <command> [options]     (npx legwork ..., or npm run -s legwork -- ...)

Commands:
${lines.join('\n')}

Run \`legwork <command> --help\` for a command's options. CSV in, CSV or JSON out; errors on stderr.
Exit codes: 0 done (and within budget, or the package matches its manifest), 2 bad input or usage,
3 over a comfort limit only, 4 over a hard limit, 5 a package file does not match its manifest.

${CAUTION}
`;
}

/** Runs one command line (argv without node and script) against io; resolves to the exit code. */
export async function main(argv: string[], io: CliIo = processIo): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    if (name === undefined) {
      io.stderr(usage());
      return EXIT.badInput;
    }
    io.stdout(usage());
    return EXIT.ok;
  }
  const command = Object.hasOwn(commands, name) ? commands[name] : undefined;
  if (!command) {
    io.stderr(`legwork: unknown command "${name}"\n\n${usage()}`);
    return EXIT.badInput;
  }
  try {
    return await command.run(rest, io);
  } catch (e) {
    if (e instanceof CliInputError) {
      io.stderr(`legwork ${name}: ${e.message}\n`);
      if (/^(Unknown option|Option|Unexpected argument|missing (--|PACKAGE))/.test(e.message)) {
        io.stderr(`\n${command.help}`);
      }
      return EXIT.badInput;
    }
    if (e instanceof TrackFileError) {
      io.stderr(`legwork ${name}: ${e.message}\n`);
      return EXIT.badInput;
    }
    io.stderr(
      `legwork ${name}: internal error: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`,
    );
    return EXIT.internal;
  }
}

function isEntryPoint(): boolean {
  const script = process.argv[1];
  if (!script) return false;
  try {
    return realpathSync(script) === realpathSync(fileURLToPath(import.meta.url));
  } catch {
    return false;
  }
}

// In the compiled bundle this module is also the entry of `legwork process`'s worker thread.
if (!runPackageWorkerIfAsked() && isEntryPoint()) {
  main(process.argv.slice(2)).then(
    (code) => {
      process.exitCode = code;
    },
    (e: unknown) => {
      process.stderr.write(`legwork: internal error: ${String(e)}\n`);
      process.exitCode = EXIT.internal;
    },
  );
}
