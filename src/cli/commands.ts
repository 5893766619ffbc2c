/**
 * The subcommands, in the order `faultbook --help` lists them. Each command's module is loaded only
 * when that command runs: `run --format json` on a large study should not pay for the XML, archive
 * and comparison code (about 50 ms of module loading, a tenth of such a run).
 */
import type { Command } from './io.js';

export interface CommandEntry {
  /** One line for `faultbook --help`. */
  summary: string;
  load: () => Promise<Command>;
}

export const commands: Record<string, CommandEntry> = {
  run: { summary: 'quantify a study and write its appendix', load: async () => (await import('./run.js')).runCommand },
  check: { summary: 'validate a study folder and list its warnings; writes nothing', load: async () => (await import('./check.js')).checkCommand },
  fit: { summary: 'fit a Weibull distribution to life records', load: async () => (await import('./fit.js')).fitCommand },
  new: { summary: 'create a starter study folder (refuses a folder that is not empty)', load: async () => (await import('./new.js')).newCommand },
  compare: { summary: 'compare two revisions of a study and show what moved the answer', load: async () => (await import('./compare.js')).compareCommand },
  archive: {
    summary: 'bundle a study with its outputs and a manifest into one .tar.gz (optionally signed)',
    load: async () => (await import('./archive.js')).archiveCommand,
  },
  verify: {
    summary: 'check an archive (signature, hashes), recompute its numbers and re-render it (exit 3 on any difference)',
    load: async () => (await import('./verify.js')).verifyCommand,
  },
  export: { summary: 'write the study as an Open-PSA MEF document', load: async () => (await import('./export.js')).exportCommand },
  import: { summary: 'make a study folder from an Open-PSA MEF document', load: async () => (await import('./import.js')).importCommand },
};
