/**
 * `faultbook archive STUDY [--out FILE] [--sign KEY.pem --signer NAME]`: one reproducible .tar.gz of
 * the study's inputs, outputs and manifest, optionally signed (Ed25519) by whoever issues it.
 */
import { basename, dirname, resolve } from 'node:path';
import { buildArchive } from '../review/archive.js';
import { checkSignerName, readSigningKey } from '../review/sign.js';
import { StudyError } from '../study/errors.js';
import { confine, readStudy } from '../study/read.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command } from './io.js';
import { refuseOutputsThatAreInputs } from './no-clobber.js';
import { writeOutputs } from './outputs.js';
import { printWarnings } from './print.js';
import { parsePaper } from './run.js';

const spec: CommandSpec = {
  usage: 'STUDY [--out FILE] [--paper a4|letter] [--sign KEY.pem --signer NAME] [--quiet]',
  summary: 'bundle a study, its outputs and a manifest of hashes into one .tar.gz that verify can recompute',
  options: {
    out: { type: 'string', value: 'FILE', help: 'archive file (default: out/<study folder name>-rev-<revision>.tar.gz)' },
    paper: { type: 'string', value: 'SIZE', help: 'paper of the archived appendix: a4 (default) or letter' },
    sign: { type: 'string', value: 'KEY.pem', help: 'sign the manifest with this Ed25519 private key (openssl genpkey -algorithm ed25519)' },
    signer: { type: 'string', value: 'NAME', help: 'who signs, recorded in the signed manifest (required with --sign)' },
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
  const keyPath = args.values.sign as string | undefined;
  const signerName = args.values.signer as string | undefined;
  if (keyPath === undefined && signerName !== undefined) throw new StudyError('--signer is given without --sign', undefined, 'faultbook archive STUDY --sign KEY.pem --signer NAME');
  if (keyPath !== undefined && signerName === undefined) {
    throw new StudyError('--sign needs --signer: the signed manifest records who signed', undefined, 'faultbook archive STUDY --sign KEY.pem --signer "Dam Safety Office, J. Doe"');
  }
  // The key is read before the (long) analysis, so a wrong key path fails at once.
  const sign = keyPath !== undefined ? { key: readSigningKey(keyPath), name: checkSignerName(signerName!) } : undefined;
  const study = readStudy(studyDir);
  printWarnings(study.warnings, io);
  const safeRevision = study.meta.revision.replace(/[^A-Za-z0-9._-]/g, '_');
  const out = resolve((args.values.out as string | undefined) ?? `out/${basename(resolve(studyDir))}-rev-${safeRevision}.tar.gz`);
  refuseOutputsThatAreInputs('archive', [out], [...study.files.map((f) => confine(study.root, f.path)), ...(keyPath !== undefined ? [keyPath] : [])]);
  const built = await buildArchive(study, { paper, ...(sign ? { sign } : {}) });
  const [written] = writeOutputs(dirname(out), [{ name: basename(out), data: built.bytes }]);
  if (!args.values.quiet) {
    const inputs = built.manifest.files.filter((f) => f.role === 'input').length;
    const outputs = built.manifest.files.filter((f) => f.role === 'output').map((f) => basename(f.path));
    io.stdout(`archived ${inputs} input file${inputs === 1 ? '' : 's'} and ${outputs.join(', ')} with manifest.json (faultbook ${built.manifest.tool.version}, Node ${built.manifest.tool.node})\n`);
    if (sign) io.stdout(`signed by "${sign.name}" with Ed25519 key SHA-256 ${sign.key.fingerprint}\n`);
    io.stdout(`wrote ${written}\n`);
  }
  return EXIT.ok;
};

export const archiveCommand: Command = run;
