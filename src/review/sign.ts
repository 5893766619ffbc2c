/**
 * Signing an archive's manifest with Ed25519 (RFC 8032) through node:crypto, so an agency can say
 * years later who issued an archive, not only that it is consistent.
 *
 * What is signed: the exact bytes of manifest.json. The manifest lists the SHA-256 of every other
 * file and names the signer (the name given to `archive --signer` and the key's fingerprint), so one
 * signature covers every byte of the archive except the signature file itself. Ed25519 signatures
 * are deterministic: the same manifest and key give the same signature, so signed archives stay
 * byte-identical between runs.
 *
 * Keys are the PEM files the openssl command line writes (`openssl genpkey -algorithm ed25519`,
 * `openssl pkey -pubout`). A key's fingerprint is the SHA-256 of its DER SubjectPublicKeyInfo, in
 * hex, which anyone can recompute with `openssl pkey -pubin -in PUB.pem -outform DER | sha256sum`.
 */
import { createHash, createPrivateKey, createPublicKey, sign, verify, type KeyObject } from 'node:crypto';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { StudyError } from '../study/errors.js';

export const SIGNATURE_NAME = 'manifest.sig';
export const SIGNATURE_FORMAT = 'faultbook-signature/1';

/** Who signed, as the signed manifest records it. */
export interface ManifestSigner {
  /** The name given with `archive --signer` (a person, an office, an organisation). */
  name: string;
  algorithm: 'Ed25519';
  /** SHA-256 (hex) of the public key's DER SubjectPublicKeyInfo. */
  key_sha256: string;
  /** The public key itself (DER SubjectPublicKeyInfo, base64), so the signature can be checked without a trust list. */
  public_key: string;
}

/** manifest.sig: the signature over the bytes of manifest.json. */
export interface SignatureFile {
  format: typeof SIGNATURE_FORMAT;
  algorithm: 'Ed25519';
  key_sha256: string;
  /** base64 of the 64-byte Ed25519 signature. */
  signature: string;
}

export interface SigningKey {
  privateKey: KeyObject;
  publicKey: KeyObject;
  fingerprint: string;
}

export interface TrustedKey {
  /** The file it was read from. */
  path: string;
  key: KeyObject;
  fingerprint: string;
}

/** Most characters of a signer name: a name, not a document. */
export const MAX_SIGNER_NAME = 200;

export function fingerprint(publicKey: KeyObject): string {
  return createHash('sha256').update(publicKey.export({ type: 'spki', format: 'der' })).digest('hex');
}

