/**
 * A study archive: one .tar.gz holding the study inputs, the outputs of a run, and manifest.json.
 *
 *   faultbook-archive/manifest.json
 *   faultbook-archive/manifest.sig            (only when signed: Ed25519 over manifest.json, see sign.ts)
 *   faultbook-archive/outputs/results.json, cutsets.csv, appendix.html, appendix.pdf
 *   faultbook-archive/study/<every file the study reader read>
 *
 * The inputs are the files the reader actually read (`study.files`), so a stray file or a nested
 * folder in the study folder is not archived, and verify can recompute from exactly what is there.
 * Archives of the same study made by the same installation are byte-identical: every byte comes
 * from the study, the tool and its settings, none from the clock or the machine's users.
 */
import { readFileSync } from 'node:fs';
import { analyze } from '../analysis/analyze.js';
import type { Results } from '../analysis/results.js';
import { parseDate } from '../reliability/units.js';
import { StudyError } from '../study/errors.js';
import { confine, sha256 } from '../study/read.js';
import type { InputFile, Study } from '../study/types.js';
import { gzipDeterministic } from './gzip.js';
import { buildManifest, manifestJson, MANIFEST_NAME, type FileRole, type Manifest } from './manifest.js';
import { OUTPUT_FORMATS, renderOutputs } from '../report/outputs.js';
import { signatureFile, signerRecord, SIGNATURE_NAME, type SigningKey } from './sign.js';
import { writeTar } from './tar.js';

export const ARCHIVE_ROOT = 'faultbook-archive';
export const INPUTS_DIR = 'study';
export const OUTPUTS_DIR = 'outputs';

export interface ArchiveOptions {
  paper?: 'a4' | 'letter';
  /** Include appendix.html and appendix.pdf (default: when the report stage is installed). */
  appendix?: boolean;
  /** Sign the manifest with this key; `name` is recorded in the signed manifest as the signer. */
  sign?: { key: SigningKey; name: string };
}

export interface BuiltArchive {
  bytes: Buffer;
  manifest: Manifest;
  results: Results;
}

export async function buildArchive(study: Study, options: ArchiveOptions = {}): Promise<BuiltArchive> {
  const paper = options.paper ?? 'a4';
  const appendix = options.appendix ?? (await reportAvailable());
  const results = analyze(study);
  const outputs = { files: await renderOutputs(results, study.files, { paper, formats: new Set(appendix ? OUTPUT_FORMATS : (['json', 'csv'] as const)) }) };
  const files: { path: string; role: FileRole; data: Buffer }[] = [];
  for (const f of study.files) files.push({ path: `${INPUTS_DIR}/${f.path}`, role: 'input', data: inputBytes(study, f) });
  for (const [name, data] of outputs.files) files.push({ path: `${OUTPUTS_DIR}/${name}`, role: 'output', data });
  const signer = options.sign ? signerRecord(options.sign.name, options.sign.key) : undefined;
  const manifest = buildManifest({ results, files, paper, appendix, ...(signer ? { signer } : {}) });
  const manifestBytes = Buffer.from(manifestJson(manifest), 'utf8');
  const signature = options.sign ? [{ path: SIGNATURE_NAME, data: signatureFile(manifestBytes, options.sign.key) }] : [];
  const entries = [...files, { path: MANIFEST_NAME, data: manifestBytes }, ...signature].map((f) => ({
    path: `${ARCHIVE_ROOT}/${f.path}`,
    data: f.data,
  }));
  const tar = writeTar(entries, { mtime: studyEpochSeconds(manifest.date) });
  return { bytes: gzipDeterministic(tar), manifest, results };
}

/**
 * The bytes of an input exactly as they are on disk (the reader keeps decoded text, which need not
 * round-trip), checked against the hash the reader took so the archive holds what was analysed.
 */
function inputBytes(study: Study, file: InputFile): Buffer {
  const data = readFileSync(confine(study.root, file.path));
  if (sha256(data) !== file.sha256) {
    throw new StudyError(`${file.path} changed while the archive was being made`, undefined, 'a study folder that nothing else is writing to');
  }
  return data;
}

/** Seconds since 1970-01-01 UTC at the start of the study's date (a year or month alone means its first day). */
export function studyEpochSeconds(date: string): number {
  const d = parseDate(date);
  if (!d.ok) return 0;
  return d.value.dayNumber * 86400;
}

/** Whether the report stage (src/report/index.ts) is installed; only a missing module counts as "no". */
export async function reportAvailable(): Promise<boolean> {
  try {
    await import('../report/index.js');
    return true;
  } catch (err) {
    if (err instanceof Error && (err as NodeJS.ErrnoException).code === 'ERR_MODULE_NOT_FOUND' && err.message.includes('report')) return false;
    throw err;
  }
}
