/**
 * `faultbook verify FILE [--trust PUB.pem|DIR]…`: check an archive's signature and hashes, recompute
 * it from its own inputs and re-render its appendix.
 *
 * Exit 0 when everything agrees; 3 when verification fails: a difference, a signature that does not
 * hold (or none, or an untrusted one, when --trust is given), a file that cannot be read as an
 * archive (not gzip, truncated, corrupt, unsafe paths or links), or a limit exceeded; 2 for a wrong
 * call: FILE missing, a bad option, a trust key that cannot be read.
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import { readTrustedKeys } from '../review/sign.js';
import { StudyError } from '../study/errors.js';
import { ArchiveFormatError } from '../review/tar.js';
import { DEFAULT_VERIFY_LIMITS, verifyArchive, type VerifyLimits, type VerifyReport } from '../review/verify.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command, type Io } from './io.js';

const MIB = 1024 * 1024;

const spec: CommandSpec = {
  usage: 'FILE [--trust PUB.pem|DIR]… [--max-samples N] [--max-unpacked-mib N]',
  summary: 'check an archive made by faultbook archive: its signature, every hash, then recompute every number and re-render the appendix from the archived inputs',
  options: {
    trust: { type: 'string', value: 'PUB.pem|DIR', multiple: true, help: 'require a signature by one of these Ed25519 public keys (a PEM file or a folder of them; repeatable)' },
    'max-samples': { type: 'string', value: 'N', help: `most Monte Carlo samples the archive may ask for (default ${DEFAULT_VERIFY_LIMITS.maxSamples})` },
    'max-unpacked-mib': { type: 'string', value: 'N', help: `most MiB the archive may unpack to (default ${DEFAULT_VERIFY_LIMITS.maxUnpackedBytes / MIB})` },
  },
  positionals: ['FILE'],
};

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('verify', spec, argv);
  if (args.help) {
    io.stdout(helpText('verify', spec));
    return EXIT.ok;
  }
  const file = args.positionals[0]!;
  const limits: Partial<VerifyLimits> = {};
  const samples = positiveInteger(args.values['max-samples'], '--max-samples');
  if (samples !== undefined) limits.maxSamples = samples;
  const mib = positiveInteger(args.values['max-unpacked-mib'], '--max-unpacked-mib');
  if (mib !== undefined) limits.maxUnpackedBytes = mib * MIB;
  const trust = readTrustedKeys((args.values.trust as string[] | undefined) ?? []);
  if (!existsSync(file) || !statSync(file).isFile()) throw new StudyError(`archive not found: ${file}`, undefined, 'the path of a .tar.gz made by faultbook archive');
  let report: VerifyReport;
  try {
    report = await verifyArchive(readFileSync(file), { trust, limits });
  } catch (err) {
    if (!(err instanceof ArchiveFormatError)) throw err;
    io.stdout(`verify ${file}\n`);
    io.stdout(`failed: it cannot be read as a faultbook archive: ${err.message}\n`);
    if (/limit/.test(err.message)) io.stdout(`  (if the archive is trusted to be that large, raise the limit: --max-unpacked-mib N)\n`);
    return EXIT.verifyMismatch;
  }
  printReport(file, report, io);
  return report.differences.length === 0 ? EXIT.ok : EXIT.verifyMismatch;
};

function positiveInteger(value: unknown, flag: string): number | undefined {
  if (value === undefined) return undefined;
  const text = String(value);
  const n = Number(text);
  if (!/^\d+$/.test(text) || !Number.isSafeInteger(n) || n < 1) throw new StudyError(`${flag} ${text} is not a positive whole number`, undefined, `${flag} 2000000`);
  return n;
}

function origin(r: VerifyReport): string {
  const c = r.origin.check;
  if (c.status === 'valid') {
    const who = `signed by "${c.signer.name}" with Ed25519 key SHA-256 ${c.signer.key_sha256}`;
    if (c.trustedBy) return `${who}: a trusted key (${c.trustedBy.path})`;
    return r.origin.trustGiven ? `${who}: NOT a trusted key` : `${who}; origin not checked: no --trust key was given, and anyone can sign`;
  }
  if (c.status === 'unsigned') return r.origin.trustGiven ? 'not signed: origin cannot be confirmed' : 'not signed; origin not checked';
  return `the signature does not hold`;
}

function printReport(file: string, r: VerifyReport, io: Io): void {
  const m = r.manifest;
  const out = (line: string) => io.stdout(`${line}\n`);
  out(`verify ${file}`);
  out(`  study: ${m.study.title}, revision ${m.study.revision} (${m.study.status}), as of ${m.study.as_of}`);
  out(`  made with faultbook ${m.tool.version} on Node ${m.tool.node}; ${m.files.length} files in the manifest`);
  out(`  origin: ${origin(r)}`);
  if (r.rerendered.length) out(`  re-rendered byte-identical from the archived inputs: ${r.rerendered.join(', ')}`);
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

export const verifyCommand: Command = run;
