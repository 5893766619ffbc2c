/**
 * A few corpus cases through a real child process, to prove that what reaches the terminal is the
 * clean message and the exit code, with no stack trace from anywhere in the process (the launcher,
 * the module loader, an uncaught rejection). Runs the sources through tsx (cli-entry.ts); when a
 * build exists (`npm test` builds first) one case also goes through bin/faultbook.js itself.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CORPUS, earlierOutputs, expectNoStackTrace, expectRefused, readCorpusTables, snapshot } from './harness.js';

/** A hang guard for a whole process (start-up and transpiling included); not a benchmark. */
const PROCESS_LIMIT_MS = 20_000;

function runProcess(args: string[], launcher: 'tsx' | 'bin' = 'tsx') {
  const argv = launcher === 'tsx' ? ['--import', 'tsx', join('test', 'hardening', 'cli-entry.ts'), ...args] : [join('bin', 'faultbook.js'), ...args];
  const env = { ...process.env };
  delete env.FAULTBOOK_DEBUG;
  const r = spawnSync(process.execPath, argv, { encoding: 'utf8', env, timeout: PROCESS_LIMIT_MS });
  if (r.error) throw r.error;
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr, signal: r.signal };
}

const { committed } = readCorpusTables();
const byName = new Map(committed.map((c) => [c.name, c]));

// The cases most likely to break a process rather than a function: parser stack exhaustion, alias
// expansion, path confinement, a data file, a cycle, a missing study file.
const PICKED = ['yaml-deep-nesting-extreme', 'yaml-alias-bomb', 'data-path-parent', 'csv-bad-status', 'cycle', 'missing-study-yaml', 'yaml-binary'];

describe('bad studies through a child process', () => {
  beforeAll(() => {
    for (const name of PICKED) expect(byName.has(name), name).toBe(true);
  });

  for (const name of PICKED) {
    it(name, () => {
      const c = byName.get(name)!;
      const out = earlierOutputs();
      const before = snapshot(out);
      const r = runProcess(['run', join(CORPUS, name), '--out', out]);
      expect(r.signal).toBeNull();
      expectRefused(r, c);
      expect(snapshot(out)).toEqual(before);
    }, PROCESS_LIMIT_MS + 5000);
  }

  it('bad arguments are exit 2 with what would be right, no stack', () => {
    for (const args of [['run'], ['run', join(CORPUS, 'cycle'), '--format', 'xml'], ['run', join(CORPUS, 'cycle'), '--no-such-flag'], ['frobnicate']]) {
      const r = runProcess(args);
      expect(r.code, args.join(' ')).toBe(2);
      expectNoStackTrace(r.stderr);
      expect(r.stderr, args.join(' ')).toMatch(/expected: \S/);
    }
  }, PROCESS_LIMIT_MS * 4);

  it.skipIf(!existsSync(join('dist', 'cli', 'main.js')))('through bin/faultbook.js (the built command)', () => {
    const c = byName.get('cycle')!;
    const out = earlierOutputs();
    const before = snapshot(out);
    const r = runProcess(['run', join(CORPUS, 'cycle'), '--out', out], 'bin');
    expectRefused(r, c);
    expect(snapshot(out)).toEqual(before);
  }, PROCESS_LIMIT_MS + 5000);
});
