/**
 * Reading a large study: `readStudy` (YAML, schema, building the typed study, lint) on the invented
 * gate family at 400/20 (bench/gate-family.ts, 4,440 basic events and 2,641 gates), from dist/ in a
 * fresh process: the first call (cold: nothing compiled yet, as in a command) and the median of five
 * more (warm); then `faultbook check` on the same study as a whole process, best and median of five.
 * Prints figures; never fails on a timing. `npm run build` first (`npm run bench` does).
 *
 *   node bench/run.js read-study
 *   FAULTBOOK_ROOT=/path/to/other/checkout node --import tsx bench/read-study.bench.ts   (another build, same study)
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { gateFamilyStudy } from './gate-family.js';

const root = process.env.FAULTBOOK_ROOT ?? join(dirname(fileURLToPath(import.meta.url)), '..');
if (!existsSync(join(root, 'dist', 'study', 'read.js'))) {
  console.log('dist/ is missing: run `npm run build` first (npm run bench does)');
  process.exit(0);
}

const dir = mkdtempSync(join(tmpdir(), 'faultbook-read-study-'));
try {
  for (const [name, text] of Object.entries(gateFamilyStudy({ gates: 400, atLeast: 20 }))) writeFileSync(join(dir, name), text);
  const script = `
    const { readStudy } = await import(${JSON.stringify(pathToFileURL(join(root, 'dist', 'study', 'read.js')).href)});
    const time = () => { const t0 = performance.now(); readStudy(${JSON.stringify(dir)}); return performance.now() - t0; };
    const cold = time();
    const warm = Array.from({ length: 5 }, time).sort((a, b) => a - b)[2];
    console.log(JSON.stringify({ cold, warm }));`;
  const colds: number[] = [];
  const warms: number[] = [];
  for (let i = 0; i < 3; i++) {
    const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(r.stderr);
    const { cold, warm } = JSON.parse(r.stdout) as { cold: number; warm: number };
    colds.push(cold);
    warms.push(warm);
  }
  const best = (xs: number[]) => Math.min(...xs);
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
  console.log(`readStudy, gate family 400/20 (4,440 events, 2,641 gates): cold ${best(colds).toFixed(0)} ms best / ${median(colds).toFixed(0)} ms median of 3 processes; warm ${median(warms).toFixed(0)} ms`);
  const checks: number[] = [];
  for (let i = 0; i < 5; i++) {
    const t0 = performance.now();
    const r = spawnSync(process.execPath, [join(root, 'bin', 'faultbook.js'), 'check', dir], { encoding: 'utf8' });
    checks.push((performance.now() - t0) / 1000);
    if (r.status !== 0) console.log(`  check exit ${r.status}: ${r.stderr.split('\n')[0]}`);
  }
  console.log(`faultbook check, same study, whole process: ${best(checks).toFixed(2)} s best / ${median(checks).toFixed(2)} s median of 5`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
