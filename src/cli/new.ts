/** `faultbook new DIR`: a small starter study to edit, copied from templates/starter. */
import { commands } from './commands.js';
import { cpSync, existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { packageRoot } from '../package.js';
import { StudyError } from '../study/errors.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command } from './io.js';

const spec: CommandSpec = {
  usage: 'DIR',
  summary: commands.new!.summary,
  options: {},
  positionals: ['DIR'],
};

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('new', spec, argv);
  if (args.help) {
    io.stdout(helpText('new', spec));
    return EXIT.ok;
  }
  const dir = args.positionals[0]!;
  if (existsSync(dir) && readdirSync(dir).length > 0) {
    throw new StudyError(`${dir} exists and is not empty`, undefined, 'a new or empty folder (faultbook new never overwrites)');
  }
  cpSync(join(packageRoot, 'templates', 'starter'), dir, { recursive: true });
  io.stdout(`created ${dir}: edit its files, then 'faultbook check ${dir}' and 'faultbook run ${dir}'\n`);
  return EXIT.ok;
};

export const newCommand: Command = run;
