/**
 * Small studies for the shared-causes tests, every value INVENTED for the test. They are read and
 * analysed through the real reader and analysis, so the tests see what a user's study gives.
 */
import { analyze } from '../../src/analysis/analyze.js';
import type { Results } from '../../src/analysis/results.js';
import type { Study } from '../../src/study/types.js';
import { enumerate, studyOf, type StudyText } from '../analysis/helpers.js';

export { enumerate, studyOf };

/** Settings that keep the drivers stage (uncertainty, forecast) short: these tests do not look at it. */
export const QUICK = '  samples: 0\n  horizon: 0\n  cutoff: 0\n  max_order: 12';

export function run(parts: StudyText): { study: Study; results: Results } {
  const study = studyOf({ settings: QUICK, ...parts });
  return { study, results: analyze(study) };
}

/** A `fixed` event line for events.yaml. */
export function fixed(id: string, p: number): string {
  return `  ${id}: { title: ${id} (invented), model: fixed, probability: { value: ${p}, source: test-data } }`;
}

export function eventsYaml(events: [string, number][]): string {
  return ['events:', ...events.map(([id, p]) => fixed(id, p))].join('\n') + '\n';
}

/** Relative difference, safe at zero. */
export function rel(a: number, b: number): number {
  const scale = Math.max(Math.abs(a), Math.abs(b));
  return scale === 0 ? 0 : Math.abs(a - b) / scale;
}
