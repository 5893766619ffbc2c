import { createHash } from 'node:crypto';
import { execFileSync } from 'node:child_process';
import { readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { toolVersion } from '../../src/package.js';
import { gzipDeterministic } from '../../src/review/gzip.js';
import { header, readTar, writeTar, type TarFile } from '../../src/review/tar.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { BASE_EVENTS, P, writeStudy } from './studies.js';

const ROOT = 'faultbook-archive/';

const made: string[] = [];
afterAll(() => {
  for (const dir of made) rmSync(dir, { recursive: true, force: true });
});
/** A study written by writeStudy, removed (with the folder made for it) after the tests. */
function tracked(study: string): string {
  made.push(dirname(study));
  return study;
}
const sha = (b: Buffer | string) => createHash('sha256').update(b).digest('hex');

async function archiveOf(study: string): Promise<string> {
  const file = join(tempDir(), 'study.tar.gz');
  const r = await faultbook('archive', study, '--out', file, '--quiet');
  expect(r.code).toBe(0);
  return file;
}

/** Unpack, change, repack: what someone editing an archive by hand would produce (gzip and tar stay valid). */
function tamper(file: string, change: (entries: TarFile[]) => void): string {
  const entries = readTar(gunzipSync(readFileSync(file)));
  change(entries);
  const out = join(tempDir(), 'tampered.tar.gz');
  writeFileSync(out, gzipDeterministic(writeTar(entries, { mtime: 0 })));
  return out;
}

function entry(entries: TarFile[], path: string): TarFile {
  const e = entries.find((x) => x.path === ROOT + path);
  if (!e) throw new Error(`no ${path} in the archive`);
  return e;
}

function setManifest(entries: TarFile[], edit: (m: { tool: { version: string }; files: { path: string; sha256: string; bytes: number }[] }) => void): void {
  const m = entry(entries, 'manifest.json');
  const manifest = JSON.parse(m.data.toString('utf8'));
  edit(manifest);
  m.data = Buffer.from(JSON.stringify(manifest, null, 2) + '\n');
}

function rehash(entries: TarFile[], path: string): void {
  setManifest(entries, (m) => {
    const f = m.files.find((x) => x.path === path)!;
    f.sha256 = sha(entry(entries, path).data);
    f.bytes = entry(entries, path).data.length;
  });
}

describe('faultbook archive', () => {
  const study = tracked(writeStudy());
  let file = '';

  it('holds the inputs the reader read, the outputs and a manifest of their SHA-256', async () => {
    file = await archiveOf(study);
    // GNU tar reads it (an independent reader).
    const list = execFileSync('tar', ['--list', '--gzip', '--file', file], { encoding: 'utf8' }).trim().split('\n');
    expect(list).toEqual([
      `${ROOT}manifest.json`,
      `${ROOT}outputs/appendix.html`,
      `${ROOT}outputs/appendix.pdf`,
      `${ROOT}outputs/cutsets.csv`,
      `${ROOT}outputs/results.json`,
      `${ROOT}study/assumptions.md`,
      `${ROOT}study/events.yaml`,
      `${ROOT}study/logic.yaml`,
      `${ROOT}study/sources.yaml`,
      `${ROOT}study/study.yaml`,
    ]);
    const entries = readTar(gunzipSync(readFileSync(file)));
    const manifest = JSON.parse(entry(entries, 'manifest.json').data.toString('utf8'));
    expect(manifest.format).toBe('faultbook-archive/1');
    expect(manifest.tool).toMatchObject({ name: 'faultbook', version: toolVersion, node: process.version });
    expect(manifest.tool.lockfile_sha256).toBe(sha(readFileSync('package-lock.json')));
    expect(manifest.seeds).toEqual({ uncertainty: 7 });
    expect(manifest.settings.seed).toBe(7);
    expect(manifest.date).toBe('2026-02-01');
    // Every input is archived as it is on disk, with the hash of the bytes on disk.
    for (const name of ['study.yaml', 'events.yaml', 'logic.yaml', 'sources.yaml', 'assumptions.md']) {
      const onDisk = readFileSync(join(study, name));
      expect(entry(entries, `study/${name}`).data.equals(onDisk)).toBe(true);
      expect(manifest.files.find((f: { path: string }) => f.path === `study/${name}`).sha256).toBe(sha(onDisk));
    }
    for (const f of manifest.files) expect(sha(entry(entries, f.path).data)).toBe(f.sha256);
  });

  it('is byte-identical when made twice from the same study', async () => {
    const again = await archiveOf(study);
    expect(readFileSync(again).equals(readFileSync(file))).toBe(true);
  });

  it('does not archive files the study does not read', async () => {
    writeFileSync(join(study, 'notes-to-self.txt'), 'not an input');
    const entries = readTar(gunzipSync(readFileSync(await archiveOf(study))));
    expect(entries.some((e) => e.path.includes('notes-to-self'))).toBe(false);
  });
});

describe('faultbook verify', () => {
  const study = tracked(writeStudy());
  let file = '';

  it('passes (exit 0) on an untouched archive, having recomputed every number', async () => {
    file = await archiveOf(study);
    const r = await faultbook('verify', file);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^ok: all 9 hashes agree, and all \d+ numbers of results.json are recomputed exactly/m);
  });

  it('exits 3 and names the input when one byte of an input is flipped', async () => {
    const bad = tamper(file, (entries) => {
      const e = entry(entries, 'study/events.yaml');
      const i = e.data.indexOf('Sluice hoist motor');
      e.data[i] = e.data[i]! ^ 0x20; // 'S' → 's'
    });
    const r = await faultbook('verify', bad);
    expect(r.code).toBe(3);
    expect(r.stdout).toContain('[changed-input] study/events.yaml: SHA-256 differs from the manifest');
  });

  it('exits 3 and names results.json when one byte of it is flipped', async () => {
    const bad = tamper(file, (entries) => {
      const e = entry(entries, 'outputs/results.json');
      const i = e.data.indexOf('"exact": ') + '"exact": '.length + 3;
      e.data[i] = e.data[i] === 0x37 ? 0x38 : 0x37; // one digit of the first exact probability
    });
    const r = await faultbook('verify', bad);
    expect(r.code).toBe(3);
    expect(r.stdout).toContain('[changed-output] outputs/results.json: SHA-256 differs from the manifest');
    // The recomputation finds the changed number too, with its JSON path.
    expect(r.stdout).toMatch(/\[recomputed-differs\] outputs\/results.json: .* 1 number differs/);
    expect(r.stdout).toMatch(/\$\.tops\[0\]\.probability\.exact: archived .*, recomputed /);
  });

  it('catches a changed input even when the manifest was updated to match (the numbers no longer follow)', async () => {
    const bad = tamper(file, (entries) => {
      const e = entry(entries, 'study/events.yaml');
      e.data = Buffer.from(e.data.toString('utf8').replace(`value: ${P.brake}, source`, 'value: 0.5, source'));
      rehash(entries, 'study/events.yaml');
    });
    const r = await faultbook('verify', bad);
    expect(r.code).toBe(3);
    expect(r.stdout).not.toContain('[changed-input]');
    expect(r.stdout).toMatch(/\[recomputed-differs\] outputs\/results.json: recomputing from the archived inputs gives different results/);
    expect(r.stdout).toContain('$.inputs.sha256');
    expect(r.stdout).toContain('[recomputed-differs] outputs/cutsets.csv');
  });

  it('says when a different tool version gives different numbers, and notes it when they agree', async () => {
    const sameNumbers = tamper(file, (entries) => setManifest(entries, (m) => (m.tool.version = '0.0.1-older')));
    const ok = await faultbook('verify', sameNumbers);
    expect(ok.code).toBe(0);
    expect(ok.stdout).toContain('archived with faultbook 0.0.1-older, recomputed with faultbook');
    const different = tamper(file, (entries) => {
      setManifest(entries, (m) => (m.tool.version = '0.0.1-older'));
      const e = entry(entries, 'outputs/results.json');
      const results = JSON.parse(e.data.toString('utf8'));
      results.tops[0].probability.exact *= 1.000001;
      e.data = Buffer.from(JSON.stringify(results, null, 2) + '\n');
      rehash(entries, 'outputs/results.json');
    });
    const r = await faultbook('verify', different);
    expect(r.code).toBe(3);
    expect(r.stdout).toMatch(/\[tool-version\] outputs\/results.json: faultbook .* gives different numbers from faultbook 0\.0\.1-older/);
  });

  it('exits 3 for a file missing from the archive and for one the manifest does not list', async () => {
    const missing = tamper(file, (entries) => entries.splice(entries.indexOf(entry(entries, 'outputs/cutsets.csv')), 1));
    const r1 = await faultbook('verify', missing);
    expect(r1.code).toBe(3);
    expect(r1.stdout).toContain('[missing-file] outputs/cutsets.csv');
    const extra = tamper(file, (entries) => entries.push({ path: `${ROOT}study/extra.yaml`, data: Buffer.from('x: 1\n') }));
    const r2 = await faultbook('verify', extra);
    expect(r2.code).toBe(3);
    expect(r2.stdout).toContain('[unlisted-file] study/extra.yaml');
  });

  it('exits 3 when the archived study cannot be read any more', async () => {
    const bad = tamper(file, (entries) => {
      const e = entry(entries, 'study/logic.yaml');
      e.data = Buffer.from(e.data.toString('utf8').replace('any: [motor, brake, no-power]', 'any: [motor, brake, no-such-event]'));
      rehash(entries, 'study/logic.yaml');
    });
    const r = await faultbook('verify', bad);
    expect(r.code).toBe(3);
    expect(r.stdout).toContain('[recompute-failed]');
  });

  it('fails verification (exit 3) for a tar holding ../x, a symbolic link, a file that is not an archive, one without a manifest, a truncated and a corrupt one; exit 2 only when the file is missing', async () => {
    const dir = tempDir();
    const write = (name: string, data: Buffer) => {
      const f = join(dir, name);
      writeFileSync(f, data);
      return f;
    };
    const raw = (path: string, type: string, link?: string) =>
      Buffer.concat([header({ path, size: 0, mtime: 0, type, mode: 0o644, ...(link ? { linkTarget: link } : {}) }), Buffer.alloc(1024)]);
    const failed = async (f: string, message: string) => {
      const r = await faultbook('verify', f);
      expect(r.code).toBe(3);
      expect(r.stdout).toContain('failed: it cannot be read as a faultbook archive');
      expect(r.stdout).toContain(message);
    };
    await failed(write('dotdot.tar.gz', gzipDeterministic(raw('../x', '0'))), "'..'");
    await failed(write('link.tar.gz', gzipDeterministic(raw(`${ROOT}study/events.yaml`, '2', '/etc/passwd'))), 'symbolic link');
    await failed(write('notes.tar.gz', Buffer.from('these are notes, not an archive\n')), 'not a gzip file');
    await failed(write('empty.tar.gz', gzipDeterministic(writeTar([{ path: `${ROOT}study/study.yaml`, data: Buffer.from('x') }], { mtime: 0 }))), 'no manifest.json');
    const whole = readFileSync(file);
    await failed(write('truncated.tar.gz', whole.subarray(0, Math.floor(whole.length / 2))), 'corrupt or truncated');
    const corrupt = Buffer.from(whole);
    corrupt[Math.floor(corrupt.length / 2)] ^= 0xff;
    await failed(write('corrupt.tar.gz', corrupt), 'corrupt or truncated');
    const absent = await faultbook('verify', join(dir, 'absent.tar.gz'));
    expect(absent.code).toBe(2);
    expect(absent.stderr).toContain('archive not found');
  });

  it('fails verification (exit 3) with a clear message for an archive holding both study.yaml and study.yaml/x', async () => {
    const bad = tamper(file, (entries) => entries.push({ path: `${ROOT}study/study.yaml/x`, data: Buffer.from('x') }));
    const r = await faultbook('verify', bad);
    expect(r.code).toBe(3);
    expect(r.stdout).toContain(`'${ROOT}study/study.yaml' is both a file and the folder of '${ROOT}study/study.yaml/x'`);
  });

  it('reads an archive unpacked and repacked with GNU tar (./ names, folder entries)', async () => {
    const dir = tempDir();
    execFileSync('tar', ['--extract', '--gzip', '--file', file, '--directory', dir]);
    const repacked = join(tempDir(), 'repacked.tar.gz');
    execFileSync('tar', ['--create', '--gzip', '--file', repacked, '--directory', dir, '.']);
    expect(execFileSync('tar', ['--list', '--gzip', '--file', repacked], { encoding: 'utf8' })).toContain('./faultbook-archive/study/');
    const r = await faultbook('verify', repacked);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^ok: all 9 hashes agree/m);
  });

  it('catches appendix.pdf changed inside the archive with its hash updated in the manifest, by re-rendering it', async () => {
    const bad = tamper(file, (entries) => {
      const e = entry(entries, 'outputs/appendix.pdf');
      // A changed word on a page; the hash in the manifest follows, so only re-rendering can tell.
      e.data = Buffer.concat([e.data, Buffer.from('% appended by someone\n')]);
      rehash(entries, 'outputs/appendix.pdf');
    });
    const r = await faultbook('verify', bad);
    expect(r.code).toBe(3);
    expect(r.stdout).not.toContain('[changed-output]');
    expect(r.stdout).toContain('[rerender-differs] outputs/appendix.pdf: re-rendering from the archived inputs gives different bytes');
    expect(r.stdout).toContain('re-rendered byte-identical from the archived inputs: outputs/appendix.html');
  });

  it('catches a duplicate key in results.json that parses to the true numbers (bytes are compared, not parsed objects)', async () => {
    const bad = tamper(file, (entries) => {
      const e = entry(entries, 'outputs/results.json');
      const text = e.data.toString('utf8');
      // JSON.parse keeps the last of two equal keys: the false value shown first is parsed away.
      e.data = Buffer.from(text.replace('"exact": ', '"exact": 0.5,\n      "exact": '));
      expect(JSON.parse(e.data.toString('utf8'))).toEqual(JSON.parse(text));
      rehash(entries, 'outputs/results.json');
    });
    const r = await faultbook('verify', bad);
    expect(r.code).toBe(3);
    expect(r.stdout).toContain('[changed-output] outputs/results.json has the key "exact" twice in one object');
  });

  it('with another faultbook version: recomputes every number, names the outputs it could not re-render identically and why, exits 0 when the numbers agree', async () => {
    const older = tamper(file, (entries) => {
      setManifest(entries, (m) => (m.tool.version = '0.0.1-older'));
      const e = entry(entries, 'outputs/appendix.html');
      e.data = Buffer.from(e.data.toString('utf8').replace('</body>', '<!-- an older layout --></body>'));
      rehash(entries, 'outputs/appendix.html');
    });
    const r = await faultbook('verify', older);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('note: outputs/appendix.html could not be re-rendered identically because it was made by faultbook 0.0.1-older, this is faultbook');
    expect(r.stdout).toContain('the same numbers');
  });

  it('refuses to recompute past its Monte Carlo sample limit (exit 3) unless the limit is raised', async () => {
    const r = await faultbook('verify', file, '--max-samples', '10');
    expect(r.code).toBe(3);
    expect(r.stdout).toMatch(/\[over-limit\] the archived settings ask for \d+ Monte Carlo samples, more than verify's limit of 10/);
    expect(r.stdout).toContain('--max-samples');
    const bad = await faultbook('verify', file, '--max-samples', 'lots');
    expect(bad.code).toBe(2);
  });

  it('refuses an archive that expands past its unpacked-size limit (a gzip bomb) without writing it anywhere', async () => {
    const dir = tempDir();
    const bomb = join(dir, 'bomb.tar.gz');
    // 2 MiB of zeros in one entry compresses to a few KiB.
    writeFileSync(bomb, gzipDeterministic(writeTar([{ path: `${ROOT}manifest.json`, data: Buffer.alloc(2 * 1024 * 1024) }], { mtime: 0 })));
    const r = await faultbook('verify', bomb, '--max-unpacked-mib', '1');
    expect(r.code).toBe(3);
    expect(r.stdout).toContain(`expands to more than the limit of ${1024 * 1024} bytes`);
    expect(r.stdout).toContain('--max-unpacked-mib');
  });

  it('leaves no temporary folder behind, whether it passes or fails', async () => {
    const tmp = tempDir();
    const saved = process.env.TMPDIR;
    process.env.TMPDIR = tmp;
    try {
      expect((await faultbook('verify', file)).code).toBe(0);
      const unreadable = tamper(file, (entries) => {
        const e = entry(entries, 'study/logic.yaml');
        e.data = Buffer.from('{ not: [valid');
        rehash(entries, 'study/logic.yaml');
      });
      // tamper() wrote into the temporary folder too: count only verify's folders.
      expect((await faultbook('verify', unreadable)).code).toBe(3);
      expect(readdirSync(tmp).filter((n) => n.startsWith('faultbook-verify-'))).toEqual([]);
    } finally {
      if (saved === undefined) delete process.env.TMPDIR;
      else process.env.TMPDIR = saved;
    }
  });
});

