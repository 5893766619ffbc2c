/**
 * Reading and checking scale about linearly with the size of a study: `faultbook check` on seeded
 * synthetic studies of 10,000, 20,000 and 50,000 events (one sample each, through the built
 * command), the time ratios between sizes, and `faultbook run` with every format on the
 * 20,000-event study. Prints figures; never fails on a timing. `npm run build` first (`npm run
 * bench` does).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { syntheticStudy } from './synthetic-study.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
// FAULTBOOK_BIN measures another build (e.g. an older checkout's bin/faultbook.js) the same way.
const bin = process.env.FAULTBOOK_BIN ?? join(root, 'bin', 'faultbook.js');
if (!existsSync(join(root, 'dist', 'cli', 'main.js'))) {
  console.log('dist/ is missing: run `npm run build` first (npm run bench does)');
  process.exit(0);
}

function timed(args: string[]): { seconds: number; code: number | null; peakMb?: number } {
  const t0 = performance.now();
  const r = spawnSync('/usr/bin/time', ['-f', '%M', process.execPath, bin, ...args], { encoding: 'utf8' });
  const seconds = (performance.now() - t0) / 1000;
  const kb = Number(r.stderr?.trim().split('\n').pop());
  if (r.status !== 0) console.log(`  exit ${r.status}: ${r.stderr.split('\n').slice(-4, -1).join(' | ')}`);
  return { seconds, code: r.status, ...(Number.isFinite(kb) ? { peakMb: kb / 1024 } : {}) };
}

const sizes = [10_000, 20_000, 50_000];
const checks: number[] = [];
const made: string[] = [];
for (const n of sizes) {
  const study = syntheticStudy(n);
  made.push(study);
  const r = timed(['check', study]);
  checks.push(r.seconds);
  console.log(`check, ${n.toLocaleString('en-US')} events: ${r.seconds.toFixed(2)} s, peak ${r.peakMb?.toFixed(0) ?? '?'} MB (exit ${r.code})`);
}
for (let i = 1; i < sizes.length; i++) {
  const size = sizes[i]! / sizes[i - 1]!;
  console.log(`  ${sizes[i - 1]!.toLocaleString('en-US')} → ${sizes[i]!.toLocaleString('en-US')} events (×${size}): time ×${(checks[i]! / checks[i - 1]!).toFixed(2)} (linear would be ×${size})`);
}
const out = mkdtempSync(join(tmpdir(), 'faultbook-bench-scale-'));
const run = timed(['run', made[1]!, '--out', out, '--quiet']);
console.log(`run, all formats, 20,000 events: ${run.seconds.toFixed(1)} s, peak ${run.peakMb?.toFixed(0) ?? '?'} MB (exit ${run.code})`);
for (const dir of [...made, out]) rmSync(dir, { recursive: true, force: true });
