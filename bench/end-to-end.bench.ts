/**
 * `faultbook run` end to end, all formats, through the built command (bin/faultbook.js) as a user
 * runs it: the example study (median of 5 runs; target under 5 s on this 2-core machine) and a
 * seeded synthetic 2,000-event study with diagrams (median of 3; target under 20 s).
 * Prints its figures; never fails on a timing. Run `npm run build` first (`npm run bench` does).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { syntheticStudy } from './synthetic-study.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const bin = join(root, 'bin', 'faultbook.js');
if (!existsSync(join(root, 'dist', 'cli', 'main.js'))) {
  console.log('dist/ is missing: run `npm run build` first (npm run bench does)');
  process.exit(0);
}

function timeRuns(study: string, runs: number): { median: number; all: number[]; pages?: string } {
  const all: number[] = [];
  const out = mkdtempSync(join(tmpdir(), 'faultbook-bench-'));
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    const r = spawnSync(process.execPath, [bin, 'run', study, '--out', out, '--quiet'], { encoding: 'utf8' });
    const ms = performance.now() - t0;
    if (r.status !== 0) {
      console.log(`  run failed (exit ${r.status}): ${r.stderr.split('\n').slice(-3).join(' ')}`);
      return { median: NaN, all };
    }
    all.push(ms);
  }
  const sorted = [...all].sort((a, b) => a - b);
  const info = spawnSync('pdfinfo', [join(out, 'appendix.pdf')], { encoding: 'utf8' });
  const pages = info.status === 0 ? /Pages:\s+(\d+)/.exec(info.stdout)?.[1] : undefined;
  return { median: sorted[Math.floor(sorted.length / 2)]!, all, ...(pages ? { pages } : {}) };
}

const fmt = (ms: number) => `${(ms / 1000).toFixed(2)} s`;
const ex = timeRuns(join(root, 'example-study'), 5);
console.log(`example-study, all formats: median ${fmt(ex.median)} of 5 (${ex.all.map(fmt).join(', ')})${ex.pages ? `, ${ex.pages} PDF pages` : ''}; target < 5 s`);
const big = timeRuns(syntheticStudy(2000), 3);
console.log(`synthetic 2,000-event study with diagrams: median ${fmt(big.median)} of 3 (${big.all.map(fmt).join(', ')})${big.pages ? `, ${big.pages} PDF pages` : ''}; target < 20 s`);
