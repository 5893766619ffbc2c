/**
 * Everything the command prints passes through here, so text that comes from a study or an archive
 * (titles, ids, file names, messages quoting them) cannot drive the terminal: control characters
 * are shown as `\uXXXX` instead of being obeyed. An escape sequence in an archived title could
 * otherwise erase lines or print a fake "ok"; a right-to-left override could make an id read
 * backwards. `\uXXXX` is also a valid escape inside a JSON string, so JSON printed to stdout stays
 * JSON with the same meaning.
 */
import type { Io } from './io.js';

/**
 * C0 controls but tab and line feed, DEL, C1 controls, and the bidirectional formatting characters
 * (Unicode Standard Annex #9: LRM, RLM, ALM, LRE…RLO, LRI…PDI), plus line and paragraph separators.
 */
const UNSAFE = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;

/** The one sequence faultbook itself sends: carriage return and "erase line", for the progress bar. */
const OWN_ERASE = '\r\x1b[2K';

export function escapeForTerminal(text: string): string {
  return text
    .split(OWN_ERASE)
    .map((part) => part.replace(UNSAFE, (c) => `\\u${c.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}`))
    .join(OWN_ERASE);
}

/** The same Io with every write escaped. */
export function terminalIo(io: Io): Io {
  return {
    stdout: (text) => io.stdout(escapeForTerminal(text)),
    stderr: (text) => io.stderr(escapeForTerminal(text)),
    isTTY: io.isTTY,
  };
}
