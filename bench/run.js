#!/usr/bin/env node
// Runs every bench/*.bench.ts in turn (through tsx) and lets each print its own figures.
// Benchmarks measure; they never fail on a timing. Pass names to run only some: `npm run bench -- logic`.
import { readdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const wanted = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => wanted.length === 0 || wanted.some((w) => f.includes(w)))
  .sort();
let failed = 0;
for (const file of files) {
  console.log(`\n=== ${file}`);
  const r = spawnSync(process.execPath, ['--import', 'tsx', '--expose-gc', join(here, file)], { stdio: 'inherit' });
  if (r.status !== 0) failed += 1;
}
process.exitCode = failed ? 1 : 0;