/** The signer name as given, or an input error saying what a name may hold. */
export function checkSignerName(name: string): string {
  const trimmed = name.trim();
  if (trimmed === '') throw new StudyError('--signer is empty', undefined, 'the name of who issues the archive, e.g. --signer "Dam Safety Office, J. Doe"');
  if (trimmed.length > MAX_SIGNER_NAME) throw new StudyError(`--signer is ${trimmed.length} characters long`, undefined, `a name of at most ${MAX_SIGNER_NAME} characters`);
  if (/[\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/.test(trimmed)) {
    throw new StudyError('--signer contains a control or text-direction character', undefined, 'a name of printable characters');
  }
  return trimmed;
}

/** An Ed25519 private key from a PEM file, or an input error naming the file. */
export function readSigningKey(path: string): SigningKey {
  const text = readKeyFile(path, 'private key');
  let privateKey: KeyObject;
  try {
    privateKey = createPrivateKey({ key: text, format: 'pem' });
  } catch (err) {
    const why = err instanceof Error ? err.message : String(err);
    const encrypted = /ENCRYPTED/.test(text) || /passphrase/i.test(why);
    throw new StudyError(
      encrypted ? `${path} is an encrypted private key; faultbook cannot ask for its passphrase` : `${path} is not a private key in PEM form (${why})`,
      undefined,
      encrypted ? 'an unencrypted copy kept where only the signer can read it: openssl pkey -in KEY.pem -out PLAIN.pem' : 'a key made by: openssl genpkey -algorithm ed25519 -out KEY.pem',
    );
  }
  if (privateKey.asymmetricKeyType !== 'ed25519') {
    throw new StudyError(`${path} is a ${privateKey.asymmetricKeyType ?? 'unknown'} key, not Ed25519`, undefined, 'a key made by: openssl genpkey -algorithm ed25519 -out KEY.pem');
  }
  const publicKey = createPublicKey(privateKey);
  return { privateKey, publicKey, fingerprint: fingerprint(publicKey) };
}

/**
 * The trusted public keys: each argument is a PEM file or a folder whose `*.pem` files are all read
 * (not its sub-folders). A private key given as a trust key is refused: it belongs to the signer
 * alone, and accepting it would teach people to pass it around.
 */
export function readTrustedKeys(args: string[]): TrustedKey[] {
  const keys: TrustedKey[] = [];
  for (const arg of args) {
    let isFolder: boolean;
    try {
      isFolder = statSync(arg).isDirectory();
    } catch {
      throw new StudyError(`trust key not found: ${arg}`, undefined, 'a public key file (openssl pkey -in KEY.pem -pubout -out PUB.pem) or a folder of them');
    }
    if (!isFolder) {
      keys.push(readPublicKey(arg));
      continue;
    }
    const pems = readdirSync(arg)
      .filter((n) => n.toLowerCase().endsWith('.pem'))
      .sort()
      .map((n) => join(arg, n))
      .filter((p) => statSync(p).isFile());
    if (pems.length === 0) throw new StudyError(`the trust folder ${arg} holds no .pem files`, undefined, 'a folder of public keys, one PEM file each');
    for (const p of pems) keys.push(readPublicKey(p));
  }
  return keys;
}

function readPublicKey(path: string): TrustedKey {
  const text = readKeyFile(path, 'public key');
  if (/-----BEGIN (ENCRYPTED |)PRIVATE KEY-----/.test(text)) {
    throw new StudyError(`${path} is a private key; trust is given with public keys`, undefined, `its public key: openssl pkey -in ${path} -pubout -out PUB.pem (and keep the private key with its owner)`);
  }
  let key: KeyObject;
  try {
    key = createPublicKey({ key: text, format: 'pem' });
  } catch (err) {
    throw new StudyError(`${path} is not a public key in PEM form (${err instanceof Error ? err.message : String(err)})`, undefined, 'a key written by: openssl pkey -in KEY.pem -pubout -out PUB.pem');
  }
  if (key.asymmetricKeyType !== 'ed25519') {
    throw new StudyError(`${path} is a ${key.asymmetricKeyType ?? 'unknown'} key, not Ed25519`, undefined, 'the public half of a key made by: openssl genpkey -algorithm ed25519');
  }
  return { path, key, fingerprint: fingerprint(key) };
}

/** Key files are small; a large one is a wrong path, not a key. */
function readKeyFile(path: string, what: string): string {
  let data: Buffer;
  try {
    if (!statSync(path).isFile()) throw new Error('not a file');
    if (statSync(path).size > 64 * 1024) throw new StudyError(`${path} is too large to be a ${what}`, undefined, `a PEM ${what} file`);
    data = readFileSync(path);
  } catch (err) {
    if (err instanceof StudyError) throw err;
    throw new StudyError(`${what} not found: ${path}`, undefined, `the path of a PEM ${what} file`);
  }
  return data.toString('utf8');
}

export function signerRecord(name: string, key: SigningKey): ManifestSigner {
  return {
    name,
    algorithm: 'Ed25519',
    key_sha256: key.fingerprint,
    public_key: key.publicKey.export({ type: 'spki', format: 'der' }).toString('base64'),
  };
}

export function signatureFile(manifestBytes: Buffer, key: SigningKey): Buffer {
  const file: SignatureFile = {
    format: SIGNATURE_FORMAT,
    algorithm: 'Ed25519',
    key_sha256: key.fingerprint,
    signature: sign(null, manifestBytes, key.privateKey).toString('base64'),
  };
  return Buffer.from(JSON.stringify(file, null, 2) + '\n', 'utf8');
}

export type SignatureCheck =
  | { status: 'unsigned' }
  | { status: 'valid'; signer: ManifestSigner; trustedBy?: TrustedKey }
  | { status: 'invalid'; signer?: ManifestSigner; reason: string };

/**
 * Whether manifest.json carries a signature that holds. Without trusted keys a valid signature
 * says only that nothing signed changed since someone signed it; with them it also says who.
 */
export function checkSignature(manifestBytes: Buffer, signer: ManifestSigner | undefined, sigBytes: Buffer | undefined, trusted: TrustedKey[]): SignatureCheck {
  if (!signer && !sigBytes) return { status: 'unsigned' };
  if (!signer) return { status: 'invalid', reason: `the archive holds ${SIGNATURE_NAME} but manifest.json names no signer` };
  if (!sigBytes) return { status: 'invalid', signer, reason: `manifest.json names a signer but the archive holds no ${SIGNATURE_NAME}` };
  let file: Partial<SignatureFile>;
  try {
    file = JSON.parse(sigBytes.toString('utf8')) as Partial<SignatureFile>;
  } catch {
    return { status: 'invalid', signer, reason: `${SIGNATURE_NAME} is not JSON` };
  }
  if (file.format !== SIGNATURE_FORMAT || file.algorithm !== 'Ed25519' || typeof file.signature !== 'string') {
    return { status: 'invalid', signer, reason: `${SIGNATURE_NAME} is not a ${SIGNATURE_FORMAT} Ed25519 signature` };
  }
  let key: KeyObject;
  try {
    key = createPublicKey({ key: Buffer.from(signer.public_key, 'base64'), format: 'der', type: 'spki' });
  } catch {
    return { status: 'invalid', signer, reason: 'the public key in manifest.json cannot be read' };
  }
  if (key.asymmetricKeyType !== 'ed25519') return { status: 'invalid', signer, reason: 'the public key in manifest.json is not Ed25519' };
  if (fingerprint(key) !== signer.key_sha256) return { status: 'invalid', signer, reason: 'the public key in manifest.json does not match its recorded fingerprint' };
  if (file.key_sha256 !== signer.key_sha256) return { status: 'invalid', signer, reason: `${SIGNATURE_NAME} names a different key from manifest.json` };
  const signature = Buffer.from(file.signature, 'base64');
  if (signature.length !== 64 || !verify(null, manifestBytes, key, signature)) {
    return { status: 'invalid', signer, reason: 'the signature does not hold: manifest.json was changed after it was signed, or the signature was' };
  }
  const trustedBy = trusted.find((t) => t.fingerprint === signer.key_sha256);
  return trustedBy ? { status: 'valid', signer, trustedBy } : { status: 'valid', signer };
}
