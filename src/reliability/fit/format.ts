/**
 * A fit as a plain-text table for the terminal. Numbers to 4 significant figures: the data never
 * support more, and fixed width keeps the columns aligned.
 */
import type { Bound } from './bounds.js';
import type { WeibullFit } from './fit-weibull.js';

function sig(x: number | undefined): string {
  if (x === undefined || !Number.isFinite(x)) return '—';
  const a = Math.abs(x);
  if (a !== 0 && (a >= 1e6 || a < 1e-3)) return x.toExponential(3);
  return x.toPrecision(4);
}

function percent(p: number): string {
  return `${Number((p * 100).toPrecision(6))}%`;
}

function table(rows: string[][]): string[] {
  const widths = rows[0]!.map((_, c) => Math.max(...rows.map((r) => r[c]!.length)));
  return rows.map((r) =>
    r
      .map((cell, c) => (c === 0 ? cell.padEnd(widths[c]!) : cell.padStart(widths[c]!)))
      .join('  ')
      .trimEnd(),
  );
}

/** `unit` names the unit of life shown beside scale, location and B10 (e.g. `years`); optional. */
export function formatFit(fit: WeibullFit, unit?: string): string {
  const method = fit.method === 'mle' ? 'maximum likelihood' : 'median-rank regression (life on rank)';
  const params = fit.location !== undefined ? 3 : 2;
  const u = unit ? ` (${unit})` : '';
  const lvl = percent(fit.bounds.level);
  const lr = fit.bounds.likelihoodRatio;
  const bound = (b: Bound | undefined): [string, string] => [sig(b?.lower), sig(b?.upper)];
  const header = ['', 'estimate', `normal-approx. lower ${lvl}`, `normal-approx. upper ${lvl}`];
  if (lr) header.push(`LR lower ${lvl}`, `LR upper ${lvl}`);
  // Likelihood-ratio columns: '—' where a bound is not finite, blank where none is computed (B10).
  const row = (name: string, value: number, fisher: Bound, lrCells: [string, string] = ['', '']): string[] => {
    const cells = [name, sig(value), ...bound(fisher)];
    if (lr) cells.push(...lrCells);
    return cells;
  };
  const rows: string[][] = [
    header,
    row('shape β', fit.shape, fit.bounds.fisher.shape, bound(lr?.shape)),
    row(`scale η${u}`, fit.scale, fit.bounds.fisher.scale, bound(lr?.scale)),
  ];
  if (fit.location !== undefined) {
    const cells = [`location γ${u}`, sig(fit.location), '', ''];
    if (lr) cells.push('', '');
    rows.push(cells);
  }
  rows.push(row(`B10 life${u}`, fit.b10, fit.bounds.fisher.b10));

  const lines = [
    `Weibull fit, ${params} parameters, ${method}`,
    `${fit.n} lives: ${fit.failures} failures, ${fit.suspensions} suspensions`,
    '',
    ...table(rows),
    '',
    `Bounds are each one-sided at ${lvl} (together a two-sided ${percent(2 * fit.bounds.level - 1)} interval): normal-approximation (Fisher information) bounds${lr ? ' and likelihood-ratio (LR) bounds' : ''}.`,
    `log-likelihood ${sig(fit.logLikelihood)}`,
  ];
  const g = fit.gof;
  if (g.adjusted !== undefined && g.critical05 !== undefined) {
    lines.push(
      `Anderson–Darling A² ${sig(g.andersonDarling)}, A*² ${sig(g.adjusted)} vs 5% critical ${g.critical05}: ${g.rejected05 ? 'Weibull rejected' : 'not rejected'}`,
    );
  } else {
    lines.push(`Anderson–Darling A² ${sig(g.andersonDarling)} (for comparing fits; no significance level for this case)`);
  }
  if (g.rSquared !== undefined) lines.push(`Weibull plot r² ${g.rSquared.toFixed(4)}`);
  if (fit.locationTest) {
    lines.push(`location test: likelihood-ratio statistic ${sig(fit.locationTest.statistic)} (5% critical ${sig(fit.locationTest.critical05)})`);
  }
  if (fit.warnings.length > 0) {
    lines.push('', 'Warnings:', ...fit.warnings.map((w) => `  - ${w}`));
  }
  return `${lines.join('\n')}\n`;
}
