/**
 * `faultbook run STUDY`: read, analyse and render; every output is made in memory first and only
 * then written, each file renamed into place, so a failed run leaves earlier outputs as they were.
 */
import { availableParallelism } from 'node:os';
import { basename, join, resolve } from 'node:path';
import { analyze } from '../analysis/analyze.js';
import { StudyError } from '../study/errors.js';
import { confine, readStudy } from '../study/read.js';
import { OUTPUT_FORMATS, renderOutputs, type OutputFormat } from '../report/outputs.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command } from './io.js';
import { refuseOutputsThatAreInputs } from './no-clobber.js';
import { writeOutputs, type OutputFile } from './outputs.js';
import { formatProbability, printWarnings } from './print.js';
import { createProgress } from './progress.js';

const spec: CommandSpec = {
  usage: 'STUDY [--out DIR] [--format html,pdf,json,csv] [--paper a4|letter] [--threads N] [--quiet]',
  summary: 'quantify a study and write its appendix (appendix.html, appendix.pdf, results.json, cutsets.csv)',
  options: {
    out: { type: 'string', value: 'DIR', help: 'output folder (default: out/<study folder name>)' },
    format: { type: 'string', value: 'LIST', help: 'comma-separated: html, pdf, json, csv (default: all)' },
    paper: { type: 'string', value: 'SIZE', help: 'a4 (default) or letter' },
    threads: { type: 'string', value: 'N', help: 'threads for the Monte Carlo trials (default: the processor cores, at most 8); the numbers never depend on it' },
    quiet: { type: 'boolean', help: 'no progress or summary; errors and warnings only' },
  },
  positionals: ['STUDY'],
};

export function parseFormats(text: string | undefined): Set<OutputFormat> {
  if (text === undefined) return new Set(OUTPUT_FORMATS);
  const asked = text.split(',').map((s) => s.trim().toLowerCase()).filter(Boolean);
  const bad = asked.filter((f) => !(OUTPUT_FORMATS as readonly string[]).includes(f));
  if (bad.length || asked.length === 0) {
    throw new StudyError(`unknown format${bad.length > 1 ? 's' : ''} '${bad.join(', ') || text}'`, undefined, `a comma-separated list of ${OUTPUT_FORMATS.join(', ')}`);
  }
  return new Set(asked as OutputFormat[]);
}

/** Threads for the Monte Carlo: the cores the system offers, at most 8, unless asked. */
export function parseThreads(text: string | undefined): number {
  if (text === undefined) return Math.max(1, Math.min(8, availableParallelism()));
  const n = Number(text);
  if (!Number.isInteger(n) || n < 1 || n > 64) throw new StudyError(`--threads must be a whole number from 1 to 64, got '${text}'`, undefined, '--threads 2 (or leave it out to use the processor cores)');
  return n;
}

export function parsePaper(text: string | undefined): 'a4' | 'letter' {
  if (text === undefined || text.toLowerCase() === 'a4') return 'a4';
  if (text.toLowerCase() === 'letter') return 'letter';
  throw new StudyError(`unknown paper size '${text}'`, undefined, 'a4 or letter');
}

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('run', spec, argv);
  if (args.help) {
    io.stdout(helpText('run', spec));
    return EXIT.ok;
  }
  const studyDir = args.positionals[0]!;
  const formats = parseFormats(args.values.format as string | undefined);
  const paper = parsePaper(args.values.paper as string | undefined);
  const quiet = Boolean(args.values.quiet);
  const threads = parseThreads(args.values.threads as string | undefined);
  const outDir = resolve((args.values.out as string | undefined) ?? `out/${basename(resolve(studyDir))}`);

  const study = readStudy(studyDir);
  printWarnings(study.warnings, io);
  // Progress on stderr for long Monte Carlo runs, only on a terminal and without --quiet.
  const progress = createProgress({ isTTY: io.isTTY, quiet, write: (t) => io.stderr(t), now: () => performance.now() });
  let results;
  try {
    results = analyze(study, { progress: progress.update, threads });
  } finally {
    progress.finish();
  }
  // Warnings the analysis adds (e.g. top probabilities that are bounds, not exact) reach the terminal too.
  const seen = new Set(study.warnings.map((w) => `${w.code}\u0000${w.message}`));
  printWarnings(results.warnings.filter((w) => !seen.has(`${w.code}\u0000${w.message}`)), io);

  const made = await renderOutputs(results, study.files, { paper, formats });
  const files: OutputFile[] = [...made].map(([name, data]) => ({ name, data }));
  refuseOutputsThatAreInputs('run', files.map((f) => join(outDir, f.name)), study.files.map((f) => confine(study.root, f.path)));
  const written = writeOutputs(outDir, files);
  if (!quiet) {
    for (const top of results.tops) {
      const basis = top.probability.basis === 'bound' ? 'upper bound, not exact' : 'exact';
      io.stdout(`${top.id}: ${formatProbability(top.probability.exact)} (${basis}; rare-event ${formatProbability(top.probability.rare_event)}, MCUB ${formatProbability(top.probability.mcub)})\n`);
    }
    for (const w of written) io.stdout(`wrote ${w}\n`);
  }
  return EXIT.ok;
};

export const runCommand: Command = run;
