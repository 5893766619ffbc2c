/**
 * A progress bar on stderr for long analyses (the Monte Carlo trials), without a dependency.
 *
 * Shown only where a person watches: stderr is a terminal and --quiet was not given. It appears
 * only for work that will take more than about a second — once a quarter of a second has passed
 * and the projected total is over a second, or once a second has passed in any case — so a quick
 * run prints nothing. Redrawn at most ten times a second on one line (carriage return), and the
 * line is erased when the work is done, so the terminal is left as it was found.
 */

export interface ProgressOptions {
  /** Whether stderr is a terminal. */
  isTTY: boolean;
  quiet: boolean;
  write: (text: string) => void;
  /** Milliseconds from some fixed origin (the command passes performance.now). */
  now: () => number;
}

export interface Progress {
  /** The analysis's progress callback: what, how far, out of how many. */
  update(label: string, done: number, total: number): void;
  /** Erase the bar if one was drawn. */
  finish(): void;
}

const BAR_WIDTH = 28;
const REDRAW_MS = 100;
const PEEK_MS = 250;
const LONG_MS = 1000;

export function createProgress(options: ProgressOptions): Progress {
  if (!options.isTTY || options.quiet) return { update() {}, finish() {} };
  let label: string | undefined;
  // The first report of the current label: the rate is measured from here.
  let t0 = 0;
  let d0 = 0;
  let shown = false;
  let lastDraw = -Infinity;

  const draw = (done: number, total: number, t: number): void => {
    const fraction = total > 0 ? Math.min(1, done / total) : 1;
    const filled = Math.round(fraction * BAR_WIDTH);
    const rate = done > d0 ? (done - d0) / (t - t0) : 0;
    const left = rate > 0 ? (total - done) / rate / 1000 : NaN;
    const eta = Number.isFinite(left) && done < total ? `, about ${left < 10 ? left.toFixed(1) : Math.round(left)} s left` : '';
    const count = `${done.toLocaleString('en-US')} / ${total.toLocaleString('en-US')}`;
    options.write(`\r\x1b[2K${label} [${'#'.repeat(filled)}${'-'.repeat(BAR_WIDTH - filled)}] ${Math.floor(fraction * 100)}% ${count}${eta}`);
    shown = true;
    lastDraw = t;
  };

  return {
    update(what, done, total) {
      const t = options.now();
      if (what !== label) {
        if (shown) options.write('\r\x1b[2K');
        label = what;
        t0 = t;
        d0 = done;
        shown = false;
        lastDraw = -Infinity;
        return;
      }
      if (!shown) {
        if (done >= total) return;
        const elapsed = t - t0;
        const projected = done > d0 ? (elapsed * (total - d0)) / (done - d0) : Infinity;
        if (!(elapsed >= LONG_MS || (elapsed >= PEEK_MS && projected >= LONG_MS))) return;
      }
      if (t - lastDraw >= REDRAW_MS || done >= total) draw(done, total, t);
    },
    finish() {
      if (shown) options.write('\r\x1b[2K');
      shown = false;
    },
  };
}
