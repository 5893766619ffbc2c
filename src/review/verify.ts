/**
 * Verifying a study archive: unpack it (safely) into a temporary folder, check every file against
 * the manifest's SHA-256, recompute the study from the archived inputs, and compare every number of
 * the archived results.json with the recomputed one (exact equality) and cutsets.csv byte for byte.
 *
 * A file that is not a faultbook archive throws ArchiveFormatError (the command exits 2); anything
 * that disagrees is a Difference in the report (exit 3).
 */
import { join } from 'node:path';
import { analyze } from '../analysis/analyze.js';
import { toolVersion } from '../package.js';
import { resultsJson } from '../report/results-json.js';
import { cutSetsCsv } from '../report/cutsets-csv.js';
import { StudyError, StudyErrors } from '../study/errors.js';
import { readStudy, sha256 } from '../study/read.js';
import { ARCHIVE_ROOT, INPUTS_DIR, OUTPUTS_DIR } from './archive.js';
import { gunzipChecked } from './gzip.js';
import { diffJson, showValue } from './json-diff.js';
import { lockfileHash, MANIFEST_NAME, parseManifest, type Manifest } from './manifest.js';
import { ArchiveFormatError, readTar, type TarFile } from './tar.js';
import { unpackToTemp } from './unpack.js';

/** Most bytes an archive may unpack to (a real study with its appendix is a few MiB). */
export const MAX_UNPACKED_BYTES = 512 * 1024 * 1024;

export type DifferenceKind =
  | 'changed-input'
  | 'changed-output'
  | 'missing-file'
  | 'unlisted-file'
  | 'recomputed-differs'
  | 'recompute-failed'
  | 'tool-version';

export interface Difference {
  kind: DifferenceKind;
  /** The archive path concerned (without the archive's top folder). */
  file?: string;
  message: string;
  /** Further lines: the first few differing values with their JSON paths. */
  details: string[];
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
}

/** How many differing values of results.json are listed (the count of all is always given). */
export const SHOWN_DIFFERENCES = 5;

export function verifyArchive(bytes: Buffer): VerifyReport {
  const tar = gunzipChecked(bytes, MAX_UNPACKED_BYTES);
  const entries = readTar(tar, { maxEntries: 10_000, maxBytes: MAX_UNPACKED_BYTES });
  const prefix = `${ARCHIVE_ROOT}/`;
  const stray = entries.find((e) => !e.path.startsWith(prefix));
  if (stray) throw new ArchiveFormatError(`entry '${stray.path}' is outside the ${ARCHIVE_ROOT}/ folder: not a faultbook archive`);
  const byPath = new Map<string, TarFile>(entries.map((e) => [e.path.slice(prefix.length), e]));
  const manifestEntry = byPath.get(MANIFEST_NAME);
  if (!manifestEntry) throw new ArchiveFormatError(`no ${MANIFEST_NAME} in the archive: not a faultbook archive`);
  const parsed = parseManifest(manifestEntry.data.toString('utf8'));
  if (!parsed.ok) throw new ArchiveFormatError(parsed.message);
  const manifest = parsed.manifest;

  const differences: Difference[] = [];
  const agreed: string[] = [];
  const notes: string[] = [];
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
    if (path !== MANIFEST_NAME && !listed.has(path)) {
      differences.push({ kind: 'unlisted-file', file: path, message: `${path} is in the archive but not in the manifest`, details: [] });
    }
  }

  if (manifest.tool.node !== process.version) notes.push(`archived with Node ${manifest.tool.node}, verified with Node ${process.version}`);
  const lock = lockfileHash();
  if (manifest.tool.lockfile_sha256 !== lock) notes.push(`the tool's package-lock.json differs from the one the archive was made with (dependency versions may differ)`);

  const numbersCompared = recompute(byPath, entries, manifest, differences, notes);
  return { manifest, agreed, differences, notes, numbersCompared };
}

/** Recompute from the archived inputs; push what disagrees; return how many numbers were compared. */
function recompute(byPath: Map<string, TarFile>, entries: TarFile[], manifest: Manifest, differences: Difference[], notes: string[]): number {
  const sameTool = manifest.tool.version === toolVersion;
  const unpacked = unpackToTemp(entries);
  try {
    let results;
    try {
      results = analyze(readStudy(join(unpacked.dir, ARCHIVE_ROOT, INPUTS_DIR)));
    } catch (err) {
      if (!(err instanceof StudyError || err instanceof StudyErrors)) throw err;
      const lines = err instanceof StudyErrors ? err.errors.map((e) => e.describe()) : [err.describe()];
      differences.push({ kind: 'recompute-failed', file: `${INPUTS_DIR}/`, message: 'the archived study cannot be read, so nothing can be recomputed', details: lines.slice(0, SHOWN_DIFFERENCES) });
      return 0;
    }
    const recomputedJson = resultsJson(results);
    let compared = 0;
    const archivedResults = byPath.get(`${OUTPUTS_DIR}/results.json`);
    if (!archivedResults) {
      differences.push({ kind: 'missing-file', file: `${OUTPUTS_DIR}/results.json`, message: `${OUTPUTS_DIR}/results.json is not in the archive: nothing to compare the recomputation with`, details: [] });
    } else {
      let archived: unknown;
      try {
        archived = JSON.parse(archivedResults.data.toString('utf8'));
      } catch {
        archived = undefined;
      }
      if (archived === undefined) {
        differences.push({ kind: 'changed-output', file: `${OUTPUTS_DIR}/results.json`, message: `${OUTPUTS_DIR}/results.json is not valid JSON`, details: [] });
      } else {
        const recomputed: unknown = JSON.parse(recomputedJson);
        compared = countNumbers(recomputed);
        const diff = diffJson(archived, recomputed, { ignore: ['$.tool.version'], limit: SHOWN_DIFFERENCES });
        if (diff.count > 0) {
          const verb = diff.count === 1 ? 'differs' : 'differ';
          const what = diff.numeric === diff.count ? `${diff.count} number${diff.count === 1 ? '' : 's'}` : `${diff.count} value${diff.count === 1 ? '' : 's'} (${diff.numeric} of them numbers)`;
          differences.push({
            kind: sameTool ? 'recomputed-differs' : 'tool-version',
            file: `${OUTPUTS_DIR}/results.json`,
            message: sameTool
              ? `${OUTPUTS_DIR}/results.json: recomputing from the archived inputs gives different results: ${what} ${verb}`
              : `${OUTPUTS_DIR}/results.json: faultbook ${toolVersion} gives different numbers from faultbook ${manifest.tool.version}, which made the archive: ${what} ${verb}`,
            details: diff.differences.map((d) => `${d.path}: archived ${showValue(d.expected)}, recomputed ${showValue(d.actual)}`),
          });
        }
      }
    }
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
    if (manifest.outputs.appendix) notes.push('appendix.html and appendix.pdf are checked by their hashes; they are not re-rendered');
    return compared;
  } finally {
    unpacked.dispose();
  }
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
    if (a[i] !== b[i]) return [`line ${i + 1}: archived ${showValue(a[i])}`, `line ${i + 1}: recomputed ${showValue(b[i])}`];
  }
  return [];
}
