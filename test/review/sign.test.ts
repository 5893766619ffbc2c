/**
 * Signed archives, with keys made by the openssl command line (an independent implementation of
 * Ed25519, RFC 8032, and of the PEM/DER key formats), as an agency would make them.
 */
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { gzipDeterministic } from '../../src/review/gzip.js';
import { readTar, writeTar, type TarFile } from '../../src/review/tar.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { haveTool } from '../tools.js';
import { P, writeStudy } from './studies.js';

const ROOT = 'faultbook-archive/';
const sha = (b: Buffer | string) => createHash('sha256').update(b).digest('hex');

const made: string[] = [];
afterAll(() => {
  for (const dir of made) rmSync(dir, { recursive: true, force: true });
});
function temp(): string {
  const dir = tempDir('faultbook-sign-');
  made.push(dir);
  return dir;
}
function study(parts?: Parameters<typeof writeStudy>[0]): string {
  const s = writeStudy(parts);
  made.push(dirname(s));
  return s;
}

const openssl = (...args: string[]) => execFileSync('openssl', args, { encoding: 'utf8', stdio: 'pipe' });

interface KeyPair {
  key: string;
  pub: string;
  /** SHA-256 of the DER SubjectPublicKeyInfo, computed by openssl and sha256 here (not by faultbook). */
  fingerprint: string;
}

function keyPair(dir: string, name: string): KeyPair {
  const key = join(dir, `${name}-key.pem`);
  const pub = join(dir, `${name}-pub.pem`);
  openssl('genpkey', '-algorithm', 'ed25519', '-out', key);
  openssl('pkey', '-in', key, '-pubout', '-out', pub);
  const der = execFileSync('openssl', ['pkey', '-pubin', '-in', pub, '-outform', 'DER'], { stdio: 'pipe' });
  return { key, pub, fingerprint: sha(der) };
}

function entries(file: string): TarFile[] {
  return readTar(gunzipSync(readFileSync(file)));
}
function entry(list: TarFile[], path: string): TarFile {
  const e = list.find((x) => x.path === ROOT + path);
  if (!e) throw new Error(`no ${path}`);
  return e;
}
function repack(list: TarFile[], dir: string, name: string): string {
  const out = join(dir, name);
  writeFileSync(out, gzipDeterministic(writeTar(list, { mtime: 0 })));
  return out;
}

const ready = haveTool('/usr/bin/openssl', 'signed-archive tests (openssl makes the keys)');

