import { execFileSync } from 'node:child_process';
import { mkdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { crc32 as zlibCrc32, gunzipSync } from 'node:zlib';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { crc32, gunzipChecked, gzipDeterministic } from '../../src/review/gzip.js';
import { ArchiveFormatError, header, readTar, writeTar } from '../../src/review/tar.js';
import { tempDir } from '../temp.js';


const files = [
  { path: 'top/b.txt', data: Buffer.from('second\n') },
  { path: 'top/a.txt', data: Buffer.from('first file, 513 bytes: '.padEnd(513, 'x')) },
  { path: `top/${'long-folder-name/'.repeat(6)}deep.csv`, data: Buffer.from('a,b\n1,2\n') },
  { path: 'top/empty', data: Buffer.alloc(0) },
];
const MTIME = Date.UTC(2026, 10, 20) / 1000;

/** pax records `LEN key=value\n` (POSIX.1-2001 pax format; LEN counts the whole record, its own digits included). */
function paxRecords(records: Record<string, string>): Buffer {
  let out = '';
  for (const [k, v] of Object.entries(records)) {
    const body = ` ${k}=${v}\n`;
    let len = Buffer.byteLength(body) + 1;
    while (String(len).length + Buffer.byteLength(body) !== len) len = String(len).length + Buffer.byteLength(body);
    out += `${len}${body}`;
  }
  return Buffer.from(out, 'utf8');
}

/** Raw tar bytes from header blocks and data, for archives our writer refuses to make. */
function rawTar(entries: { path: string; type: string; data?: Buffer; link?: string }[]): Buffer {
  const parts: Buffer[] = [];
  for (const e of entries) {
    const data = e.data ?? Buffer.alloc(0);
    parts.push(header({ path: e.path, size: data.length, mtime: MTIME, type: e.type, mode: 0o644, ...(e.link ? { linkTarget: e.link } : {}) }));
    parts.push(data, Buffer.alloc((512 - (data.length % 512)) % 512));
  }
  parts.push(Buffer.alloc(1024));
  return Buffer.concat(parts);
}

describe('ustar writer', () => {
  it('writes what GNU tar lists and extracts byte for byte, sorted, with uid/gid 0 and the fixed mtime', () => {
    const dir = tempDir();
    const tarFile = join(dir, 'x.tar');
    writeFileSync(tarFile, writeTar(files, { mtime: MTIME }));
    // GNU tar (an independent reader of the POSIX ustar format).
    const listing = execFileSync('tar', ['--list', '--verbose', '--numeric-owner', '--utc', '--file', tarFile], { encoding: 'utf8' }).trim().split('\n');
    expect(listing.map((l) => l.split(/\s+/).slice(5).join(' '))).toEqual([...files.map((f) => f.path)].sort());
    for (const l of listing) {
      expect(l).toMatch(/^-rw-r--r-- 0\/0 /);
      expect(l).toContain('2026-11-20 00:00');
    }
    const out = join(dir, 'out');
    mkdirSync(out);
    execFileSync('tar', ['--extract', '--file', tarFile, '--directory', out]);
    for (const f of files) expect(readFileSync(join(out, f.path)).equals(f.data)).toBe(true);
  });

  it('round-trips through our reader and gives the same bytes whatever the input order', () => {
    const a = writeTar(files, { mtime: MTIME });
    const b = writeTar([...files].reverse(), { mtime: MTIME });
    expect(a.equals(b)).toBe(true);
    const back = readTar(a);
    expect(back.map((f) => f.path)).toEqual([...files.map((f) => f.path)].sort());
    for (const f of back) expect(f.data.equals(files.find((x) => x.path === f.path)!.data)).toBe(true);
  });

  it('refuses to write unsafe or duplicate paths', () => {
    expect(() => writeTar([{ path: '../x', data: Buffer.from('') }], { mtime: 0 })).toThrow(ArchiveFormatError);
    expect(() => writeTar([{ path: '/etc/x', data: Buffer.from('') }], { mtime: 0 })).toThrow(ArchiveFormatError);
    expect(() => writeTar([{ path: 'a', data: Buffer.from('1') }, { path: 'a', data: Buffer.from('2') }], { mtime: 0 })).toThrow(/duplicate/);
  });
});

describe('ustar reader refuses what a study archive never holds', () => {
  it.each([
    ['a path climbing out with ..', [{ path: 'top/../x', type: '0' }], /\.\./],
    ['a path starting with ../', [{ path: '../x', type: '0' }], /\.\./],
    ['an absolute path', [{ path: '/tmp/x', type: '0' }], /absolute/],
    ['a symbolic link', [{ path: 'top/link', type: '2', link: '/etc/passwd' }], /symbolic link/],
    ['a hard link', [{ path: 'top/link', type: '1', link: 'top/a' }], /hard link/],
    ['a device file', [{ path: 'top/dev', type: '3' }], /device/],
    ['a pax extended header that nothing follows', [{ path: 'top/PaxHeader', type: 'x' }], /extended header that no entry follows/],
    ['a pax header that sets a link target', [{ path: 'top/PaxHeader', type: 'x', data: paxRecords({ linkpath: '/etc/passwd' }) }, { path: 'top/a', type: '0' }], /linkpath/],
    ['a global pax header', [{ path: 'pax_global_header', type: 'g', data: paxRecords({ comment: 'x' }) }, { path: 'top/a', type: '0' }], /global pax header/],
    ['a pax path climbing out with ..', [{ path: 'top/PaxHeader', type: 'x', data: paxRecords({ path: 'top/../../x' }) }, { path: 'top/a', type: '0' }], /\.\./],
    ['a GNU long name that is absolute', [{ path: '././@LongLink', type: 'L', data: Buffer.from('/etc/cron.d/x\0') }, { path: 'top/a', type: '0' }], /absolute/],
    ['./ in front of ..', [{ path: './../x', type: '0' }], /\.\./],
    ['a link behind ./', [{ path: './top/link', type: '2', link: '../../x' }], /symbolic link/],
    ['a file that is also the folder of another file', [{ path: 'top/study.yaml', type: '0' }, { path: 'top/study.yaml/x', type: '0' }], /'top\/study.yaml' is both a file and the folder of 'top\/study.yaml\/x'/],
    ['a folder entry that is also a file', [{ path: 'top/a', type: '0' }, { path: 'top/a/', type: '5' }], /both a file and a folder/],
    ['a duplicate path', [{ path: 'top/a', type: '0' }, { path: 'top/a', type: '0' }], /twice/],
  ])('%s', (_what, entries, message) => {
    expect(() => readTar(rawTar(entries))).toThrow(message);
  });

  it('refuses a symbolic link made by GNU tar', () => {
    const dir = tempDir();
    writeFileSync(join(dir, 'real.txt'), 'x');
    symlinkSync('/etc/hostname', join(dir, 'link'));
    const tar = execFileSync('tar', ['--create', '--format=ustar', '--file', '-', '--directory', dir, 'real.txt', 'link']);
    expect(() => readTar(tar)).toThrow(/symbolic link to '\/etc\/hostname'/);
  });

  it('refuses a damaged header and a truncated archive', () => {
    const good = writeTar(files, { mtime: MTIME });
    const bad = Buffer.from(good);
    bad[10] = bad[10]! ^ 0x01; // inside the first name field
    expect(() => readTar(bad)).toThrow(/checksum/);
    expect(() => readTar(good.subarray(0, 700))).toThrow(/truncated/);
    expect(() => readTar(Buffer.from('not a tar at all'.repeat(64)))).toThrow(ArchiveFormatError);
  });
});

describe('ustar reader reads what the standard tar tool writes when an archive is repacked', () => {
  // GNU tar (an independent writer) packs a folder as `.`: every name starts with `./`, folders get
  // entries of their own, and names over 100 bytes take a GNU long-name entry or a pax header.
  const longPath = `top/${'long-folder-name/'.repeat(6)}deep.csv`;
  function packed(format: 'gnu' | 'pax' | 'ustar'): Buffer {
    const dir = tempDir();
    for (const f of files) {
      mkdirSync(join(dir, ...f.path.split('/').slice(0, -1)), { recursive: true });
      writeFileSync(join(dir, ...f.path.split('/')), f.data);
    }
    return execFileSync('tar', ['--create', `--format=${format}`, '--file', '-', '--directory', dir, '.']);
  }

  it.each(['gnu', 'pax', 'ustar'] as const)('reads every file with its bytes from a folder packed as . in %s format', (format) => {
    const tar = packed(format);
    const listing = execFileSync('tar', ['--list', '--file', '-'], { input: tar, encoding: 'utf8' });
    expect(listing).toContain('./top/');
    expect(listing).toContain(`./${longPath}`);
    const read = readTar(tar);
    expect(read.map((f) => f.path).sort()).toEqual(files.map((f) => f.path).sort());
    for (const f of files) expect(read.find((r) => r.path === f.path)!.data.equals(f.data)).toBe(true);
  });
});

describe('deterministic gzip', () => {
  it('computes the CRC-32 check value and agrees with node:zlib', () => {
    // CRC-32/ISO-HDLC check value of "123456789" (CRC catalogue; from memory), and zlib's own crc32.
    expect(crc32(Buffer.from('123456789'))).toBe(0xcbf43926);
    fc.assert(fc.property(fc.uint8Array({ maxLength: 2000 }), (bytes) => crc32(bytes) === zlibCrc32(bytes)));
  });

  it('writes no time stamp or file name, and is read by node:zlib and by gzip(1)', () => {
    const data = Buffer.from('faultbook '.repeat(5000));
    const gz = gzipDeterministic(data);
    expect([...gz.subarray(0, 10)]).toEqual([0x1f, 0x8b, 8, 0, 0, 0, 0, 0, 2, 0xff]);
    expect(gunzipSync(gz).equals(data)).toBe(true);
    const dir = tempDir();
    writeFileSync(join(dir, 'x.gz'), gz);
    expect(execFileSync('gzip', ['--decompress', '--stdout', join(dir, 'x.gz')]).equals(data)).toBe(true);
    expect(gzipDeterministic(data).equals(gz)).toBe(true);
  });

  it('refuses data that is not gzip, and output over the limit', () => {
    expect(() => gunzipChecked(Buffer.from('plain text, not gzip at all'), 1000)).toThrow(/not a gzip file/);
    expect(() => gunzipChecked(gzipDeterministic(Buffer.alloc(10_000)), 1000)).toThrow(ArchiveFormatError);
  });
});
