/**
 * Reading a study folder from disk: the only place in study/ that touches the file system. Files are
 * read once, hashed (for the manifest) and handed on as text; data paths are confined to the folder.
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, realpathSync, statSync } from 'node:fs';
import { isAbsolute, join, relative, resolve, sep } from 'node:path';
import { parseAssumptions } from './assumptions.js';
import { buildStudy } from './build.js';
import { StudyError, StudyErrors } from './errors.js';
import { runFit } from './fits.js';
import { checkStructure, type StudyFileKind } from './schema.js';
import type { InputFile, Pos, Study } from './types.js';
import { parseYamlFile, type YamlFile } from './yaml.js';

/** A study file larger than this is refused before it is read (a real study is kilobytes). */
export const MAX_FILE_BYTES = 8 * 1024 * 1024;
/** assumptions.md larger than this would not make an appendix in bounded time (about 20,000 words). */
export const MAX_MARKDOWN_BYTES = 128 * 1024;

const YAML_FILES: { name: string; kind: StudyFileKind }[] = [
  { name: 'study.yaml', kind: 'study' },
  { name: 'logic.yaml', kind: 'logic' },
  { name: 'events.yaml', kind: 'events' },
  { name: 'sources.yaml', kind: 'sources' },
];

export function sha256(data: string | Buffer): string {
  return createHash('sha256').update(data).digest('hex');
}

export function readStudy(folder: string): Study {
  const root = resolve(folder);
  if (!existsSync(root) || !statSync(root).isDirectory()) {
    throw new StudyError(`study folder not found: ${folder}`, undefined, 'the path of a folder that holds study.yaml');
  }
  if (!existsSync(join(root, 'study.yaml'))) {
    throw new StudyError(`no study.yaml in ${folder}`, undefined, "a study folder with study.yaml at its top (run 'faultbook new DIR' for a starter)");
  }
  const files: InputFile[] = [];
  const readText = (rel: string, at?: Pos): string => {
    const full = confine(root, rel, at);
    const size = statSync(full).size;
    if (size > MAX_FILE_BYTES) {
      throw new StudyError(`${rel} is ${(size / 1048576).toFixed(1)} MiB, larger than a study file may be`, at ?? { file: rel, line: 1, col: 1 }, `a file under ${MAX_FILE_BYTES / 1048576} MiB`);
    }
    const buf = readFileSync(full);
    const text = decodeUtf8(buf, rel);
    if (text.includes('\u0000')) throw new StudyError(`${rel} is not a text file`, at ?? { file: rel, line: 1, col: 1 }, 'UTF-8 text');
    if (!files.some((f) => f.path === rel)) files.push({ path: rel, sha256: sha256(buf), text });
    return text;
  };

  const readMarkdown = (rel: string): string => {
    const text = readText(rel);
    const bytes = Buffer.byteLength(text, 'utf8');
    if (bytes > MAX_MARKDOWN_BYTES) {
      throw new StudyError(`${rel} is ${(bytes / 1024).toFixed(0)} KiB, more Markdown than an appendix can hold`, { file: rel, line: 1, col: 1 }, `at most ${MAX_MARKDOWN_BYTES / 1024} KiB of Markdown (keep long material in a referenced document)`);
    }
    return text;
  };

  const yamlFiles: YamlFile[] = [];
  const structureErrors: StudyError[] = [];
  for (const { name, kind } of YAML_FILES) {
    if (!existsSync(join(root, name))) continue;
    const file = parseYamlFile(name, readText(name));
    if (file.data === null || typeof file.data !== 'object' || Array.isArray(file.data)) {
      throw new StudyError(`${name} must be a mapping of sections`, file.at([]), kind === 'study' ? "'format: faultbook/1', 'title: …', 'as_of: …' and so on" : 'section names with their entries, e.g. "gates:"');
    }
    structureErrors.push(...checkStructure(kind, file));
    yamlFiles.push(file);
  }
  if (structureErrors.length) throw structureErrors.length === 1 ? structureErrors[0]! : new StudyErrors(structureErrors);

  const assumptions = existsSync(join(root, 'assumptions.md')) ? parseAssumptions(readMarkdown('assumptions.md'), 'assumptions.md') : [];
  const study = buildStudy({
    root,
    yamlFiles,
    assumptions,
    files,
    runFit: (fit, asOf) => void runFit(fit, readText, asOf),
  });
  // The manifest lists files in a fixed order, whatever order they were read in.
  study.files.sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
  return study;
}

