/** The subcommands, in the order `faultbook --help` lists them. */
import type { Command } from './io.js';
import { archiveCommand } from './archive.js';
import { checkCommand } from './check.js';
import { compareCommand } from './compare.js';
import { exportCommand } from './export.js';
import { fitCommand } from './fit.js';
import { importCommand } from './import.js';
import { newCommand } from './new.js';
import { runCommand } from './run.js';
import { verifyCommand } from './verify.js';

export const commands: Record<string, { summary: string; run: Command }> = {
  run: runCommand,
  check: checkCommand,
  fit: fitCommand,
  new: newCommand,
  compare: compareCommand,
  archive: archiveCommand,
  verify: verifyCommand,
  export: exportCommand,
  import: importCommand,
};
