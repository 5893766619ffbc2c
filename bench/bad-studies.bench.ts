/**
 * How fast each study of the bad-input corpus (test/bad-studies) is refused, in process, against
 * the 2 s target of the hardening work. Prints the slowest cases; never fails on a timing.
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { main } from '../src/cli/main.js';

const corpus = join(process.cwd(), 'test', 'bad-studies');
const cases = readdirSync(corpus, { withFileTypes: true }).filter((d) => d.isDirectory()).map((d) => d.name).sort();
const times: { name: string; ms: number; code: number }[] = [];
for (const name of cases) {
  const t0 = performance.now();
  const code = await main(['run', join(corpus, name), '--format', 'json', '--out', join(process.cwd(), 'bench', 'out', 'bad-studies')], {
    stdout: () => {},
    stderr: () => {},
    isTTY: false,
  });
  times.push({ name, ms: performance.now() - t0, code });
}
times.sort((a, b) => b.ms - a.ms);
const over = times.filter((t) => t.ms >= 2000).length;
console.log(`${times.length} bad studies refused; slowest ${times[0]!.ms.toFixed(0)} ms, median ${times[Math.floor(times.length / 2)]!.ms.toFixed(0)} ms; ${over} at or over the 2 s target`);
for (const t of times.slice(0, 5)) console.log(`  ${t.name.padEnd(40)} ${t.ms.toFixed(0).padStart(6)} ms  exit ${t.code}`);
