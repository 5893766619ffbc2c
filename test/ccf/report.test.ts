/**
 * The appendix sections of the shared-causes analysis, on a small INVENTED study: each section is
 * present when its results are, its numbers are the results' numbers as the report formats them
 * (no recomputation), the event-tree figure draws one row per sequence, and the closing notes say
 * how far the independent answers are from the exact ones. The figures' own numbers come from the
 * analysis, checked in the other tests of this folder.
 */
import { describe, expect, it } from 'vitest';
import { buildViewModel } from '../../src/report/index.js';
import { formatProbability } from '../../src/report/format.js';
import type { CalloutBlock, FigureBlock, TableBlock } from '../../src/report/view.js';
import { section } from '../report/helpers.js';
import { eventsYaml, run } from './helpers.js';

const LOGIC = `tops:
  two-stuck: { title: Two or more gates stuck (invented), gate: two }
gates:
  two: { atleast: 2, of: [g1, g2, g3] }
  g1: { any: [power, m1] }
  g2: { any: [power, m2] }
  g3: { any: [power, m3] }
common_cause:
  motors: { title: Motors (invented), members: [m1, m2, m3], method: alpha, alpha1: 0.9, alpha2: 0.06, alpha3: 0.04 }
counts:
  stuck: { title: Gates stuck (invented), of: [g1, g2, g3] }
event_trees:
  flood:
    title: Flood (invented)
    load:
      title: Inflow (invented)
      ranges:
        small: { title: small floods, aep: [0.1, 0.01] }
        large: { title: large floods, aep: [0.01, 0.001] }
    headings:
      enough: { title: Enough gates, fails: { atleast: { small: 3, large: 2 }, of: stuck } }
      holds: { title: Crest holds, fails: { by_range: { small: 0.1, large: 0.3 } } }
    outcomes:
      safe: { title: Safe }
      wet: { title: Overtopping }
      breach: { title: Breach }
    sequences:
      - { when: { enough: works }, outcome: safe }
      - { when: { enough: fails, holds: works }, outcome: wet }
      - { when: { enough: fails, holds: fails }, outcome: breach }
failure_modes:
  dam:
    title: Dam (invented)
    load: flood
    modes:
      overtop: { outcome: breach }
      piping: { by_range: { small: 0.001, large: 0.01 } }
`;

describe('shared-causes sections of the appendix', () => {
  const { study, results } = run({ events: eventsYaml([['power', 0.01], ['m1', 0.05], ['m2', 0.05], ['m3', 0.05]]), logic: LOGIC });
  const view = buildViewModel(results, study.files, { paper: 'a4' });

  it('lists the group, its method and every shared event with its probability', () => {
    const s = section(view, 'sec-common-cause')!;
    expect(s.title).toBe('Common-cause failures');
    const events = s.blocks.find((b): b is TableBlock => b.kind === 'table' && b.caption.startsWith('Shared'))!;
    const g = results.common_cause![0]!;
    expect(events.rows.map((r) => r.cells[0])).toEqual(g.shared.map((x) => x.id));
    expect(events.rows.map((r) => r.cells[2])).toEqual(g.shared.map((x) => formatProbability(x.probability)));
    expect(JSON.stringify(s.blocks)).toContain('alpha factor, non-staggered testing');
  });

  it('shows the count distribution both ways and closes with the gap', () => {
    const s = section(view, 'sec-gate-counts')!;
    const c = results.gate_counts![0]!;
    const t = s.blocks.find((b): b is TableBlock => b.kind === 'table' && b.caption.startsWith('Number'))!;
    expect(t.rows.map((r) => r.cells[1])).toEqual(c.exact.map((x) => formatProbability(x)));
    expect(t.rows.map((r) => r.cells[2])).toEqual(c.independent.map((x) => formatProbability(x)));
    const note = s.blocks.find((b): b is CalloutBlock => b.kind === 'callout')!;
    const text = note.paragraphs.flat().map((r) => r.text).join('');
    expect(text).toContain(`${formatProbability(c.at_least.exact[3])} exactly, against ${formatProbability(c.at_least.independent[3])}`);
    expect(s.blocks.some((b) => b.kind === 'figure')).toBe(true);
  });

  it('draws the event tree with one row per sequence and tabulates outcomes and modes', () => {
    const s = section(view, 'sec-event-trees')!;
    const tree = results.event_trees![0]!;
    const fig = s.blocks.find((b): b is FigureBlock => b.kind === 'figure')!;
    const svg = fig.parts[0]!.svg;
    for (const q of tree.sequences) expect(svg).toContain(`>${q.id}<`);
    // Branch segments: one horizontal lead-in, then per asked branch point a horizontal and a drop, and a run-out per sequence.
    expect((svg.match(/<line /g) ?? []).length).toBeGreaterThanOrEqual(tree.sequences.length);
    const outcomes = s.blocks.find((b): b is TableBlock => b.kind === 'table' && b.caption.startsWith('Outcomes'))!;
    expect(outcomes.rows.map((r) => r.cells[2])).toEqual(tree.outcomes.map((o) => formatProbability(o.probability)));
    const modes = s.blocks.find((b): b is TableBlock => b.kind === 'table' && b.caption.startsWith('Failure modes'))!;
    const f = results.failure_modes![0]!;
    expect(modes.rows.at(-1)!.cells.at(-2)).toBe(formatProbability(f.annual.upper));
    // The combination rule is cited once, in the methods annex the section points to.
    expect(JSON.stringify(section(view, 'sec-methods')!.blocks)).toContain('Hill, D.');
    expect(JSON.stringify(s.blocks)).toContain('"link":"method-failure-modes"');
  });

  it('leaves the sections out for a study without shared causes', () => {
    const plain = run({ events: eventsYaml([['a', 0.1]]), logic: 'tops:\n  t: { title: t, gate: g }\ngates:\n  g: { any: [a] }\n' });
    const v = buildViewModel(plain.results, plain.study.files, { paper: 'a4' });
    expect(section(v, 'sec-common-cause')).toBeUndefined();
    expect(section(v, 'sec-gate-counts')).toBeUndefined();
    expect(section(v, 'sec-event-trees')).toBeUndefined();
  });
});
