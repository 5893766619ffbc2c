/**
 * Verifying a study archive:
 *
 * 1. unpack it in memory within limits (entries, bytes) and refuse anything unsafe or malformed;
 * 2. check the signature over manifest.json (and, given trusted keys, who signed it);
 * 3. check every file against the manifest's SHA-256;
 * 4. read the archived study (from a temporary folder that is removed as soon as it is read, on any
 *    error and on SIGINT/SIGTERM), recompute it, and compare byte for byte: results.json,
 *    cutsets.csv, and the re-rendered appendix.html and appendix.pdf.
 *
 * When the archive was made by another faultbook version (or with other dependency or Node
 * versions), outputs that no longer re-render identically are named with the reason and do not fail
 * the check; every number of results.json must still agree.
 *
 * A file that cannot be read as a faultbook archive (not gzip, truncated, corrupt, hostile, over a
 * limit) throws ArchiveFormatError: a failed verification. Everything else that disagrees is a
 * Difference in the report. Either way the command exits 3.
 */
import { join } from 'node:path';
import { analyze } from '../analysis/analyze.js';
import type { Results } from '../analysis/results.js';
import { toolVersion } from '../package.js';
import { renderOutputs } from '../report/outputs.js';
import { resultsJson } from '../report/results-json.js';
import { cutSetsCsv } from '../report/cutsets-csv.js';
import { StudyError, StudyErrors } from '../study/errors.js';
import { readStudy, sha256 } from '../study/read.js';
import type { Study } from '../study/types.js';
import { ARCHIVE_ROOT, INPUTS_DIR, OUTPUTS_DIR, reportAvailable } from './archive.js';
import { firstDuplicateKey } from './duplicate-keys.js';
import { gunzipChecked } from './gzip.js';
import { diffJson, showValue } from './json-diff.js';
import { lockfileHash, MANIFEST_NAME, parseManifest, type Manifest } from './manifest.js';
import { checkSignature, SIGNATURE_NAME, type SignatureCheck, type TrustedKey } from './sign.js';
import { ArchiveFormatError, readTar, type TarFile } from './tar.js';
import { releaseSignalHandlers, unpackToTemp } from './unpack.js';

/** What verify accepts before it refuses to go on; each can be raised by an option of the command. */
export interface VerifyLimits {
  /** Most bytes the gzip stream may expand to (the whole tar, so also all unpacked files together). */
  maxUnpackedBytes: number;
  /** Most Monte Carlo samples the archived settings may ask verify to draw. */
  maxSamples: number;
  /** Most entries the archive may hold. */
  maxEntries: number;
}

/** A real study with its appendix is a few MiB; the default run draws 20,000 samples. */
export const DEFAULT_VERIFY_LIMITS: VerifyLimits = { maxUnpackedBytes: 256 * 1024 * 1024, maxSamples: 1_000_000, maxEntries: 10_000 };

export type DifferenceKind =
  | 'changed-input'
  | 'changed-output'
  | 'missing-file'
  | 'unlisted-file'
  | 'recomputed-differs'
  | 'recompute-failed'
  | 'rerender-differs'
  | 'tool-version'
  | 'signature'
  | 'over-limit';

export interface Difference {
  kind: DifferenceKind;
  /** The archive path concerned (without the archive's top folder). */
  file?: string;
  message: string;
  /** Further lines: the first few differing values with their JSON paths. */
  details: string[];
}

export interface VerifyOptions {
  /** Public keys the signer must be among; none given means the origin is not checked. */
  trust?: TrustedKey[];
  limits?: Partial<VerifyLimits>;
}

export interface VerifyReport {
  manifest: Manifest;
  /** Files whose hash was checked and agreed. */
  agreed: string[];
  differences: Difference[];
  /** Facts worth knowing that are not differences (another Node version, …). */
  notes: string[];
  /** How many numbers of results.json were compared. */
  numbersCompared: number;
  /** The signature check, and whether trusted keys were given. */
  origin: { check: SignatureCheck; trustGiven: boolean };
  /** Outputs re-rendered from the archived inputs and found byte-identical to the archived ones. */
  rerendered: string[];
}

/** How many differing values of results.json are listed (the count of all is always given). */
export const SHOWN_DIFFERENCES = 5;

