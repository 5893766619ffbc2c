/**
 * The life-data fits as results: estimates, bounds, goodness of fit, the plotting positions and the
 * fitted line with its bounds on F(t), so the report can draw a Weibull probability plot without
 * computing anything.
 */
import { weibullCdfBounds } from '../reliability/fit/index.js';
import { fitProvenance } from '../study/fits.js';
import type { AnalysisContext } from './analyze.js';
import type { FitResult, Results } from './results.js';

/** Points on the fitted line: enough for a smooth curve on log-log paper. */
const CURVE_POINTS = 41;

export function fitsStage(ctx: AnalysisContext): Partial<Results> {
  const fits = ctx.study.fits.filter((f) => f.result);
  if (fits.length === 0) return {};
  const out: FitResult[] = fits.map((f) => {
    const r = f.result!;
    const lives = r.plot.points.map((p) => p.t);
    const lo = Math.max(Math.min(...lives, r.scale) / 4, 1e-6);
    const hi = Math.max(...lives, r.scale) * 2;
    const curve = Array.from({ length: CURVE_POINTS }, (_, i) => {
      const t = lo * Math.pow(hi / lo, i / (CURVE_POINTS - 1));
      const b = weibullCdfBounds(r, t, r.bounds.level);
      return { t, F: b.F, lower: b.lower, upper: b.upper };
    });
    const fb = r.bounds.fisher;
    const gof: Record<string, number | string | boolean> = { anderson_darling: r.gof.andersonDarling, note: r.gof.note };
    if (r.gof.adjusted !== undefined) gof.adjusted = r.gof.adjusted;
    if (r.gof.critical05 !== undefined) gof.critical_05 = r.gof.critical05;
    if (r.gof.rejected05 !== undefined) gof.rejected_05 = r.gof.rejected05;
    if (r.gof.rSquared !== undefined) gof.r_squared = r.gof.rSquared;
    const result: FitResult = {
      id: f.id,
      data: f.data,
      method: f.method,
      provenance: fitProvenance(f),
      rows: f.rows ?? r.n,
      n: r.n,
      failures: r.failures,
      suspensions: r.suspensions,
      shape: r.shape,
      scale: r.scale,
      b10: r.b10,
      level: r.bounds.level,
      bounds: {
        shape: { lower: fb.shape.lower, upper: fb.shape.upper },
        scale: { lower: fb.scale.lower, upper: fb.scale.upper },
        b10: { lower: fb.b10.lower, upper: fb.b10.upper },
      },
      covariance_log: [[...r.covarianceLog[0]], [...r.covarianceLog[1]]],
      log_likelihood: r.logLikelihood,
      goodness_of_fit: gof,
      points: r.plot.points.map((p) => ({ t: p.t, F: p.F })),
      curve,
      warnings: [...r.warnings],
      used_by: ctx.study.parameters.filter((p) => p.fit === f.id).map((p) => p.key),
    };
    if (f.group) result.group = f.group;
    if (f.source) result.source = f.source;
    if (f.note) result.note = f.note;
    if (r.location !== undefined) result.location = r.location;
    return result;
  });
  return { fits: out };
}
