/**
 * Comparing two revisions of a study: what changed in the inputs (study-diff), how the answer
 * changed (results-diff), and what moved it (attribution). The result is plain data: it is
 * comparison.json as it is written, and the only thing the comparison report reads.
 */
import { analyze } from '../analysis/analyze.js';
import type { Results } from '../analysis/results.js';
import { toolVersion } from '../package.js';
import type { Study } from '../study/types.js';
import { attribute, type Attribution } from './attribution.js';
import { diffResults, type ResultsDiff } from './results-diff.js';
import { changeCount, diffStudies, type StudyDiff } from './study-diff.js';

export const COMPARISON_FORMAT = 'faultbook-comparison/1';

export interface RevisionSummary {
  title: string;
  facility: string;
  revision: string;
  status: string;
  as_of: string;
  issued?: string;
  /** The combined hash of the revision's input files (as its results.json records it). */
  inputs_sha256: string;
}

export interface Comparison {
  format: typeof COMPARISON_FORMAT;
  tool: { name: 'faultbook'; version: string };
  old: RevisionSummary;
  new: RevisionSummary;
  /** How many changes of inputs were found (metadata and file hashes not counted). */
  change_count: number;
  changes: StudyDiff;
  results: ResultsDiff;
  attribution: Attribution;
}

export interface ComparedStudies {
  comparison: Comparison;
  oldResults: Results;
  newResults: Results;
}

export function compareStudies(oldStudy: Study, newStudy: Study): ComparedStudies {
  const oldResults = analyze(oldStudy);
  const newResults = analyze(newStudy);
  const changes = diffStudies(oldStudy, newStudy);
  const comparison: Comparison = {
    format: COMPARISON_FORMAT,
    tool: { name: 'faultbook', version: toolVersion },
    old: summary(oldResults),
    new: summary(newResults),
    change_count: changeCount(changes),
    changes,
    results: diffResults(oldResults, newResults),
    attribution: attribute(oldStudy, newStudy, changes, oldResults, newResults),
  };
  return { comparison, oldResults, newResults };
}

function summary(r: Results): RevisionSummary {
  const s = r.study;
  return {
    title: s.title,
    facility: s.facility,
    revision: s.revision,
    status: s.status,
    as_of: s.as_of,
    ...(s.issued ? { issued: s.issued } : {}),
    inputs_sha256: r.inputs.sha256,
  };
}

/** comparison.json text: two-space indented, a final newline; non-finite numbers as strings, as in results.json. */
export function comparisonJson(c: Comparison): string {
  return JSON.stringify(c, (_key, value: unknown) => (typeof value === 'number' && !Number.isFinite(value) ? String(value) : value), 2) + '\n';
}