export async function verifyArchive(bytes: Buffer, options: VerifyOptions = {}): Promise<VerifyReport> {
  const limits = { ...DEFAULT_VERIFY_LIMITS, ...options.limits };
  const trust = options.trust ?? [];
  const tar = gunzipChecked(bytes, limits.maxUnpackedBytes);
  const entries = readTar(tar, { maxEntries: limits.maxEntries, maxBytes: limits.maxUnpackedBytes });
  const prefix = `${ARCHIVE_ROOT}/`;
  const stray = entries.find((e) => !e.path.startsWith(prefix));
  if (stray) throw new ArchiveFormatError(`entry '${stray.path}' is outside the ${ARCHIVE_ROOT}/ folder: not a faultbook archive`);
  const archived = entries.map((e) => ({ path: e.path.slice(prefix.length), data: e.data }));
  const byPath = new Map<string, TarFile>(archived.map((e) => [e.path, e]));
  const manifestEntry = byPath.get(MANIFEST_NAME);
  if (!manifestEntry) throw new ArchiveFormatError(`no ${MANIFEST_NAME} in the archive: not a faultbook archive`);
  const parsed = parseManifest(manifestEntry.data.toString('utf8'));
  if (!parsed.ok) throw new ArchiveFormatError(parsed.message);
  const manifest = parsed.manifest;

  const differences: Difference[] = [];
  const agreed: string[] = [];
  const notes: string[] = [];

  const check = checkSignature(manifestEntry.data, manifest.signer, byPath.get(SIGNATURE_NAME)?.data, trust);
  originDifferences(check, trust, differences);

  const listed = new Set<string>();
  for (const f of manifest.files) {
    listed.add(f.path);
    const entry = byPath.get(f.path);
    if (!entry) {
      differences.push({ kind: 'missing-file', file: f.path, message: `${f.path} is listed in the manifest but missing from the archive`, details: [] });
      continue;
    }
    const actual = sha256(entry.data);
    if (actual !== f.sha256) {
      differences.push({
        kind: f.role === 'input' ? 'changed-input' : 'changed-output',
        file: f.path,
        message: `${f.path}: SHA-256 differs from the manifest (${f.role === 'input' ? 'a changed input' : 'a changed output'})`,
        details: [`manifest ${f.sha256}`, `archive  ${actual}`],
      });
    } else agreed.push(f.path);
  }
  for (const path of byPath.keys()) {
    if (path !== MANIFEST_NAME && path !== SIGNATURE_NAME && !listed.has(path)) {
      differences.push({ kind: 'unlisted-file', file: path, message: `${path} is in the archive but not in the manifest`, details: [] });
    }
  }

  if (manifest.tool.node !== process.version) notes.push(`archived with Node ${manifest.tool.node}, verified with Node ${process.version}`);
  const lock = lockfileHash();
  if (manifest.tool.lockfile_sha256 !== lock) notes.push(`the tool's package-lock.json differs from the one the archive was made with (dependency versions may differ)`);

  let study: Study | undefined;
  try {
    study = readArchivedStudy(archived, differences);
  } finally {
    // A signal that came while the study was unpacked and read is handled now; the long work
    // below runs with the default handlers, so Ctrl-C stops it at once (nothing is left on disk).
    await releaseSignalHandlers();
  }
  let numbersCompared = 0;
  const rerendered: string[] = [];
  if (study) {
    const samples = study.settings.samples;
    if (samples > limits.maxSamples) {
      differences.push({
        kind: 'over-limit',
        file: `${INPUTS_DIR}/study.yaml`,
        message: `the archived settings ask for ${samples} Monte Carlo samples, more than verify's limit of ${limits.maxSamples}: nothing was recomputed`,
        details: [`to recompute anyway, raise the limit (faultbook verify --max-samples ${samples})`],
      });
    } else {
      numbersCompared = await recompute(study, byPath, manifest, differences, notes, rerendered);
    }
  }
  return { manifest, agreed, differences, notes, numbersCompared, origin: { check, trustGiven: trust.length > 0 }, rerendered };
}

function originDifferences(check: SignatureCheck, trust: TrustedKey[], differences: Difference[]): void {
  const push = (message: string, details: string[] = []) => differences.push({ kind: 'signature', file: MANIFEST_NAME, message, details });
  if (check.status === 'invalid') push(check.reason, check.signer ? [`signer recorded: ${check.signer.name}, key SHA-256 ${check.signer.key_sha256}`] : []);
  else if (trust.length > 0 && check.status === 'unsigned') push(`the archive is not signed, and trusted keys were given: its origin cannot be confirmed`);
  else if (trust.length > 0 && check.status === 'valid' && !check.trustedBy) {
    push(`signed by "${check.signer.name}" with key SHA-256 ${check.signer.key_sha256}, which is not among the ${trust.length} trusted key${trust.length === 1 ? '' : 's'}`, trust.map((t) => `trusted: ${t.fingerprint} (${t.path})`));
  }
}

