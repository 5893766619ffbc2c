/**
 * verify's temporary folder: removed on dispose, on errors while unpacking, and when the process is
 * stopped by SIGINT or SIGTERM (the process still ends by that signal, so its exit status says so).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ArchiveFormatError } from '../../src/review/tar.js';
import { liveTempFolders, releaseSignalHandlers, unpackToTemp } from '../../src/review/unpack.js';

const made: string[] = [];
afterAll(() => {
  for (const dir of made) rmSync(dir, { recursive: true, force: true });
});

describe('temporary folder of verify', () => {
  it.each(['SIGINT', 'SIGTERM'] as const)('is removed when the process gets %s, and the process still ends by that signal', (signal) => {
    const tmp = mkdtempSync(join(tmpdir(), 'faultbook-signal-'));
    made.push(tmp);
    const r = spawnSync(process.execPath, ['--import', 'tsx', join(__dirname, 'unpack-signal-child.ts'), signal], {
      env: { ...process.env, TMPDIR: tmp },
      encoding: 'utf8',
      timeout: 60_000,
    });
    const dir = r.stdout.split('\n')[0]!;
    expect(dir.startsWith(tmp)).toBe(true);
    expect(r.stdout).not.toContain('still running');
    expect(r.signal).toBe(signal);
    expect(existsSync(dir)).toBe(false);
    // (tsx keeps a cache folder of its own there.)
    expect(readdirSync(tmp).filter((n) => n.startsWith('faultbook-'))).toEqual([]);
  });

  it('is removed when an entry cannot be unpacked, and the error says the archive is malformed', async () => {
    const before = new Set(liveTempFolders());
    expect(() =>
      unpackToTemp([
        { path: 'faultbook-archive/study/study.yaml', data: Buffer.from('x') },
        { path: 'faultbook-archive/study/study.yaml/x', data: Buffer.from('y') },
      ]),
    ).toThrow(ArchiveFormatError);
    expect(liveTempFolders().filter((d) => !before.has(d))).toEqual([]);
    await releaseSignalHandlers();
  });

  it('takes its signal handlers away once no folder is left, so Ctrl-C stops a long computation at once', async () => {
    const count = () => process.listenerCount('SIGINT') + process.listenerCount('SIGTERM');
    await releaseSignalHandlers();
    const base = count();
    const unpacked = unpackToTemp([{ path: 'a/b.txt', data: Buffer.from('b') }]);
    expect(count()).toBe(base + 2);
    unpacked.dispose();
    expect(existsSync(unpacked.dir)).toBe(false);
    await releaseSignalHandlers();
    expect(count()).toBe(base);
  });
});