describe.runIf(ready)('signed archives', () => {
  let dir = '';
  let agency: KeyPair;
  let other: KeyPair;
  let studyDir = '';
  let signed = '';

  beforeAll(async () => {
    dir = temp();
    agency = keyPair(dir, 'agency');
    other = keyPair(dir, 'other');
    studyDir = study();
    signed = join(dir, 'signed.tar.gz');
    const r = await faultbook('archive', studyDir, '--out', signed, '--sign', agency.key, '--signer', 'Example Dam Safety Office (invented)');
    expect(r.stderr).not.toContain('error');
    expect(r.code).toBe(0);
    expect(r.stdout).toContain(`signed by "Example Dam Safety Office (invented)" with Ed25519 key SHA-256 ${agency.fingerprint}`);
  });

  it('records the signer and the key in the signed manifest, and an Ed25519 signature that openssl accepts', () => {
    const list = entries(signed);
    const manifestBytes = entry(list, 'manifest.json').data;
    const manifest = JSON.parse(manifestBytes.toString('utf8'));
    expect(manifest.signer).toMatchObject({ name: 'Example Dam Safety Office (invented)', algorithm: 'Ed25519', key_sha256: agency.fingerprint });
    const sig = JSON.parse(entry(list, 'manifest.sig').data.toString('utf8'));
    expect(sig).toMatchObject({ format: 'faultbook-signature/1', algorithm: 'Ed25519', key_sha256: agency.fingerprint });
    // openssl checks the signature over the manifest bytes with the public key file (independent verifier).
    writeFileSync(join(dir, 'manifest.json'), manifestBytes);
    writeFileSync(join(dir, 'manifest.sig.bin'), Buffer.from(sig.signature, 'base64'));
    const out = openssl('pkeyutl', '-verify', '-pubin', '-inkey', agency.pub, '-rawin', '-in', join(dir, 'manifest.json'), '-sigfile', join(dir, 'manifest.sig.bin'));
    expect(out).toContain('Signature Verified Successfully');
  });

  it('is byte-identical when signed twice (Ed25519 signatures are deterministic)', async () => {
    const again = join(dir, 'again.tar.gz');
    expect((await faultbook('archive', studyDir, '--out', again, '--quiet', '--sign', agency.key, '--signer', 'Example Dam Safety Office (invented)')).code).toBe(0);
    expect(readFileSync(again).equals(readFileSync(signed))).toBe(true);
  });

  it('passes with the signer public key, and reports who signed and the key fingerprint', async () => {
    const r = await faultbook('verify', signed, '--trust', agency.pub);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain(`origin: signed by "Example Dam Safety Office (invented)" with Ed25519 key SHA-256 ${agency.fingerprint}: a trusted key (${agency.pub})`);
    expect(r.stdout).toContain('re-rendered byte-identical from the archived inputs: outputs/appendix.html, outputs/appendix.pdf');
  });

  it('passes with a folder of trusted public keys that holds the signer key, and with --trust repeated', async () => {
    const trustDir = join(dir, 'trusted');
    mkdirSync(trustDir);
    writeFileSync(join(trustDir, 'a-other.pem'), readFileSync(other.pub));
    writeFileSync(join(trustDir, 'b-agency.pem'), readFileSync(agency.pub));
    expect((await faultbook('verify', signed, '--trust', trustDir)).code).toBe(0);
    expect((await faultbook('verify', signed, '--trust', other.pub, '--trust', agency.pub)).code).toBe(0);
  });

  it('fails (exit 3) with another key', async () => {
    const r = await faultbook('verify', signed, '--trust', other.pub);
    expect(r.code).toBe(3);
    expect(r.stdout).toContain(`[signature] signed by "Example Dam Safety Office (invented)" with key SHA-256 ${agency.fingerprint}, which is not among the 1 trusted key`);
  });

  it('without --trust checks everything else and says the origin was not checked', async () => {
    const r = await faultbook('verify', signed);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('origin not checked: no --trust key was given');
  });

  it('fails (exit 3) for an unsigned archive when a trust key is given, and says so without one', async () => {
    const unsigned = join(dir, 'unsigned.tar.gz');
    expect((await faultbook('archive', studyDir, '--out', unsigned, '--quiet')).code).toBe(0);
    const r = await faultbook('verify', unsigned, '--trust', agency.pub);
    expect(r.code).toBe(3);
    expect(r.stdout).toContain('[signature] the archive is not signed, and trusted keys were given');
    const plain = await faultbook('verify', unsigned);
    expect(plain.code).toBe(0);
    expect(plain.stdout).toContain('origin: not signed; origin not checked');
  });

  it('fails (exit 3) when appendix.pdf is replaced by one re-rendered from edited inputs and the manifest re-computed', async () => {
    // Someone edits an input, runs faultbook again, and swaps the new appendix into the signed
    // archive with the manifest's hash updated: the signature over the manifest no longer holds.
    const edited = study();
    const editedEvents = readFileSync(join(edited, 'events.yaml'), 'utf8').replace(`value: ${P.brake}, source`, 'value: 0.5, source');
    writeFileSync(join(edited, 'events.yaml'), editedEvents);
    const editedArchive = join(dir, 'edited.tar.gz');
    expect((await faultbook('archive', edited, '--out', editedArchive, '--quiet')).code).toBe(0);
    const newPdf = entry(entries(editedArchive), 'outputs/appendix.pdf').data;
    const list = entries(signed);
    expect(newPdf.equals(entry(list, 'outputs/appendix.pdf').data)).toBe(false);
    entry(list, 'outputs/appendix.pdf').data = newPdf;
    const m = entry(list, 'manifest.json');
    const manifest = JSON.parse(m.data.toString('utf8'));
    const f = manifest.files.find((x: { path: string }) => x.path === 'outputs/appendix.pdf');
    f.sha256 = sha(newPdf);
    f.bytes = newPdf.length;
    m.data = Buffer.from(JSON.stringify(manifest, null, 2) + '\n');
    const swapped = repack(list, dir, 'swapped.tar.gz');
    for (const args of [['--trust', agency.pub], []]) {
      const r = await faultbook('verify', swapped, ...args);
      expect(r.code).toBe(3);
      expect(r.stdout).toContain('[signature] the signature does not hold: manifest.json was changed after it was signed');
      expect(r.stdout).toContain('[rerender-differs] outputs/appendix.pdf');
    }
  });

  it('a regenerated archive re-signed with another key verifies only under the key that signed it', async () => {
    const resigned = join(dir, 'resigned.tar.gz');
    expect((await faultbook('archive', studyDir, '--out', resigned, '--quiet', '--sign', other.key, '--signer', 'Example Dam Safety Office (invented)')).code).toBe(0);
    expect((await faultbook('verify', resigned, '--trust', agency.pub)).code).toBe(3);
    expect((await faultbook('verify', resigned, '--trust', other.pub)).code).toBe(0);
    const open = await faultbook('verify', resigned);
    expect(open.code).toBe(0);
    expect(open.stdout).toContain(`key SHA-256 ${other.fingerprint}; origin not checked`);
  });

  it('fails (exit 3) when the signer name in the manifest is changed, or the signature file removed', async () => {
    const renamed = entries(signed);
    const m = entry(renamed, 'manifest.json');
    m.data = Buffer.from(m.data.toString('utf8').replace('Example Dam Safety Office (invented)', 'Someone Else (invented)'));
    const r1 = await faultbook('verify', repack(renamed, dir, 'renamed.tar.gz'));
    expect(r1.code).toBe(3);
    expect(r1.stdout).toContain('the signature does not hold');
    const stripped = entries(signed).filter((e) => e.path !== `${ROOT}manifest.sig`);
    const r2 = await faultbook('verify', repack(stripped, dir, 'stripped.tar.gz'));
    expect(r2.code).toBe(3);
    expect(r2.stdout).toContain('manifest.json names a signer but the archive holds no manifest.sig');
  });

  it('refuses wrong calls with exit 2: --sign without --signer, a key that is not Ed25519, a private key given as trust, a missing trust key', async () => {
    const out = join(dir, 'never.tar.gz');
    const noName = await faultbook('archive', studyDir, '--out', out, '--sign', agency.key);
    expect(noName.code).toBe(2);
    expect(noName.stderr).toContain('--sign needs --signer');
    const rsa = join(dir, 'rsa-key.pem');
    openssl('genpkey', '-algorithm', 'RSA', '-pkeyopt', 'rsa_keygen_bits:1024', '-out', rsa);
    const wrongKind = await faultbook('archive', studyDir, '--out', out, '--sign', rsa, '--signer', 'X');
    expect(wrongKind.code).toBe(2);
    expect(wrongKind.stderr).toContain('is a rsa key, not Ed25519');
    const privateAsTrust = await faultbook('verify', signed, '--trust', agency.key);
    expect(privateAsTrust.code).toBe(2);
    expect(privateAsTrust.stderr).toContain('is a private key; trust is given with public keys');
    expect((await faultbook('verify', signed, '--trust', join(dir, 'absent.pem'))).code).toBe(2);
    expect((await faultbook('archive', studyDir, '--out', join(dir, 'agency-key.pem'), '--sign', agency.key, '--signer', 'X')).code).toBe(2);
  });
});
