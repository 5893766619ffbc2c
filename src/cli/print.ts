/** Terminal output shared by the commands. */
import type { Warning } from '../study/types.js';
import type { Io } from './io.js';

export function printWarnings(warnings: Warning[], io: Io): void {
  for (const w of warnings) {
    const where = w.at ? `${w.at.file}:${w.at.line}:${w.at.col}: ` : '';
    io.stderr(`warning: ${where}${w.message} [${w.code}]\n`);
  }
}

/** A probability for the terminal: three significant figures, exponent form. */
export function formatProbability(p: number): string {
  return p === 0 ? '0' : p.toExponential(2).replace('e', 'E');
}
