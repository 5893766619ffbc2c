/** Terminal output shared by the commands. */
import type { Io } from './io.js';

/** A warning of the study or of the results (the latter give a line but no column). */
export interface PrintableWarning {
  code: string;
  message: string;
  at?: { file: string; line: number; col?: number };
}

/** More warnings of one code than this print as one line with the count and the first few ids. */
export const WARNING_FLOOD = 5;
const FIRST_FEW = 3;

/**
 * Warnings on stderr, one line each, except that a code with more than WARNING_FLOOD of them
 * (4,400 "cites no source" on a large model) becomes one line with the count and the first few
 * ids, where the first one stands. `all` prints every one (`faultbook check --all`).
 */
export function printWarnings(warnings: readonly PrintableWarning[], io: Io, options: { all?: boolean } = {}): void {
  const byCode = new Map<string, PrintableWarning[]>();
  for (const w of warnings) byCode.set(w.code, [...(byCode.get(w.code) ?? []), w]);
  const done = new Set<string>();
  for (const w of warnings) {
    const same = byCode.get(w.code)!;
    if (options.all || same.length <= WARNING_FLOOD) {
      const where = w.at ? `${w.at.file}:${w.at.line}${w.at.col !== undefined ? `:${w.at.col}` : ''}: ` : '';
      io.stderr(`warning: ${where}${w.message} [${w.code}]\n`);
      continue;
    }
    if (done.has(w.code)) continue;
    done.add(w.code);
    const ids = same.slice(0, FIRST_FEW).map((x) => /'[^']+'/.exec(x.message)?.[0] ?? x.message);
    io.stderr(`warning: ${same.length} warnings [${w.code}], e.g. ${ids.join(', ')} …; \`faultbook check --all\` lists every one\n`);
  }
}

// Probabilities print on the terminal exactly as the appendix prints them.
export { formatProbability } from '../report/format.js';
