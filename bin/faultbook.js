#!/usr/bin/env node
// Thin launcher: the command lives in dist/cli (built from src/cli by `npm run build`).
import { main } from '../dist/cli/main.js';

process.exitCode = await main(process.argv.slice(2), {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  isTTY: Boolean(process.stderr.isTTY),
});