/**
 * The archived study, read from a temporary folder that is gone before this returns (the study keeps
 * every input's text, which is all the recomputation and the re-rendering need).
 */
function readArchivedStudy(archived: TarFile[], differences: Difference[]): Study | undefined {
  const inputs = archived.filter((e) => e.path.startsWith(`${INPUTS_DIR}/`));
  const unpacked = unpackToTemp(inputs.map((e) => ({ path: `${ARCHIVE_ROOT}/${e.path}`, data: e.data })));
  try {
    return readStudy(join(unpacked.dir, ARCHIVE_ROOT, INPUTS_DIR));
  } catch (err) {
    if (!(err instanceof StudyError || err instanceof StudyErrors)) throw err;
    const lines = err instanceof StudyErrors ? err.errors.map((e) => e.describe()) : [err.describe()];
    differences.push({ kind: 'recompute-failed', file: `${INPUTS_DIR}/`, message: 'the archived study cannot be read, so nothing can be recomputed', details: lines.slice(0, SHOWN_DIFFERENCES) });
    return undefined;
  } finally {
    unpacked.dispose();
  }
}

/** Recompute from the archived inputs and re-render; push what disagrees; return how many numbers were compared. */
async function recompute(study: Study, byPath: Map<string, TarFile>, manifest: Manifest, differences: Difference[], notes: string[], rerendered: string[]): Promise<number> {
  const sameTool = manifest.tool.version === toolVersion;
  let results: Results;
  try {
    results = analyze(study);
  } catch (err) {
    if (!(err instanceof StudyError || err instanceof StudyErrors)) throw err;
    const lines = err instanceof StudyErrors ? err.errors.map((e) => e.describe()) : [err.describe()];
    differences.push({ kind: 'recompute-failed', file: `${INPUTS_DIR}/`, message: 'the archived study cannot be recomputed', details: lines.slice(0, SHOWN_DIFFERENCES) });
    return 0;
  }
  const compared = compareResults(resultsJson(results), byPath.get(`${OUTPUTS_DIR}/results.json`), manifest, sameTool, differences);

  const archivedCsv = byPath.get(`${OUTPUTS_DIR}/cutsets.csv`);
  if (archivedCsv) {
    const csv = cutSetsCsv(results);
    const text = archivedCsv.data.toString('utf8');
    if (text !== csv) {
      differences.push({
        kind: sameTool ? 'recomputed-differs' : 'tool-version',
        file: `${OUTPUTS_DIR}/cutsets.csv`,
        message: `${OUTPUTS_DIR}/cutsets.csv: the recomputed cut sets differ`,
        details: firstLineDifference(text, csv),
      });
    }
  }
  if (!sameTool && !differences.some((d) => d.kind === 'tool-version')) {
    notes.push(`archived with faultbook ${manifest.tool.version}, recomputed with faultbook ${toolVersion}: the same numbers`);
  }
  if (manifest.outputs.appendix) await rerender(study, results, byPath, manifest, differences, notes, rerendered);
  return compared;
}

/**
 * results.json compared as bytes: the same tool writes the same bytes, and a byte comparison
 * cannot be fooled by what a parser forgives (a duplicate key, whose last value wins). Across tool
 * versions the bytes differ (the version is in them), so the numbers are compared instead, after
 * refusing duplicate keys.
 */
