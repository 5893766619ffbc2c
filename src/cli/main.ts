/**
 * The `faultbook` command: picks the subcommand, runs it, and turns failures into exit codes.
 * Input problems (StudyError) print as `file:line:col: message` with what would be right, exit 2,
 * never a stack trace. Anything else is our fault: exit 1, one line, the stack only with FAULTBOOK_DEBUG=1.
 */
import { suggest } from '../study/check-logic.js';
import { StudyError, StudyErrors } from '../study/errors.js';
import { toolVersion } from '../package.js';
import { EXIT, type Command, type Io } from './io.js';
import { commands } from './commands.js';
import { OutputWriteError } from './outputs.js';
import { terminalIo } from './terminal.js';

const USAGE = `faultbook ${toolVersion} — failure-probability studies to a sourced, reproducible appendix

usage: faultbook <command> [options]

commands:
${Object.entries(commands)
  .map(([name, c]) => `  ${name.padEnd(9)} ${c.summary}`)
  .join('\n')}

Run 'faultbook <command> --help' for a command's options.
Exit codes: 0 done, 2 the study or the arguments are wrong, 3 verification found a difference, 1 anything else.
`;

export async function main(argv: string[], rawIo: Io): Promise<number> {
  // The one place terminal output is made safe: every command prints through this Io.
  const io = terminalIo(rawIo);
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    io.stdout(USAGE);
    return name ? EXIT.ok : EXIT.badInput;
  }
  if (name === '--version' || name === '-V') {
    io.stdout(`${toolVersion}\n`);
    return EXIT.ok;
  }
  const command = commands[name];
  if (!command) {
    io.stderr(`faultbook: unknown command '${name}'\n  expected: ${suggest(name, Object.keys(commands), `one of ${Object.keys(commands).join(', ')}`)}\n`);
    return EXIT.badInput;
  }
  return runGuarded(async (args, out) => (await command.load())(args, out), rest, io);
}

export async function runGuarded(run: Command, argv: string[], io: Io): Promise<number> {
  try {
    return await run(argv, io);
  } catch (err) {
    return reportFailure(err, io);
  }
}

export function reportFailure(err: unknown, io: Io): number {
  if (err instanceof StudyErrors) {
    const shown = err.errors.slice(0, 20);
    for (const e of shown) io.stderr(`error: ${e.describe()}\n`);
    if (err.errors.length > shown.length) io.stderr(`… and ${err.errors.length - shown.length} more\n`);
    return EXIT.badInput;
  }
  if (err instanceof StudyError) {
    io.stderr(`error: ${err.describe()}\n`);
    return EXIT.badInput;
  }
  if (err instanceof OutputWriteError) {
    // The machine, not the study and not us: a folder that cannot be written, a full disk.
    io.stderr(`faultbook: ${err.message}\n`);
    return EXIT.failure;
  }
  const sys = err as NodeJS.ErrnoException;
  if (err instanceof Error && typeof sys.code === 'string' && typeof sys.syscall === 'string') {
    io.stderr(`faultbook: could not ${sys.syscall}${sys.path ? ` ${sys.path}` : ''}: ${sys.code}\n`);
    return EXIT.failure;
  }
  const message = err instanceof Error ? err.message : String(err);
  io.stderr(`faultbook: internal error: ${message}\n`);
  if (process.env.FAULTBOOK_DEBUG && err instanceof Error && err.stack) io.stderr(`${err.stack}\n`);
  else io.stderr('  (this is a fault in faultbook, not in the study; set FAULTBOOK_DEBUG=1 for details)\n');
  return EXIT.failure;
}
