/**
 * manifest.json of a study archive: what is in it (SHA-256 of every file), what made it (tool name
 * and version, Node version, the hash of the tool's package-lock.json) and with which settings and
 * seeds, so that anyone can later check that the archived numbers came from the archived inputs.
 *
 * Nothing in it comes from the clock: its date is the study's own (issued, else as_of).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { packageRoot, toolVersion } from '../package.js';
import type { Results } from '../analysis/results.js';
import { sha256 } from '../study/read.js';
import type { ManifestSigner } from './sign.js';

export const MANIFEST_FORMAT = 'faultbook-archive/1';
export const MANIFEST_NAME = 'manifest.json';

export type FileRole = 'input' | 'output';

export interface ManifestFile {
  path: string;
  role: FileRole;
  bytes: number;
  sha256: string;
}

export interface Manifest {
  format: typeof MANIFEST_FORMAT;
  /** The study's date, also every entry's mtime: issued, else as_of. */
  date: string;
  tool: {
    name: 'faultbook';
    version: string;
    node: string;
    /** SHA-256 of the tool's package-lock.json: pins every dependency version it ran with. */
    lockfile_sha256: string | null;
  };
  study: { title: string; facility: string; revision: string; status: string; as_of: string; issued?: string };
  /** Who signed the archive (absent when unsigned); the signature over this file is manifest.sig. */
  signer?: ManifestSigner;
  /** The combined hash of the study inputs, as results.json records it. */
  inputs_sha256: string;
  settings: Record<string, number | string>;
  /** Every seed a random analysis uses (the Monte Carlo seed of the settings). */
  seeds: Record<string, number>;
  /** How the outputs were made, so verify makes them the same way. */
  outputs: { paper: 'a4' | 'letter'; appendix: boolean };
  files: ManifestFile[];
}

/** The hash of the package-lock.json the tool is installed with, or null when it has none. */
export function lockfileHash(root: string = packageRoot): string | null {
  const path = join(root, 'package-lock.json');
  return existsSync(path) ? sha256(readFileSync(path)) : null;
}

export function buildManifest(input: {
  results: Results;
  files: { path: string; role: FileRole; data: Buffer }[];
  paper: 'a4' | 'letter';
  appendix: boolean;
  signer?: ManifestSigner;
}): Manifest {
  const s = input.results.study;
  const seeds: Record<string, number> = {};
  const seed = input.results.settings.seed;
  if (typeof seed === 'number') seeds.uncertainty = seed;
  const study: Manifest['study'] = { title: s.title, facility: s.facility, revision: s.revision, status: s.status, as_of: s.as_of };
  if (s.issued) study.issued = s.issued;
  return {
    format: MANIFEST_FORMAT,
    date: s.issued ?? s.as_of,
    tool: { name: 'faultbook', version: toolVersion, node: process.version, lockfile_sha256: lockfileHash() },
    study,
    ...(input.signer ? { signer: input.signer } : {}),
    inputs_sha256: input.results.inputs.sha256,
    settings: { ...input.results.settings },
    seeds,
    outputs: { paper: input.paper, appendix: input.appendix },
    files: [...input.files]
      .sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0))
      .map((f) => ({ path: f.path, role: f.role, bytes: f.data.length, sha256: sha256(f.data) })),
  };
}

export function manifestJson(m: Manifest): string {
  return JSON.stringify(m, null, 2) + '\n';
}

/**
 * A manifest read back from an archive, checked for the fields verify relies on. Returns a message
 * for what is missing rather than throwing, so verify can say precisely why it cannot go on.
 */
export function parseManifest(text: string): { ok: true; manifest: Manifest } | { ok: false; message: string } {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    return { ok: false, message: `manifest.json is not JSON: ${err instanceof Error ? err.message : String(err)}` };
  }
  if (!raw || typeof raw !== 'object') return { ok: false, message: 'manifest.json is not an object' };
  const m = raw as Partial<Manifest>;
  if (m.format !== MANIFEST_FORMAT) return { ok: false, message: `manifest.json has format ${JSON.stringify(m.format)}, expected "${MANIFEST_FORMAT}"` };
  if (!Array.isArray(m.files) || !m.files.every((f) => f && typeof f.path === 'string' && typeof f.sha256 === 'string')) {
    return { ok: false, message: 'manifest.json has no valid "files" list' };
  }
  if (!m.tool || typeof m.tool.version !== 'string') return { ok: false, message: 'manifest.json does not name the tool version' };
  if (!m.outputs || (m.outputs.paper !== 'a4' && m.outputs.paper !== 'letter')) return { ok: false, message: 'manifest.json does not say how the outputs were made' };
  if (m.signer !== undefined) {
    const s = m.signer as Partial<ManifestSigner> | null;
    if (!s || typeof s.name !== 'string' || s.algorithm !== 'Ed25519' || typeof s.key_sha256 !== 'string' || typeof s.public_key !== 'string') {
      return { ok: false, message: 'manifest.json has a "signer" that does not name an Ed25519 key' };
    }
  }
  return { ok: true, manifest: m as Manifest };
}
