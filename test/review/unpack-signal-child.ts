/**
 * Child process for unpack.test.ts: unpacks one file into a temporary folder, prints the folder,
 * then sends itself the signal named on the command line. If the folder's signal handler did not
 * end the process, it says so and exits 0 (which the test counts as a failure).
 */
import { unpackToTemp } from '../../src/review/unpack.js';

const signal = process.argv[2] as NodeJS.Signals;
const unpacked = unpackToTemp([{ path: 'faultbook-archive/study/study.yaml', data: Buffer.from('title: x\n') }]);
process.stdout.write(`${unpacked.dir}\n`);
process.kill(process.pid, signal);
setTimeout(() => {
  process.stdout.write('still running\n');
  process.exit(0);
}, 3000);
