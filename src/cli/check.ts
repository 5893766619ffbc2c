/** `faultbook check STUDY`: read and validate a study, print its warnings, write nothing. */
import { readStudy } from '../study/read.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command } from './io.js';
import { printWarnings } from './print.js';

const spec: CommandSpec = {
  usage: 'STUDY',
  summary: 'validate a study folder and list its warnings; writes nothing',
  options: { quiet: { type: 'boolean', help: 'print errors only' } },
  positionals: ['STUDY'],
};

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('check', spec, argv);
  if (args.help) {
    io.stdout(helpText('check', spec));
    return EXIT.ok;
  }
  const study = readStudy(args.positionals[0]!);
  if (!args.values.quiet) {
    printWarnings(study.warnings, io);
    io.stdout(
      `ok: ${study.tops.length} top event${study.tops.length === 1 ? '' : 's'}, ${study.gates.length} gates, ${study.events.length} basic events, ` +
        `${study.parameters.length} parameters, ${study.sources.length} sources, ${study.assumptions.length} assumptions` +
        (study.warnings.length ? `; ${study.warnings.length} warning${study.warnings.length === 1 ? '' : 's'}` : '') +
        '\n',
    );
  }
  return EXIT.ok;
};

export const checkCommand = { summary: spec.summary, run };
