/**
 * Times `faultbook run` on each case of test/hardening/hostile-studies.ts and prints exit code,
 * seconds and peak memory (GNU time). Usage: npx tsx scripts/hostile-measure.ts [BIN] [case…] —
 * BIN defaults to this checkout's bin/faultbook.js (another build's bin measures the "before").
 * Prints figures; asserts nothing.
 */
import { spawnSync } from 'node:child_process';
import { rmSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { HOSTILE_CASES, validCopy } from '../test/hardening/hostile-studies.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const [binArg, ...wanted] = process.argv.slice(2);
const bin = binArg && binArg.endsWith('.js') ? binArg : join(root, 'bin', 'faultbook.js');
const names = [...(binArg && !binArg.endsWith('.js') ? [binArg] : []), ...wanted];
const limit = Number(process.env.HOSTILE_TIMEOUT ?? 150);
for (const [name, make] of Object.entries(HOSTILE_CASES)) {
  if (names.length && !names.includes(name)) continue;
  const study = validCopy();
  make(study);
  const r = spawnSync('/usr/bin/time', ['-f', '%e s %M KB', 'timeout', String(limit), process.execPath, '--max-old-space-size=3072', bin, 'run', study, '--out', join(dirname(study), 'out'), '--quiet'], { encoding: 'utf8' });
  const lines = r.stderr.trim().split('\n');
  const figure = lines.pop();
  const first = lines.find((l) => /error|warning/.test(l))?.slice(0, 160) ?? '';
  console.log(`${name.padEnd(20)} exit ${String(r.status).padEnd(4)} ${figure}  ${first}`);
  rmSync(dirname(study), { recursive: true, force: true });
}