describe('no command writes over a file it read', () => {
  it('refuses archive --out STUDY/events.yaml (exit 2) and leaves the input as it was', async () => {
    const study = tracked(writeStudy());
    const before = readFileSync(join(study, 'events.yaml'));
    const r = await faultbook('archive', study, '--out', join(study, 'events.yaml'));
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('a file this command reads');
    expect(readFileSync(join(study, 'events.yaml')).equals(before)).toBe(true);
    // The same file reached through a symbolic link is the same file.
    const dir = tempDir();
    symlinkSync(study, join(dir, 'via-link'));
    expect((await faultbook('archive', study, '--out', join(dir, 'via-link', 'logic.yaml'))).code).toBe(2);
  });
});

describe('archive of a study with a changed input', () => {
  it('records a different inputs hash and verifies on its own', async () => {
    const a = await archiveOf(tracked(writeStudy()));
    const b = await archiveOf(tracked(writeStudy({ events: BASE_EVENTS.replace(`value: ${P.motor}`, 'value: 3e-3') })));
    const manifest = (f: string) => JSON.parse(entry(readTar(gunzipSync(readFileSync(f))), 'manifest.json').data.toString('utf8'));
    expect(manifest(a).inputs_sha256).not.toBe(manifest(b).inputs_sha256);
    expect((await faultbook('verify', b)).code).toBe(0);
  });
});
