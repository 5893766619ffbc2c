/** `faultbook check STUDY`: read and validate a study, print its warnings, write nothing. */
import { commands } from './commands.js';
import { analysisInputWarnings } from '../analysis/input-warnings.js';
import { EventProbabilityError } from '../analysis/event-probability.js';
import { readStudy } from '../study/read.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command } from './io.js';
import { printWarnings, WARNING_FLOOD } from './print.js';

const spec: CommandSpec = {
  usage: 'STUDY [--all] [--quiet]',
  summary: commands.check!.summary,
  options: {
    quiet: { type: 'boolean', help: 'print errors only' },
    all: { type: 'boolean', help: `list every warning (without it, more than ${WARNING_FLOOD} of one kind print as one line)` },
  },
  positionals: ['STUDY'],
};

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('check', spec, argv);
  if (args.help) {
    io.stdout(helpText('check', spec));
    return EXIT.ok;
  }
  const study = readStudy(args.positionals[0]!);
  // The warnings `run` adds once the numbers are known (capped probabilities, unlike common-cause
  // members, unsampled uncertainties): check shows every warning run shows.
  let more;
  try {
    more = analysisInputWarnings(study);
  } catch (err) {
    if (err instanceof EventProbabilityError) throw err.toStudyError();
    throw err;
  }
  const seen = new Set(study.warnings.map((w) => `${w.code}\u0000${w.message}`));
  const warnings = [...study.warnings, ...more.filter((w) => !seen.has(`${w.code}\u0000${w.message}`))];
  if (!args.values.quiet) {
    printWarnings(warnings, io, { all: Boolean(args.values.all) });
    io.stdout(
      `ok: ${study.tops.length} top event${study.tops.length === 1 ? '' : 's'}, ${study.gates.length} gates, ${study.events.length} basic events, ` +
        `${study.parameters.length} parameters, ${study.sources.length} sources, ${study.assumptions.length} assumptions` +
        (warnings.length ? `; ${warnings.length} warning${warnings.length === 1 ? '' : 's'}` : '') +
        '\n',
    );
  }
  return EXIT.ok;
};

export const checkCommand: Command = run;
