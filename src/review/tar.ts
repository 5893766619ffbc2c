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

/** Thrown for anything that is not a well-formed, safe archive of ours (the command exits 2). */
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
 * symbolic), devices, FIFOs, extended (pax) and GNU long-name headers, absolute paths, `..` or `.`
 * components, backslashes, duplicate paths, bad checksums, truncation. Directory entries are
 * accepted and skipped (folders are made from the file paths).
 */
export function readTar(tar: Buffer, limits: TarReadLimits = DEFAULT_LIMITS): TarFile[] {
  const files: TarFile[] = [];
  const seen = new Set<string>();
  let total = 0;
  let offset = 0;
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
    const path = prefix ? `${prefix}/${name}` : name;
    const size = parseOctal(block, 124, 12, 'size');
    const type = String.fromCharCode(block[156]!);
    offset += BLOCK;
    const dataEnd = offset + size;
    if (dataEnd > tar.length) throw new ArchiveFormatError(`entry '${path}' is truncated`);

    if (type === '1' || type === '2') {
      throw new ArchiveFormatError(`entry '${path}' is a ${type === '1' ? 'hard' : 'symbolic'} link to '${cString(block, 157, 100)}'; archives of studies hold regular files only`);
    }
    if (type === 'x' || type === 'g' || type === 'L' || type === 'K') {
      throw new ArchiveFormatError(`entry '${path}' is an extended header (type '${type}'), which faultbook archives never contain`);
    }
    if (type === '5') {
      checkPath(path.replace(/\/$/, ''), true);
    } else if (type === '0' || type === '\u0000' || type === '7') {
      checkPath(path, false);
      if (seen.has(path)) throw new ArchiveFormatError(`entry '${path}' appears twice`);
      seen.add(path);
      total += size;
      if (files.length + 1 > limits.maxEntries) throw new ArchiveFormatError(`more than ${limits.maxEntries} entries`);
      if (total > limits.maxBytes) throw new ArchiveFormatError(`more than ${limits.maxBytes} bytes of data`);
      files.push({ path, data: Buffer.from(tar.subarray(offset, dataEnd)) });
    } else {
      throw new ArchiveFormatError(`entry '${path}' has type '${type}' (a device, FIFO or other special file); archives of studies hold regular files only`);
    }
    offset = dataEnd + ((BLOCK - (size % BLOCK)) % BLOCK);
  }
  return files;
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
