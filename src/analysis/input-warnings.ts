/**
 * Warnings about the inputs that show only once the numbers are worked out: a model value capped at
 * 1 (or degenerate), common-cause members that are not alike, an uncertainty no trial samples.
 * `run` puts them in results.json (the stages add theirs as they go); `check` lists the same ones
 * from here without running the analysis, so the two commands never disagree about a study.
 */
import { modelCapNote } from '../reliability/models/index.js';
import type { Study } from '../study/types.js';
import { ageInCase, baseCase, fieldValue } from './case.js';
import { evaluateEvents, studyValues, type EventEvaluation } from './event-probability.js';
import { parametersSampled } from './event-plan.js';
import { buildLogicModel } from './logic-model.js';
import type { Results } from './results.js';
import { ParameterSampler } from './sampling.js';
import { unequalTotalsWarning } from './shared-cause-stage.js';

type ResultsWarning = Results['warnings'][number];

/** One `probability-capped` warning per base-case event whose model capped its value or hit a degenerate point. */
export function capWarnings(study: Study, evaluation: EventEvaluation): ResultsWarning[] {
  const c = baseCase();
  const values = studyValues(study);
  const out: ResultsWarning[] = [];
  study.events.forEach((e, i) => {
    const fields: Record<string, number> = {};
    for (const field of Object.keys(e.fields)) fields[field] = fieldValue(e, field, c, values)!;
    const age = ageInCase(study, e, c);
    const note = modelCapNote(e.model, fields, { ...(age !== undefined ? { ageYears: age } : {}) });
    if (note) {
      out.push({
        code: 'probability-capped',
        message: `event '${e.id}' (${e.model} model) has probability ${evaluation.total[i]}: ${note}`,
        at: { file: e.at.file, line: e.at.line },
      });
    }
  });
  return out;
}

/** The `uncertainty-not-sampled` warning for one held parameter. */
export function notSampledWarning(study: Study, held: { key: string; reason: string }): ResultsWarning {
  const at = study.parameters.find((p) => p.key === held.key)!.at;
  return { code: 'uncertainty-not-sampled', message: `the uncertainty of '${held.key}' is not sampled: ${held.reason}`, at: { file: at.file, line: at.line } };
}

/** Every warning the analysis would add about this study's inputs, in the order `run` adds them. */
export function analysisInputWarnings(study: Study): ResultsWarning[] {
  const evaluation = evaluateEvents(study, baseCase());
  const out = capWarnings(study, evaluation);
  const expansion = buildLogicModel(study).commonCause;
  const values = studyValues(study);
  for (const layout of expansion.groups) {
    const nums = expansion.numbers(layout, evaluation.total, values);
    const w = unequalTotalsWarning(layout.group, nums.totals, nums.reference);
    if (w) out.push(w);
  }
  for (const h of new ParameterSampler(study, parametersSampled(study)).held) out.push(notSampledWarning(study, h));
  return out;
}
