/**
 * Small studies written by the tests themselves (every value INVENTED for the test; no real
 * equipment or data), read through the real reader so the analysis sees what a user's study gives.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { tempDir } from '../temp.js';
import { readStudy } from '../../src/study/read.js';
import type { Study } from '../../src/study/types.js';

export interface StudyText {
  /** YAML of events.yaml (classes:, events:). */
  events: string;
  /** YAML of logic.yaml (tops:, gates:, scenarios:). */
  logic: string;
  /** Lines under `settings:` in study.yaml, already indented by two spaces. */
  settings?: string;
  as_of?: string;
  /** Further files, path inside the study → text (e.g. life data under data/). */
  files?: Record<string, string>;
}

export function writeStudy(parts: StudyText): string {
  const dir = tempDir('faultbook-analysis-');
  writeFileSync(
    join(dir, 'study.yaml'),
    [
      'format: faultbook/1',
      'title: Test study (invented)',
      'facility: Test facility (invented)',
      'revision: A',
      'status: draft',
      'prepared_by: [Tester (invented)]',
      'reviewed_by: []',
      `as_of: ${parts.as_of ?? '2026-06-30'}`,
      'settings:',
      parts.settings ?? '  samples: 2000\n  seed: 7\n  horizon: 5',
      '',
    ].join('\n'),
  );
  writeFileSync(join(dir, 'logic.yaml'), parts.logic);
  writeFileSync(join(dir, 'events.yaml'), parts.events);
  writeFileSync(join(dir, 'sources.yaml'), 'sources:\n  test-data:\n    title: Invented test data\n    invented: true\n');
  for (const [rel, text] of Object.entries(parts.files ?? {})) {
    mkdirSync(dirname(join(dir, rel)), { recursive: true });
    writeFileSync(join(dir, rel), text);
  }
  return dir;
}

export function studyOf(parts: StudyText): Study {
  return readStudy(writeStudy(parts));
}

/** Probability of a Boolean function of independent events by enumerating all 2^n states (the brute-force oracle). */
export function enumerate(p: readonly number[], top: (x: readonly boolean[]) => boolean): number {
  const n = p.length;
  let total = 0;
  const x = new Array<boolean>(n).fill(false);
  for (let s = 0; s < 1 << n; s++) {
    let w = 1;
    for (let i = 0; i < n; i++) {
      x[i] = ((s >> i) & 1) === 1;
      w *= x[i] ? p[i]! : 1 - p[i]!;
    }
    if (top(x)) total += w;
  }
  return total;
}
