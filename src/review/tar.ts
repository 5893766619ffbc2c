/**
 * A small, strict ustar (POSIX.1-1988 tar) writer and reader for study archives.
 *
 * Why not a tar package: the format is tiny (a 512-byte header per file, data padded to 512 bytes,
 * two zero blocks at the end), and an archive meant to be checked in twenty years needs two things
 * general-purpose packages do not promise: strictly deterministic output (fixed mtime, uid/gid 0,
 * no user names, sorted entries, nothing taken from the machine) and a reader that refuses
 * everything an archive of ours never contains — links, device files, extended headers, absolute
 * paths, `..` — instead of trying to make sense of it.
 *
 * Pure: bytes in, bytes out. No file system here; unpacking to disk is in unpack.ts.
 */

const BLOCK = 512;

/**
 * Thrown for anything that is not a well-formed, safe archive of ours: truncated, corrupt, hostile
 * or over a limit. verify reports it as a failed verification (exit 3).
 */
export class ArchiveFormatError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ArchiveFormatError';
  }
}

export interface TarFile {
  /** Relative path with `/` separators. */
  path: string;
  data: Buffer;
}

export interface TarOptions {
  /** Modification time written for every entry, seconds since 1970-01-01 UTC. */
  mtime: number;
}

/**
 * The tar bytes of `files`: regular files only, mode 0644, uid/gid 0, empty user and group names,
 * the given mtime, entries sorted by path (byte order), so the same files always give the same bytes.
 */
export function writeTar(files: TarFile[], options: TarOptions): Buffer {
  const sorted = [...files].sort((a, b) => Buffer.compare(Buffer.from(a.path, 'utf8'), Buffer.from(b.path, 'utf8')));
  const seen = new Set<string>();
  const chunks: Buffer[] = [];
  for (const f of sorted) {
    checkPath(f.path, false);
    if (seen.has(f.path)) throw new ArchiveFormatError(`duplicate archive entry '${f.path}'`);
    seen.add(f.path);
    chunks.push(header({ path: f.path, size: f.data.length, mtime: options.mtime, type: '0', mode: 0o644 }));
    chunks.push(f.data);
    const pad = (BLOCK - (f.data.length % BLOCK)) % BLOCK;
    if (pad) chunks.push(Buffer.alloc(pad));
  }
  chunks.push(Buffer.alloc(2 * BLOCK));
  return Buffer.concat(chunks);
}

/** One raw header block. Exported for tests that must build archives we would never write (links, `..`). */
export function header(h: { path: string; size: number; mtime: number; type: string; mode: number; linkTarget?: string }): Buffer {
  const b = Buffer.alloc(BLOCK);
  const { name, prefix } = splitName(h.path);
  b.write(name, 0, 100, 'utf8');
  octal(b, 100, 8, h.mode);
  octal(b, 108, 8, 0);
  octal(b, 116, 8, 0);
  octal(b, 124, 12, h.size);
  octal(b, 136, 12, h.mtime);
  b.write(h.type, 156, 1, 'latin1');
  if (h.linkTarget) b.write(h.linkTarget, 157, 100, 'utf8');
  b.write('ustar\u0000', 257, 6, 'latin1');
  b.write('00', 263, 2, 'latin1');
  octal(b, 329, 8, 0);
  octal(b, 337, 8, 0);
  b.write(prefix, 345, 155, 'utf8');
  // The checksum is the byte sum of the header with its own field read as eight spaces.
  b.fill(0x20, 148, 156);
  const sum = checksum(b);
  b.write(sum.toString(8).padStart(6, '0') + '\u0000 ', 148, 8, 'latin1');
  return b;
}

/** ustar keeps names of up to 100 bytes, or a prefix of up to 155 bytes, a `/`, and the rest. */
function splitName(path: string): { name: string; prefix: string } {
  const bytes = Buffer.byteLength(path, 'utf8');
  if (bytes <= 100) return { name: path, prefix: '' };
  const parts = path.split('/');
  for (let i = 1; i < parts.length; i++) {
    const prefix = parts.slice(0, i).join('/');
    const name = parts.slice(i).join('/');
    if (Buffer.byteLength(prefix, 'utf8') <= 155 && Buffer.byteLength(name, 'utf8') <= 100) return { name, prefix };
  }
  throw new ArchiveFormatError(`path too long for a ustar archive: '${path}'`);
}

function octal(b: Buffer, offset: number, length: number, value: number): void {
  const digits = length - 1;
  const text = Math.trunc(value).toString(8);
  if (text.length > digits || value < 0) throw new ArchiveFormatError(`value ${value} does not fit a ${length}-byte tar field`);
  b.write(text.padStart(digits, '0') + '\u0000', offset, length, 'latin1');
}

