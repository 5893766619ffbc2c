/**
 * Argument parsing on node:util's parseArgs, with mistakes reported as input errors (exit 2) that
 * say what would be right, and every command's --help from one description.
 */
import { parseArgs } from 'node:util';
import { suggest } from '../study/check-logic.js';
import { StudyError } from '../study/errors.js';

export interface OptionSpec {
  type: 'string' | 'boolean';
  help: string;
  /** Placeholder in the help text, e.g. DIR. */
  value?: string;
}

export interface CommandSpec {
  usage: string;
  summary: string;
  options: Record<string, OptionSpec>;
  /** How many positional arguments: exact count. */
  positionals: string[];
}

export function helpText(name: string, spec: CommandSpec): string {
  const lines = [`usage: faultbook ${name} ${spec.usage}`, '', spec.summary, ''];
  const opts = Object.entries(spec.options);
  if (opts.length) {
    lines.push('options:');
    for (const [flag, o] of opts) lines.push(`  --${flag}${o.value ? ` ${o.value}` : ''}`.padEnd(28) + o.help);
  }
  lines.push('  --help'.padEnd(28) + 'show this help');
  return lines.join('\n') + '\n';
}

export function parseCommandArgs(
  name: string,
  spec: CommandSpec,
  argv: string[],
): { help: true } | { help: false; values: Record<string, string | boolean | undefined>; positionals: string[] } {
  const options: Record<string, { type: 'string' | 'boolean' }> = { help: { type: 'boolean' } };
  for (const [flag, o] of Object.entries(spec.options)) options[flag] = { type: o.type };
  checkOptions(name, spec, argv, options);
  let parsed;
  try {
    parsed = parseArgs({ args: argv, options, allowPositionals: true, strict: true });
  } catch (err) {
    const message = err instanceof Error ? err.message.split('\n')[0]! : String(err);
    throw new StudyError(`faultbook ${name}: ${message}`, undefined, `faultbook ${name} ${spec.usage} (see --help)`);
  }
  if (parsed.values.help) return { help: true };
  if (parsed.positionals.length !== spec.positionals.length) {
    throw new StudyError(
      `faultbook ${name} takes ${spec.positionals.length} argument${spec.positionals.length === 1 ? '' : 's'} (${spec.positionals.join(', ')}), got ${parsed.positionals.length}`,
      undefined,
      `faultbook ${name} ${spec.usage}`,
    );
  }
  return { help: false, values: parsed.values as Record<string, string | boolean | undefined>, positionals: parsed.positionals };
}

/**
 * Our own words for the option mistakes people make (the parser's text names its internals):
 * an unknown option, with the nearest known one; a value given to a switch; a value missing.
 */
function checkOptions(name: string, spec: CommandSpec, argv: string[], options: Record<string, { type: 'string' | 'boolean' }>): void {
  const usage = `faultbook ${name} ${spec.usage} (see --help)`;
  const known = Object.keys(options).map((o) => `--${o}`);
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    if (arg === '--') return;
    if (!arg.startsWith('-') || arg === '-') continue;
    const [flag, inline] = arg.startsWith('--') ? [arg.slice(2).split('=')[0]!, arg.includes('=') ? arg.slice(arg.indexOf('=') + 1) : undefined] : [arg.slice(1), undefined];
    const o = arg.startsWith('--') ? options[flag] : undefined;
    if (!o) {
      const written = arg.split('=')[0]!;
      throw new StudyError(`faultbook ${name} has no option '${written}'`, undefined, suggest(arg.startsWith('--') ? `--${flag}` : `--${flag}`, known, `one of: ${known.join(', ')}`));
    }
    if (o.type === 'boolean' && inline !== undefined) throw new StudyError(`option --${flag} is a switch and takes no value ('${arg}')`, undefined, `--${flag} alone`);
    if (o.type === 'string' && inline === undefined) {
      const next = argv[i + 1];
      if (next === undefined || (next.startsWith('--') && next.length > 2)) throw new StudyError(`option --${flag} needs a value`, undefined, `--${flag} ${spec.options[flag]?.value ?? 'VALUE'} (${usage})`);
      i++;
    }
  }
}
