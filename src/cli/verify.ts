/**
 * `faultbook verify FILE`: check an archive's hashes and recompute it from its own inputs.
 * Exit 0 when everything agrees, 3 with the list of differences, 2 when FILE is not an archive.
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import { StudyError } from '../study/errors.js';
import { ArchiveFormatError } from '../review/tar.js';
import { verifyArchive, type VerifyReport } from '../review/verify.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command, type Io } from './io.js';

const spec: CommandSpec = {
  usage: 'FILE',
  summary: 'check an archive made by faultbook archive: every hash, then recompute every number from the archived inputs',
  options: {},
  positionals: ['FILE'],
};

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('verify', spec, argv);
  if (args.help) {
    io.stdout(helpText('verify', spec));
    return EXIT.ok;
  }
  const file = args.positionals[0]!;
  if (!existsSync(file) || !statSync(file).isFile()) throw new StudyError(`archive not found: ${file}`, undefined, 'the path of a .tar.gz made by faultbook archive');
  let report: VerifyReport;
  try {
    report = verifyArchive(readFileSync(file));
  } catch (err) {
    if (err instanceof ArchiveFormatError) throw new StudyError(`${file} is not a faultbook archive: ${err.message}`, undefined, 'a .tar.gz made by faultbook archive');
    throw err;
  }
  printReport(file, report, io);
  return report.differences.length === 0 ? EXIT.ok : EXIT.verifyMismatch;
};

function printReport(file: string, r: VerifyReport, io: Io): void {
  const m = r.manifest;
  const out = (line: string) => io.stdout(`${line}\n`);
  out(`verify ${file}`);
  out(`  study: ${m.study.title}, revision ${m.study.revision} (${m.study.status}), as of ${m.study.as_of}`);
  out(`  made with faultbook ${m.tool.version} on Node ${m.tool.node}; ${m.files.length} files in the manifest`);
  for (const n of r.notes) out(`  note: ${n}`);
  if (r.differences.length === 0) {
    out(`ok: all ${r.agreed.length} hashes agree, and all ${r.numbersCompared} numbers of results.json are recomputed exactly from the archived inputs`);
    return;
  }
  out(`${r.differences.length} difference${r.differences.length === 1 ? '' : 's'}:`);
  for (const d of r.differences) {
    out(`  - [${d.kind}] ${d.message}`);
    for (const line of d.details) out(`      ${line}`);
  }
  out(`hashes that agree: ${r.agreed.length} of ${m.files.length}`);
}

export const verifyCommand = { summary: 'check an archive and recompute its numbers (exit 3 on any difference)', run };
