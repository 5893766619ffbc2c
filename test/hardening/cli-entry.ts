/**
 * The `faultbook` command as a real process, straight from the sources (run with `node --import tsx`),
 * so the child-process tests need no build. Mirrors bin/faultbook.js, which runs the built dist/.
 */
import { main } from '../../src/cli/main.js';

process.exitCode = await main(process.argv.slice(2), {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  isTTY: Boolean(process.stderr.isTTY),
});
