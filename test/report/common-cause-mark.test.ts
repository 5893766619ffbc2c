import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { buildViewModel, renderHtml } from '../../src/report/index.js';
import { readStudy } from '../../src/study/read.js';

describe('logic diagrams mark common-cause members', () => {
  it('draws every member of a group with the CCF mark and its group, and no other event', () => {
    const study = readStudy('example-study');
    expect(study.commonCause.length).toBeGreaterThan(0);
    const results = analyze(study);
    const html = renderHtml(buildViewModel(results, study.files, { paper: 'a4' }));
    const marked = new Set([...html.matchAll(/data-node="([^"]+)"[^>]*data-common-cause="([^"]+)"/g)].map((m) => `${m[1]}@${m[2]}`));
    const expected = new Set(study.commonCause.flatMap((g) => g.members.map((m) => `${m}@${g.id}`)));
    expect(marked).toEqual(expected);
  });
});
