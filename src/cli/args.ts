/**
 * Argument parsing on node:util's parseArgs, with mistakes reported as input errors (exit 2) that
 * say what would be right, and every command's --help from one description.
 */
import { parseArgs } from 'node:util';
import { StudyError } from '../study/errors.js';

export interface OptionSpec {
  type: 'string' | 'boolean';
  help: string;
  /** Placeholder in the help text, e.g. DIR. */
  value?: string;
  /** May be given more than once (its value is then a list). */
  multiple?: boolean;
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
): { help: true } | { help: false; values: Record<string, string | boolean | string[] | undefined>; positionals: string[] } {
  const options: Record<string, { type: 'string' | 'boolean'; multiple?: boolean }> = { help: { type: 'boolean' } };
  for (const [flag, o] of Object.entries(spec.options)) options[flag] = { type: o.type, ...(o.multiple ? { multiple: true } : {}) };
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
  return { help: false, values: parsed.values as Record<string, string | boolean | string[] | undefined>, positionals: parsed.positionals };
}
