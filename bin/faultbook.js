#!/usr/bin/env node
// Thin launcher: the command lives in dist/cli (built from src/cli by `npm run build`).
import { main } from '../dist/cli/main.js';

// A reader that stops early (`faultbook verify x | head`) is not a failure of the command.
for (const stream of [process.stdout, process.stderr]) {
  stream.on('error', (err) => {
    if (err.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw err;
  });
}

process.exitCode = await main(process.argv.slice(2), {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  isTTY: Boolean(process.stderr.isTTY),
});