const strictUtf8 = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });

/**
 * A study file as text. Bytes that are not UTF-8 (a file saved as Latin-1, say) are an input error
 * at the first such byte, not silently replaced by U+FFFD: a changed title or id would pass unseen.
 */
export function decodeUtf8(buf: Buffer, rel: string): string {
  try {
    return strictUtf8.decode(buf);
  } catch {
    const bad = firstInvalidUtf8(buf);
    const lineStart = buf.lastIndexOf(0x0a, bad - 1) + 1;
    let line = 1;
    for (let i = buf.indexOf(0x0a); i >= 0 && i < bad; i = buf.indexOf(0x0a, i + 1)) line++;
    const col = buf.subarray(lineStart, bad).toString('utf8').length + 1;
    const byte = buf[bad]!.toString(16).toUpperCase().padStart(2, '0');
    throw new StudyError(`${rel} is not valid UTF-8 (byte 0x${byte})`, { file: rel, line, col }, 'UTF-8 text: save the file as UTF-8');
  }
}

/** Offset of the first byte that does not begin or continue a valid UTF-8 sequence (RFC 3629). */
function firstInvalidUtf8(buf: Buffer): number {
  let i = 0;
  while (i < buf.length) {
    const b = buf[i]!;
    const need = b < 0x80 ? 0 : b >= 0xc2 && b <= 0xdf ? 1 : b >= 0xe0 && b <= 0xef ? 2 : b >= 0xf0 && b <= 0xf4 ? 3 : -1;
    if (need < 0) return i;
    if (i + need >= buf.length && need > 0) return i;
    // The second byte's range narrows for E0, ED, F0 and F4 (no overlongs, surrogates or > U+10FFFF).
    const lo = b === 0xe0 ? 0xa0 : b === 0xf0 ? 0x90 : 0x80;
    const hi = b === 0xed ? 0x9f : b === 0xf4 ? 0x8f : 0xbf;
    for (let k = 1; k <= need; k++) {
      const c = buf[i + k]!;
      if (k === 1 ? c < lo || c > hi : c < 0x80 || c > 0xbf) return i;
    }
    i += need + 1;
  }
  return buf.length;
}

/**
 * A path a study names must stay inside the study folder: no absolute paths, no `..` out of it,
 * no symbolic link that leads out.
 */
export function confine(root: string, rel: string, at?: Pos): string {
  const where = at ?? { file: rel, line: 1, col: 1 };
  if (isAbsolute(rel) || /^[A-Za-z]:[\\/]/.test(rel)) {
    throw new StudyError(`'${rel}' is an absolute path`, where, "a path inside the study folder, e.g. 'data/motor-life.csv'");
  }
  const full = resolve(root, rel);
  const inside = (p: string, base: string) => {
    const r = relative(base, p);
    // Outside means a '..' segment, not a name that merely starts with two dots ('..notes.csv').
    return r !== '' && !isAbsolute(r) && !r.split(sep).includes('..');
  };
  if (!inside(full, root)) throw new StudyError(`'${rel}' points outside the study folder`, where, "a path inside the study folder, e.g. 'data/motor-life.csv'");
  if (!existsSync(full)) throw new StudyError(`file not found: ${rel}`, where, 'a file that exists inside the study folder');
  if (!inside(realpathSync(full), realpathSync(root))) throw new StudyError(`'${rel}' leads outside the study folder through a link`, where, 'a real file inside the study folder');
  if (!statSync(full).isFile()) throw new StudyError(`'${rel}' is not a file`, where, 'a file inside the study folder');
  return full;
}
