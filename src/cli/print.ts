/** Terminal output shared by the commands. */
import type { Warning } from '../study/types.js';
import type { Io } from './io.js';

export function printWarnings(warnings: Warning[], io: Io): void {
  for (const w of warnings) {
    const where = w.at ? `${w.at.file}:${w.at.line}:${w.at.col}: ` : '';
    io.stderr(`warning: ${where}${w.message} [${w.code}]\n`);
  }
}

// Probabilities print on the terminal exactly as the appendix prints them.
export { formatProbability } from '../report/format.js';