function checksum(block: Buffer): number {
  let sum = 0;
  for (let i = 0; i < BLOCK; i++) sum += block[i]!;
  return sum;
}

export interface TarReadLimits {
  /** Most entries accepted. */
  maxEntries: number;
  /** Most bytes of file data accepted in total. */
  maxBytes: number;
}

const DEFAULT_LIMITS: TarReadLimits = { maxEntries: 10_000, maxBytes: 512 * 1024 * 1024 };

/**
 * The regular files of a tar archive, refusing anything unsafe or unexpected: links (hard or
 * symbolic), devices, FIFOs, absolute paths, `..` components, backslashes, duplicate paths, a file
 * that is also a folder of another entry, bad checksums, truncation.
 *
 * What the standard tar tool adds when someone unpacks an archive and packs it again is read, not
 * refused: a leading `./` on every name, directory entries (skipped: folders come from the file
 * paths), GNU long-name entries and pax headers that carry a long path (other pax keys are
 * ignored, a pax `size` or `linkpath` is refused, as are global pax headers).
 */
export function readTar(tar: Buffer, limits: TarReadLimits = DEFAULT_LIMITS): TarFile[] {
  const files: TarFile[] = [];
  const seen = new Set<string>();
  const folders = new Set<string>();
  let total = 0;
  let offset = 0;
  /** A path given by a GNU long-name entry or a pax header, for the header that follows. */
  let longPath: string | undefined;
  /** Whether the last header was an extended one (GNU long name, pax), which must be followed by an entry. */
  let extended = false;
  for (;;) {
    if (offset + BLOCK > tar.length) throw new ArchiveFormatError('the tar data ends without its end-of-archive blocks (truncated?)');
    const block = tar.subarray(offset, offset + BLOCK);
    if (isZero(block)) break;
    const magic = block.toString('latin1', 257, 263);
    if (magic !== 'ustar\u0000' && magic !== 'ustar ') throw new ArchiveFormatError(`entry at byte ${offset} is not a ustar header`);
    const stored = parseOctal(block, 148, 8, 'checksum');
    const copy = Buffer.from(block);
    copy.fill(0x20, 148, 156);
    if (checksum(copy) !== stored) throw new ArchiveFormatError(`header checksum mismatch at byte ${offset}`);
    const name = cString(block, 0, 100);
    const prefix = magic === 'ustar\u0000' ? cString(block, 345, 155) : '';
    const rawPath = longPath ?? (prefix ? `${prefix}/${name}` : name);
    longPath = undefined;
    extended = false;
    const size = parseOctal(block, 124, 12, 'size');
    const type = String.fromCharCode(block[156]!);
    offset += BLOCK;
    const dataEnd = offset + size;
    if (dataEnd > tar.length) throw new ArchiveFormatError(`entry '${rawPath}' is truncated`);
    if (size > limits.maxBytes) throw new ArchiveFormatError(`entry '${rawPath}' holds ${size} bytes, more than the limit of ${limits.maxBytes}`);
    const data = tar.subarray(offset, dataEnd);

    if (type === '1' || type === '2') {
      throw new ArchiveFormatError(`entry '${rawPath}' is a ${type === '1' ? 'hard' : 'symbolic'} link to '${cString(block, 157, 100)}'; archives of studies hold regular files only`);
    }
    if (type === 'L') {
      if (size > 4096) throw new ArchiveFormatError(`a long-name entry of ${size} bytes at byte ${offset - BLOCK}: more than a path needs`);
      longPath = cString(data, 0, data.length);
      extended = true;
    } else if (type === 'x') {
      if (size > 65536) throw new ArchiveFormatError(`a pax header of ${size} bytes at byte ${offset - BLOCK}: more than a path needs`);
      longPath = paxPath(data, rawPath);
      extended = true;
    } else if (type === 'g' || type === 'K') {
      throw new ArchiveFormatError(`entry '${rawPath}' is a ${type === 'g' ? 'global pax header' : 'GNU long link name'} (type '${type}'), which study archives never need`);
    } else if (type === '5') {
      const path = normalisePath(rawPath.replace(/\/+$/, ''));
      if (path !== '') {
        checkPath(path, true);
        folders.add(path);
      }
    } else if (type === '0' || type === '\u0000' || type === '7') {
      const path = normalisePath(rawPath);
      checkPath(path, false);
      if (seen.has(path)) throw new ArchiveFormatError(`entry '${path}' appears twice`);
      seen.add(path);
      total += size;
      if (files.length + 1 > limits.maxEntries) throw new ArchiveFormatError(`more than ${limits.maxEntries} entries`);
      if (total > limits.maxBytes) throw new ArchiveFormatError(`more than ${limits.maxBytes} bytes of data`);
      files.push({ path, data: Buffer.from(data) });
    } else {
      throw new ArchiveFormatError(`entry '${rawPath}' has type '${type}' (a device, FIFO or other special file); archives of studies hold regular files only`);
    }
    offset = dataEnd + ((BLOCK - (size % BLOCK)) % BLOCK);
  }
  if (extended) throw new ArchiveFormatError('the archive ends with an extended header that no entry follows (truncated?)');
  refuseFileFolderClashes(files, folders);
  return files;
}

