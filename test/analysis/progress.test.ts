// The terminal progress bar (src/cli/progress.ts) with a fake clock: silent off a terminal, with
// --quiet and for short runs; drawn on one line and erased at the end for long ones
// (common practice, no source: the behaviour the issue asks for).
import { describe, expect, it } from 'vitest';
import { createProgress } from '../../src/cli/progress.js';

function harness(isTTY: boolean, quiet: boolean) {
  let now = 0;
  let out = '';
  const p = createProgress({ isTTY, quiet, write: (t) => (out += t), now: () => now });
  /** Reports `steps` updates of a run of `total`, `ms` apart. */
  const runFor = (total: number, steps: number, ms: number) => {
    for (let k = 1; k <= steps; k++) {
      now += ms;
      p.update('Monte Carlo', Math.round((k * total) / steps), total);
    }
    p.finish();
  };
  return { runFor, output: () => out };
}

describe('progress bar', () => {
  it('draws nothing when stderr is not a terminal, or with --quiet, however long the run', () => {
    for (const [tty, quiet] of [[false, false], [true, true], [false, true]] as const) {
      const h = harness(tty, quiet);
      h.runFor(100_000, 100, 50);
      expect(h.output()).toBe('');
    }
  });

  it('draws nothing for a run well under a second', () => {
    const h = harness(true, false);
    h.runFor(20_000, 20, 10); // 200 ms in all
    expect(h.output()).toBe('');
  });

  it('draws a bar with percentage and counts for a long run, then erases its line', () => {
    const h = harness(true, false);
    h.runFor(100_000, 100, 40); // 4 s in all
    const out = h.output();
    expect(out).toContain('Monte Carlo [');
    expect(out).toMatch(/\d+% [\d,]+ \/ 100,000/);
    expect(out).toContain('s left');
    expect(out.endsWith('\r\x1b[2K')).toBe(true);
    expect(out).not.toContain('\n');
    // At most ten redraws a second: 4 s → about 40 draws, not 100.
    const draws = out.split('Monte Carlo [').length - 1;
    expect(draws).toBeLessThanOrEqual(45);
    expect(draws).toBeGreaterThan(5);
  });
});
