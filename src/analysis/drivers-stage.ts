/**
 * The stage after the point estimate that answers a reviewer's next questions: what drives the
 * number (class importance, sensitivity), what if (scenarios) and how it moves with age
 * (forecast); how sure it is (uncertainty) is its own stage, after the shared causes. All of it reuses the base case's decision diagram through one
 * `CaseQuantifier`; only scenarios that flip switches compile another.
 */
import type { Results } from './results.js';
import type { Stage } from './analyze.js';
import { baseCase } from './case.js';
import { CaseQuantifier } from './case-quantifier.js';
import { forecast } from './forecast.js';
import { classImportance } from './importance-classes.js';
import { scenarios } from './scenarios.js';
import { sensitivity } from './sensitivity.js';

export const driversStage: Stage = (ctx) => {
  const { study } = ctx;
  const quantifier = new CaseQuantifier(study, ctx.model, ctx.compiled);
  const { evaluator } = quantifier.diagram(baseCase());
  const base = evaluator.evaluate(ctx.base.probability);
  const out: Partial<Results> = {};

  const classes = classImportance(study, evaluator, ctx.base.probability, ctx.compiled.negationFree);
  if (classes.some((list) => list.length > 0)) {
    out.tops = ctx.results.tops.map((t, i) => ({ ...t, class_importance: classes[i]! }));
  }
  out.sensitivity = sensitivity(study, quantifier, base);
  if (study.scenarios.length > 0) out.scenarios = scenarios(study, quantifier, base);
  out.forecast = forecast(study, quantifier);
  return out;
};