/**
 * The path a standard tar tool meant: without the `./` it puts in front of every name when packing
 * a folder as `.` (and `.` itself, the folder being packed, becomes the empty path).
 */
function normalisePath(path: string): string {
  let p = path;
  while (p.startsWith('./')) p = p.slice(2);
  return p === '.' ? '' : p;
}

/** The `path` of a pax extended header (records `LEN key=value\n`); keys that could change what is read are refused. */
function paxPath(data: Buffer, where: string): string | undefined {
  let path: string | undefined;
  let at = 0;
  while (at < data.length) {
    if (data[at] === 0) break;
    const space = data.indexOf(0x20, at);
    const length = space === -1 ? NaN : Number(data.toString('latin1', at, space));
    if (!Number.isInteger(length) || length <= 0 || at + length > data.length || data[at + length - 1] !== 0x0a) {
      throw new ArchiveFormatError(`pax header '${where}' is malformed at byte ${at} of its records`);
    }
    const record = data.toString('utf8', space + 1, at + length - 1);
    const eq = record.indexOf('=');
    const key = eq === -1 ? record : record.slice(0, eq);
    const value = eq === -1 ? '' : record.slice(eq + 1);
    if (key === 'path') path = value;
    else if (key === 'size' || key === 'linkpath' || key.startsWith('GNU.sparse')) {
      throw new ArchiveFormatError(`pax header '${where}' sets '${key}', which study archives never need`);
    }
    at += length;
  }
  return path;
}

/** `study.yaml` and `study.yaml/x` cannot both be unpacked: a file cannot also be a folder. */
function refuseFileFolderClashes(files: TarFile[], folders: Set<string>): void {
  const filePaths = new Set(files.map((f) => f.path));
  for (const folder of folders) {
    if (filePaths.has(folder)) throw new ArchiveFormatError(`'${folder}' is both a file and a folder in the archive: a malformed archive`);
  }
  for (const f of files) {
    const parts = f.path.split('/');
    for (let i = 1; i < parts.length; i++) {
      const parent = parts.slice(0, i).join('/');
      if (filePaths.has(parent)) throw new ArchiveFormatError(`'${parent}' is both a file and the folder of '${f.path}' in the archive: a malformed archive`);
    }
  }
}

/** A path an archive may hold: relative, `/`-separated, no `..`, `.` or empty components, no backslash or NUL. */
export function checkPath(path: string, directory: boolean): void {
  const what = directory ? 'folder' : 'file';
  if (path === '') throw new ArchiveFormatError(`a ${what} entry has an empty name`);
  if (path.startsWith('/') || /^[A-Za-z]:/.test(path)) throw new ArchiveFormatError(`entry '${path}' has an absolute path`);
  if (path.includes('\\')) throw new ArchiveFormatError(`entry '${path}' contains a backslash`);
  if (path.includes('\u0000')) throw new ArchiveFormatError(`entry '${path}' contains a NUL byte`);
  for (const part of path.split('/')) {
    if (part === '..') throw new ArchiveFormatError(`entry '${path}' climbs out of the archive with '..'`);
    if (part === '.' || part === '') throw new ArchiveFormatError(`entry '${path}' has an empty or '.' path component`);
  }
}

function isZero(block: Buffer): boolean {
  for (let i = 0; i < block.length; i++) if (block[i] !== 0) return false;
  return true;
}

function cString(b: Buffer, offset: number, length: number): string {
  const field = b.subarray(offset, offset + length);
  const end = field.indexOf(0);
  return field.toString('utf8', 0, end === -1 ? length : end);
}

function parseOctal(b: Buffer, offset: number, length: number, what: string): number {
  if (b[offset]! & 0x80) throw new ArchiveFormatError(`${what} field in base-256 form is not accepted`);
  const text = b.toString('latin1', offset, offset + length).replace(/[\u0000 ]+$/, '').replace(/^ +/, '');
  if (!/^[0-7]+$/.test(text)) throw new ArchiveFormatError(`${what} field '${text}' is not an octal number`);
  return parseInt(text, 8);
}
