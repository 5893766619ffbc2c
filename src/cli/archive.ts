/** `faultbook archive STUDY [--out FILE]`: one reproducible .tar.gz of the study's inputs, outputs and manifest. */
import { basename, dirname, resolve } from 'node:path';
import { buildArchive } from '../review/archive.js';
import { readStudy } from '../study/read.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command } from './io.js';
import { writeOutputs } from './outputs.js';
import { printWarnings } from './print.js';
import { parsePaper } from './run.js';

const spec: CommandSpec = {
  usage: 'STUDY [--out FILE] [--paper a4|letter] [--quiet]',
  summary: 'bundle a study, its outputs and a manifest of hashes into one .tar.gz that verify can recompute',
  options: {
    out: { type: 'string', value: 'FILE', help: 'archive file (default: out/<study folder name>-rev-<revision>.tar.gz)' },
    paper: { type: 'string', value: 'SIZE', help: 'paper of the archived appendix: a4 (default) or letter' },
    quiet: { type: 'boolean', help: 'no summary; errors and warnings only' },
  },
  positionals: ['STUDY'],
};

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('archive', spec, argv);
  if (args.help) {
    io.stdout(helpText('archive', spec));
    return EXIT.ok;
  }
  const studyDir = args.positionals[0]!;
  const paper = parsePaper(args.values.paper as string | undefined);
  const study = readStudy(studyDir);
  printWarnings(study.warnings, io);
  const built = await buildArchive(study, { paper });
  const safeRevision = study.meta.revision.replace(/[^A-Za-z0-9._-]/g, '_');
  const out = resolve((args.values.out as string | undefined) ?? `out/${basename(resolve(studyDir))}-rev-${safeRevision}.tar.gz`);
  const [written] = writeOutputs(dirname(out), [{ name: basename(out), data: built.bytes }]);
  if (!args.values.quiet) {
    const inputs = built.manifest.files.filter((f) => f.role === 'input').length;
    const outputs = built.manifest.files.filter((f) => f.role === 'output').map((f) => basename(f.path));
    io.stdout(`archived ${inputs} input file${inputs === 1 ? '' : 's'} and ${outputs.join(', ')} with manifest.json (faultbook ${built.manifest.tool.version}, Node ${built.manifest.tool.node})\n`);
    io.stdout(`wrote ${written}\n`);
  }
  return EXIT.ok;
};

export const archiveCommand = { summary: 'bundle a study with its outputs and a manifest into one .tar.gz', run };
