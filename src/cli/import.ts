/**
 * `faultbook import FILE.xml --out DIR`: a new study folder from an Open-PSA MEF document
 * (src/exchange/mef-read.ts says what is read and what stops the import). The folder is made in
 * memory, checked by reading it back as a study, and only then written.
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync, realpathSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, dirname, join, relative, resolve } from 'node:path';
import { StudyError, StudyErrors } from '../study/errors.js';
import { readStudy, sha256, MAX_FILE_BYTES } from '../study/read.js';
import { readMef } from '../exchange/mef-read.js';
import { studyFiles } from '../exchange/study-write.js';
import { decodeXml, parseXml } from '../exchange/xml-read.js';
import { parseDate } from '../reliability/units.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command } from './io.js';
import { writeOutputs } from './outputs.js';

const spec: CommandSpec = {
  usage: 'FILE.xml --out DIR [--as-of DATE] [--force]',
  summary: 'make a study folder from an Open-PSA MEF document',
  options: {
    out: { type: 'string', value: 'DIR', help: 'the study folder to make (new or empty)' },
    'as-of': { type: 'string', value: 'DATE', help: 'snapshot date, when the document states none' },
    force: { type: 'boolean', help: 'write into DIR even if it is not empty' },
  },
  positionals: ['FILE.xml'],
};

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('import', spec, argv);
  if (args.help) {
    io.stdout(helpText('import', spec));
    return EXIT.ok;
  }
  const input = args.positionals[0]!;
  const out = args.values.out as string | undefined;
  if (!out) throw new StudyError('faultbook import needs --out DIR', undefined, 'faultbook import FILE.xml --out DIR');
  if (!existsSync(input) || !statSync(input).isFile()) throw new StudyError(`${input} is not a file`, undefined, 'the path of an MEF document (.xml)');
  if (statSync(input).size > MAX_FILE_BYTES) throw new StudyError(`${input} is larger than ${MAX_FILE_BYTES} bytes`, undefined, 'an MEF document of a size a study can hold');
  const dir = resolve(out);
  const inputPath = realpathSync(input);
  if (existsSync(dir) && (realpathSync(dir) === inputPath || realpathSync(dir) === dirname(inputPath) && !args.values.force)) {
    throw new StudyError(`--out ${out} is the input or the folder that holds it`, undefined, 'a new folder for the study');
  }
  if (existsSync(dir) && !statSync(dir).isDirectory()) throw new StudyError(`--out ${out} exists and is not a folder`, undefined, 'a new or empty folder');
  if (existsSync(dir) && readdirSync(dir).length > 0 && !args.values.force) {
    throw new StudyError(`${out} exists and is not empty`, undefined, 'a new or empty folder, or --force to write the study files into it');
  }
  const STUDY_FILES = ['study.yaml', 'logic.yaml', 'events.yaml', 'sources.yaml', 'assumptions.md'];
  if (existsSync(dir) && realpathSync(dir) === dirname(inputPath) && STUDY_FILES.includes(basename(inputPath))) {
    throw new StudyError(`--out ${out} would overwrite the input ${input}`, undefined, 'a new folder for the study');
  }
  const asOf = args.values['as-of'] as string | undefined;
  if (asOf !== undefined && !parseDate(asOf).ok) throw new StudyError(`--as-of ${asOf} is not a date`, undefined, 'an ISO date such as 2026-06-30');

  const bytes = readFileSync(input);
  const file = basename(input);
  const model = readMef(parseXml(file, decodeXml(bytes)));
  if (!model.meta['as-of'] && !asOf) {
    throw new StudyError(`${file} states no snapshot date`, undefined, '--as-of DATE (e.g. --as-of 2026-06-30): every study is a snapshot at a date');
  }
  const files = studyFiles(model, { fileName: file, sha256: sha256(bytes), ...(asOf ? { asOf } : {}) });
  checkReadable(files);
  const written = writeOutputs(dir, [...files].map(([name, data]) => ({ name, data })));
  io.stdout(`made a study of ${model.tops.length} top${model.tops.length === 1 ? '' : 's'}, ${model.gates.length} gates, ${model.events.length} events, ${model.groups.length} common-cause group${model.groups.length === 1 ? '' : 's'}\n`);
  if (model.unusedParameters.length) {
    io.stdout(`${model.unusedParameters.length} parameter${model.unusedParameters.length === 1 ? '' : 's'} of the file that nothing uses: listed in assumptions.md A3\n`);
  }
  for (const w of written) {
    const shown = relative(process.cwd(), w);
    io.stdout(`wrote ${shown && !shown.startsWith('..') ? shown : w}\n`);
  }
  return EXIT.ok;
};

/**
 * Reads the made folder back as a study before anything is written where the user asked, so a
 * model faultbook would refuse never leaves a half-made folder behind.
 */
function checkReadable(files: Map<string, string>): void {
  const scratch = mkdtempSync(join(tmpdir(), 'faultbook-import-'));
  try {
    for (const [name, text] of files) writeFileSync(join(scratch, name), text);
    try {
      readStudy(scratch);
    } catch (err) {
      // The reader's rules that the MEF reader does not repeat (a value's domain, say): the
      // document is what gave it, so it is an input error, described in the study's terms.
      if (err instanceof StudyError || err instanceof StudyErrors) {
        const first = err instanceof StudyErrors ? err.errors[0]! : err;
        throw new StudyError(`the model in the document is not a valid study: ${first.message}`, undefined, first.hint ?? 'a model within what faultbook represents');
      }
      throw err;
    }
  } finally {
    rmSync(scratch, { recursive: true, force: true });
  }
}

export const importCommand: Command = run;