function compareResults(recomputedJson: string, archivedEntry: TarFile | undefined, manifest: Manifest, sameTool: boolean, differences: Difference[]): number {
  const file = `${OUTPUTS_DIR}/results.json`;
  if (!archivedEntry) {
    differences.push({ kind: 'missing-file', file, message: `${file} is not in the archive: nothing to compare the recomputation with`, details: [] });
    return 0;
  }
  const text = archivedEntry.data.toString('utf8');
  const recomputed: unknown = JSON.parse(recomputedJson);
  const compared = countNumbers(recomputed);
  let archived: unknown;
  try {
    archived = JSON.parse(text);
  } catch {
    differences.push({ kind: 'changed-output', file, message: `${file} is not valid JSON`, details: [] });
    return compared;
  }
  const duplicate = firstDuplicateKey(text);
  if (duplicate) {
    const line = text.slice(0, duplicate.offset).split('\n').length;
    differences.push({ kind: 'changed-output', file, message: `${file} has the key "${duplicate.key}" twice in one object (line ${line}); faultbook never writes that`, details: [] });
  }
  if (sameTool && text === recomputedJson) return compared;
  const diff = diffJson(archived, recomputed, { ignore: ['$.tool.version'], limit: SHOWN_DIFFERENCES });
  if (diff.count > 0) {
    const what = diff.numeric === diff.count ? `${diff.count} number${diff.count === 1 ? '' : 's'}` : `${diff.count} value${diff.count === 1 ? '' : 's'} (${diff.numeric} of them numbers)`;
    const verb = diff.count === 1 ? 'differs' : 'differ';
    differences.push({
      kind: sameTool ? 'recomputed-differs' : 'tool-version',
      file,
      message: sameTool
        ? `${file}: recomputing from the archived inputs gives different results: ${what} ${verb}`
        : `${file}: faultbook ${toolVersion} gives different numbers from faultbook ${manifest.tool.version}, which made the archive: ${what} ${verb}`,
      details: diff.differences.map((d) => `${d.path}: archived ${showValue(d.expected)}, recomputed ${showValue(d.actual)}`),
    });
  } else if (sameTool && !duplicate) {
    differences.push({
      kind: 'recomputed-differs',
      file,
      message: `${file}: the bytes differ from the recomputed ones although every value parses the same (its layout was changed)`,
      details: firstLineDifference(text, recomputedJson),
    });
  }
  return compared;
}

/**
 * appendix.html and appendix.pdf made again from the archived inputs and compared byte for byte.
 * Made by this very installation (same faultbook, dependencies and Node), any difference is a
 * failure; otherwise the outputs that differ are named with the reason, as notes.
 */
async function rerender(study: Study, results: Results, byPath: Map<string, TarFile>, manifest: Manifest, differences: Difference[], notes: string[], rerendered: string[]): Promise<void> {
  const names = ['appendix.html', 'appendix.pdf'].filter((n) => byPath.has(`${OUTPUTS_DIR}/${n}`));
  if (names.length === 0) return;
  if (!(await reportAvailable())) {
    notes.push(`${names.join(' and ')} could not be re-rendered: this installation has no report stage; they are checked by their hashes only`);
    return;
  }
  const made = await renderOutputs(results, study.files, { paper: manifest.outputs.paper, formats: new Set(['html', 'pdf'] as const) });
  const why: string[] = [];
  if (manifest.tool.version !== toolVersion) why.push(`it was made by faultbook ${manifest.tool.version}, this is faultbook ${toolVersion}`);
  if (manifest.tool.lockfile_sha256 !== lockfileHash()) why.push('it was made with other dependency versions (package-lock.json differs)');
  if (manifest.tool.node !== process.version) why.push(`it was made with Node ${manifest.tool.node}, this is Node ${process.version}`);
  for (const name of names) {
    const file = `${OUTPUTS_DIR}/${name}`;
    const archived = byPath.get(file)!.data;
    const again = made.get(name);
    if (again && archived.equals(again)) {
      rerendered.push(file);
      continue;
    }
    const details = again ? byteDifference(archived, again, name.endsWith('.html')) : [];
    if (why.length === 0) {
      differences.push({ kind: 'rerender-differs', file, message: `${file}: re-rendering from the archived inputs gives different bytes`, details });
    } else {
      notes.push(`${file} could not be re-rendered identically because ${why.join('; ')}; it is checked by its hash only`);
    }
  }
}

function byteDifference(archived: Buffer, again: Buffer, text: boolean): string[] {
  if (text) return firstLineDifference(archived.toString('utf8'), again.toString('utf8'));
  let i = 0;
  while (i < archived.length && i < again.length && archived[i] === again[i]) i++;
  return [`archived ${archived.length} bytes, re-rendered ${again.length} bytes; first difference at byte ${i}`];
}

function countNumbers(x: unknown): number {
  if (typeof x === 'number') return 1;
  if (Array.isArray(x)) return x.reduce((n: number, v) => n + countNumbers(v), 0);
  if (x && typeof x === 'object') return Object.values(x).reduce((n: number, v) => n + countNumbers(v), 0);
  return 0;
}

function firstLineDifference(archived: string, recomputed: string): string[] {
  const a = archived.split('\n');
  const b = recomputed.split('\n');
  for (let i = 0; i < Math.max(a.length, b.length); i++) {
    if (a[i] !== b[i]) return [`line ${i + 1}: archived ${showValue(clip(a[i]))}`, `line ${i + 1}: recomputed ${showValue(clip(b[i]))}`];
  }
  return [];
}

/** A line shown in a report is cut short: an appendix line can be very long. */
function clip(line: string | undefined): string | undefined {
  return line !== undefined && line.length > 160 ? `${line.slice(0, 160)}…` : line;
}
