/**
 * Writes one of the studies that stress the logic diagrams (INVENTED; see
 * test/report/stress-studies.ts), for measuring `run` on them:
 *
 *   npx tsx bench/diagram-stress-study.ts chain 5000 DIR    # a chain of 5,000 gates
 *   npx tsx bench/diagram-stress-study.ts wide 10000 DIR    # one OR gate of 10,000 inputs
 *   npx tsx bench/diagram-stress-study.ts titles 0 DIR      # titles with markup characters
 */
import { writeChainStudy, writeMarkupTitleStudy, writeWideStudy } from '../test/report/stress-studies.js';

const [kind, n, dir] = process.argv.slice(2);
if (!kind || !dir || !['chain', 'wide', 'titles'].includes(kind)) {
  console.error('usage: npx tsx bench/diagram-stress-study.ts chain|wide|titles N DIR');
  process.exit(2);
}
if (kind === 'chain') writeChainStudy(dir, Number(n));
else if (kind === 'wide') writeWideStudy(dir, Number(n));
else writeMarkupTitleStudy(dir);
