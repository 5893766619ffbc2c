/** `faultbook fit DATA.csv`: Weibull fit of life records, printed as a table or as JSON. */
import { existsSync, readFileSync, statSync } from 'node:fs';
import { basename } from 'node:path';
import { FitError, fitWeibull, formatFit } from '../reliability/fit/index.js';
import { unitInYears } from '../reliability/units.js';
import { StudyError } from '../study/errors.js';
import { fitData, parseLifeData } from '../study/life-data.js';
import { MAX_FILE_BYTES } from '../study/read.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command } from './io.js';

const spec: CommandSpec = {
  usage: 'DATA.csv [--method mle|rank] [--location] [--confidence P] [--life-unit UNIT] [--group G] [--json]',
  summary: 'fit a Weibull distribution to life records (columns life,status — failed or suspended)',
  options: {
    method: { type: 'string', value: 'M', help: 'mle (maximum likelihood, default) or rank (median-rank regression)' },
    location: { type: 'boolean', help: 'also fit a failure-free time (three-parameter Weibull)' },
    confidence: { type: 'string', value: 'P', help: 'one-sided level of each bound, 0.5–0.999 (default 0.9)' },
    'life-unit': { type: 'string', value: 'UNIT', help: 'unit of bare life numbers, e.g. years or h (needed when neither the lives nor the header give one)' },
    group: { type: 'string', value: 'G', help: "fit only the rows of this group (the 'group' column)" },
    json: { type: 'boolean', help: 'print the fit as JSON' },
  },
  positionals: ['DATA.csv'],
};

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('fit', spec, argv);
  if (args.help) {
    io.stdout(helpText('fit', spec));
    return EXIT.ok;
  }
  const file = args.positionals[0]!;
  const method = (args.values.method as string | undefined) ?? 'mle';
  if (method !== 'mle' && method !== 'rank') throw new StudyError(`unknown method '${method}'`, undefined, 'mle or rank');
  const confidenceText = args.values.confidence as string | undefined;
  const confidence = confidenceText === undefined ? 0.9 : Number(confidenceText);
  if (!(confidence >= 0.5 && confidence < 1)) throw new StudyError(`confidence '${confidenceText}' is not a level between 0.5 and 1`, undefined, 'e.g. --confidence 0.9 or 0.95');
  const unit = args.values['life-unit'] as string | undefined;
  if (unit !== undefined && unitInYears(unit) === undefined) throw new StudyError(`unknown life unit '${unit}'`, undefined, 'years, months, weeks, days or h');
  if (!existsSync(file) || !statSync(file).isFile()) throw new StudyError(`file not found: ${file}`, undefined, 'the path of a CSV file of life records');
  if (statSync(file).size > MAX_FILE_BYTES) throw new StudyError(`${file} is larger than a life-record file may be`, undefined, `a file under ${MAX_FILE_BYTES / 1048576} MiB`);
  const records = parseLifeData(readFileSync(file, 'utf8'), basename(file), { ...(unit ? { lifeUnit: unit } : {}), unitOption: '`--life-unit h` (or years, days…)' });
  const data = fitData(records, args.values.group as string | undefined);
  let fit;
  try {
    fit = fitWeibull(data, { method, threeParameter: Boolean(args.values.location), confidence });
  } catch (err) {
    if (err instanceof FitError) throw new StudyError(`${basename(file)}: ${err.message}`, undefined, err.hint ?? 'life records with enough failures to fit');
    throw err;
  }
  io.stdout(args.values.json ? JSON.stringify(fit, null, 2) + '\n' : formatFit(fit, 'years'));
  return EXIT.ok;
};

export const fitCommand: Command = run;
