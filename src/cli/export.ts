/**
 * `faultbook export STUDY --out FILE.xml`: the study's logic and data as an Open-PSA MEF document
 * (src/exchange/mef-write.ts says what maps to what). Prints every event written as its value at
 * as_of, and what the document does not carry.
 */
import { existsSync, realpathSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { StudyError } from '../study/errors.js';
import { readStudy } from '../study/read.js';
import { studyToMef } from '../exchange/mef-write.js';
import { writeXml } from '../exchange/xml-write.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command } from './io.js';
import { writeOutputs } from './outputs.js';
import { printWarnings } from './print.js';

const spec: CommandSpec = {
  usage: 'STUDY --out FILE.xml [--force]',
  summary: 'write the study as an Open-PSA MEF document (the open model-exchange standard)',
  options: {
    out: { type: 'string', value: 'FILE.xml', help: 'the MEF document to write' },
    force: { type: 'boolean', help: 'replace FILE.xml if it exists' },
  },
  positionals: ['STUDY'],
};

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('export', spec, argv);
  if (args.help) {
    io.stdout(helpText('export', spec));
    return EXIT.ok;
  }
  const out = args.values.out as string | undefined;
  if (!out) throw new StudyError('faultbook export needs --out FILE.xml', undefined, 'faultbook export STUDY --out FILE.xml');
  const study = readStudy(args.positionals[0]!);
  const target = resolve(out);
  const inputs = new Set(study.files.map((f) => realOrSelf(join(study.root, f.path))));
  if (inputs.has(realOrSelf(target)) || realOrSelf(target) === realOrSelf(study.root)) {
    throw new StudyError(`--out ${out} is one of the study's own files`, undefined, 'a path outside the study\'s inputs, e.g. out/model.xml');
  }
  if (existsSync(target) && !args.values.force) {
    throw new StudyError(`${out} exists`, undefined, 'a new file name, or --force to replace it');
  }
  printWarnings(study.warnings, io);
  const result = studyToMef(study);
  const [written] = writeOutputs(dirname(target), [{ name: basename(target), data: writeXml(result.root) }]);
  if (result.valuesAtAsOf.length) {
    io.stdout(`written as their value at as_of (the standard has no expression for these models; attributes name model and parameters):\n`);
    for (const line of result.valuesAtAsOf) io.stdout(`  ${line}\n`);
  }
  for (const line of result.notes) io.stdout(`note: ${line}\n`);
  if (result.notCarried.length) {
    io.stdout('not carried by the document:\n');
    for (const line of result.notCarried) io.stdout(`  ${line}\n`);
  }
  io.stdout(`wrote ${written}\n`);
  return EXIT.ok;
};

function realOrSelf(path: string): string {
  try {
    return realpathSync(path);
  } catch {
    return resolve(path);
  }
}

export const exportCommand: Command = run;
