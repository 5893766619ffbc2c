import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { applyUnits, unitsOf } from '../../src/review/apply.js';
import { pointTops } from '../../src/review/attribution.js';
import { compareStudies, comparisonJson } from '../../src/review/compare.js';
import { diffStudies, writtenUnit } from '../../src/review/study-diff.js';
import { readStudy } from '../../src/study/read.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { BASE_EVENTS, BASE_LOGIC, baseTops, P, writeStudy } from './studies.js';

/** Relative closeness for values computed two ways (closed form vs decision diagram). */
function expectClose(actual: number, expected: number, rel = 1e-12): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.abs(expected));
}

describe('compare: a study against itself', () => {
  it('shows no changes, no effects and ratios of exactly 1', () => {
    const dir = writeStudy();
    const { comparison: c } = compareStudies(readStudy(dir), readStudy(dir));
    expect(c.change_count).toBe(0);
    expect(c.changes.identical).toBe(true);
    for (const part of Object.values(c.changes.logic)) expect(part).toEqual({ added: [], removed: [], changed: [] });
    expect(c.changes.data.parameters).toEqual({ changed: [], added: [], removed: [] });
    expect(c.changes.data.settings).toEqual([]);
    expect(c.changes.files).toEqual([]);
    expect(c.changes.meta.every((m) => !m.changed)).toBe(true);
    expect(c.attribution.effects).toEqual([]);
    for (const t of c.results.tops) expect(t.ratio).toBe(1);
    for (const cs of c.results.cut_sets) expect([cs.appeared, cs.vanished, cs.moved]).toEqual([[], [], []]);
    for (const imp of c.results.importance) expect(imp.changes).toEqual([]);
    expect(c.attribution.reproduces_new).toBe(true);
  });

  it('counts a new revision letter and date as metadata, not as a change', () => {
    const a = writeStudy({ revision: 'A' });
    const b = writeStudy({ revision: 'B', issued: '2026-03-01' });
    const { comparison: c } = compareStudies(readStudy(a), readStudy(b));
    expect(c.change_count).toBe(0);
    expect(c.changes.meta.filter((m) => m.changed).map((m) => m.field)).toEqual(['revision', 'issued']);
    expect(c.changes.files.map((f) => [f.path, f.status])).toEqual([['study.yaml', 'changed']]);
  });
});

describe('compare: one parameter changed', () => {
  const newBrake = 4e-3;
  const oldDir = writeStudy();
  const newDir = writeStudy({ revision: 'B', events: BASE_EVENTS.replace(`value: ${P.brake}, source: fen-notes, note: "page 2"`, `value: ${newBrake}, source: fen-notes, note: "page 2"`) });
  const { comparison: c } = compareStudies(readStudy(oldDir), readStudy(newDir));

  it('shows exactly that change with the right old and new values', () => {
    expect(c.change_count).toBe(1);
    expect(c.changes.data.parameters.changed).toHaveLength(1);
    const p = c.changes.data.parameters.changed[0]!;
    expect(p.key).toBe('brake.probability');
    expect(p.aspects).toEqual(['value']);
    expect(p.old.value).toBe(P.brake);
    expect(p.new.value).toBe(newBrake);
    expect(p.old.source).toBe('fen-notes');
    expect(p.new.source).toBe('fen-notes');
    expect(p.used_by).toEqual(['brake']);
    for (const part of Object.values(c.changes.logic)) expect(part).toEqual({ added: [], removed: [], changed: [] });
  });

  it('gives a nonzero effect on the top that uses it, the closed-form value, and none on the other top', () => {
    expect(c.attribution.effects).toHaveLength(1);
    const e = c.attribution.effects[0]!;
    expect(e.id).toBe('parameter:brake.probability');
    const before = baseTops(P);
    const after = baseTops({ ...P, brake: newBrake });
    const gate = e.tops.find((t) => t.id === 'gate-fails')!;
    expectClose(gate.base, before['gate-fails']);
    expectClose(gate.value, after['gate-fails']);
    expect(gate.value).not.toBe(gate.base);
    const power = e.tops.find((t) => t.id === 'no-power-top')!;
    expect(power.value).toBe(power.base);
    // One change: applying it alone is the whole difference.
    expect(c.attribution.reproduces_new).toBe(true);
    expectClose(c.attribution.together.find((t) => t.id === 'gate-fails')!.new, after['gate-fails']);
  });

  it('reports the top-event change with its ratio', () => {
    const t = c.results.tops.find((x) => x.id === 'gate-fails')!;
    expectClose(t.ratio!, baseTops({ ...P, brake: newBrake })['gate-fails'] / baseTops(P)['gate-fails']);
    expect(c.results.tops.find((x) => x.id === 'no-power-top')!.ratio).toBe(1);
  });

  it('moves the brake up the importance ranking and the cut-set list', () => {
    // brake goes from 1e-3 (below motor, 2e-3) to 4e-3 (above it): both lists swap their first two.
    const cs = c.results.cut_sets.find((x) => x.top === 'gate-fails')!;
    expect(cs.moved.map((m) => [m.events.join(' & '), m.old_rank, m.new_rank])).toEqual([
      ['brake', 2, 1],
      ['motor', 1, 2],
    ]);
    const imp = c.results.importance.find((x) => x.top === 'gate-fails')!;
    expect(imp.changes.map((x) => [x.event, x.old_rank, x.new_rank])).toEqual([
      ['brake', 2, 1],
      ['motor', 1, 2],
    ]);
  });
});

describe('compare: logic changes', () => {
  it('shows a removed gate as removed, its parent as re-wired, and the re-wiring effect in closed form', () => {
    const oldDir = writeStudy();
    const newLogic = `tops:
  gate-fails:
    title: The sluice gate does not open
    gate: gate-fails-to-open
gates:
  gate-fails-to-open:
    title: Gate fails to open
    any: [motor, brake, utility]
`;
    const newDir = writeStudy({ revision: 'B', logic: newLogic });
    const { comparison: c } = compareStudies(readStudy(oldDir), readStudy(newDir));
    expect(c.changes.logic.gates.removed.map((g) => g.id)).toEqual(['no-power']);
    expect(c.changes.logic.tops.removed.map((t) => t.id)).toEqual(['no-power-top']);
    const g = c.changes.logic.gates.changed;
    expect(g).toHaveLength(1);
    expect(g[0]!.id).toBe('gate-fails-to-open');
    expect(g[0]!.aspects).toEqual(['inputs']);
    expect(g[0]!.inputs_added).toEqual(['utility']);
    expect(g[0]!.inputs_removed).toEqual(['no-power']);
    expect(c.attribution.tops).toEqual(['gate-fails']);
    const e = c.attribution.effects.find((x) => x.id === 'gate:gate-fails-to-open')!;
    expectClose(e.tops[0]!.value, 1 - (1 - P.motor) * (1 - P.brake) * (1 - P.utility));
    expect(c.results.tops.find((t) => t.id === 'no-power-top')!.new).toBeUndefined();
  });

  it('brings in a new event with a re-wiring, but keeps the old numbers of what the old study has', () => {
    // NEW: the brake probability changes AND the gate gains a new event 'panel'. Applying only the
    // re-wiring must use the OLD brake value and the NEW panel.
    const panel = 3e-3;
    const newEvents = BASE_EVENTS.replace(`value: ${P.brake}, source`, 'value: 9e-3, source') +
      `  panel:\n    title: Local panel fails\n    model: fixed\n    probability: { value: ${panel}, source: fen-notes }\n`;
    const newLogic = BASE_LOGIC.replace('any: [motor, brake, no-power]', 'any: [motor, brake, no-power, panel]');
    const oldStudy = readStudy(writeStudy());
    const newStudy = readStudy(writeStudy({ revision: 'B', events: newEvents, logic: newLogic }));
    const { comparison: c } = compareStudies(oldStudy, newStudy);
    expect(c.changes.logic.events.added.map((e) => e.id)).toEqual(['panel']);
    expect(c.changes.data.parameters.added.map((p) => p.key)).toEqual(['panel.probability']);
    const rewire = c.attribution.effects.find((x) => x.id === 'gate:gate-fails-to-open')!;
    const top = rewire.tops.find((t) => t.id === 'gate-fails')!;
    expectClose(top.value, 1 - (1 - P.motor) * (1 - P.brake) * (1 - P.utility * P.generator) * (1 - panel));
    const brake = c.attribution.effects.find((x) => x.id === 'parameter:brake.probability')!;
    expectClose(brake.tops.find((t) => t.id === 'gate-fails')!.value, baseTops({ ...P, brake: 9e-3 })['gate-fails']);
    // Together they are NEW; the single effects do not multiply to it (OR of changed inputs).
    expect(c.attribution.reproduces_new).toBe(true);
    const all = 1 - (1 - P.motor) * (1 - 9e-3) * (1 - P.utility * P.generator) * (1 - panel);
    expectClose(c.attribution.together.find((t) => t.id === 'gate-fails')!.new, all);
    const product = (top.value / top.base) * (brake.tops.find((t) => t.id === 'gate-fails')!.ratio!);
    expect(Math.abs(product - all / top.base)).toBeGreaterThan(1e-6);
  });

  it('gives an event brought in by a re-wiring the OLD values of the class it shares', () => {
    const events = (q: number, second: boolean) => `classes:
  hoist:
    model: fixed
    probability: { value: ${q}, source: fen-notes }
events:
  motor-1:
    title: Hoist 1
    class: hoist
${second ? '  motor-2:\n    title: Hoist 2\n    class: hoist\n' : ''}`;
    const logic = (inputs: string) => `tops:\n  t:\n    title: A hoist fails\n    gate: g\ngates:\n  g:\n    any: [${inputs}]\n`;
    const oldStudy = readStudy(writeStudy({ events: events(1e-3, false), logic: logic('motor-1') }));
    const newStudy = readStudy(writeStudy({ revision: 'B', events: events(5e-3, true), logic: logic('motor-1, motor-2') }));
    const { comparison: c } = compareStudies(oldStudy, newStudy);
    const rewire = c.attribution.effects.find((x) => x.id === 'gate:g')!;
    expectClose(rewire.tops[0]!.value, 1 - (1 - 1e-3) ** 2);
    const value = c.attribution.effects.find((x) => x.id === 'parameter:hoist.probability')!;
    expectClose(value.tops[0]!.value, 5e-3);
    expectClose(c.attribution.together[0]!.new, 1 - (1 - 5e-3) ** 2);
  });

  it('shows a changed k of a voting gate and its effect', () => {
    const logic = (k: number) => `tops:
  two-lost:
    title: Too few supplies
    gate: supplies
gates:
  supplies:
    atleast: ${k}
    of: [motor, brake, utility]
`;
    const oldStudy = readStudy(writeStudy({ logic: logic(2) }));
    const newStudy = readStudy(writeStudy({ revision: 'B', logic: logic(1) }));
    const { comparison: c } = compareStudies(oldStudy, newStudy);
    const g = c.changes.logic.gates.changed[0]!;
    expect(g.aspects).toEqual(['k']);
    expect([g.old.k, g.new.k]).toEqual([2, 1]);
    const e = c.attribution.effects[0]!;
    // 1-of-3 is an OR; 2-of-3 of independent events by enumeration of the four ways (common practice, no source).
    const [a, b, u] = [P.motor, P.brake, P.utility];
    expectClose(e.tops[0]!.base, a * b * (1 - u) + a * (1 - b) * u + (1 - a) * b * u + a * b * u);
    expectClose(e.tops[0]!.value, 1 - (1 - a) * (1 - b) * (1 - u));
  });
});

describe('compare: structures beside the gates', () => {
  it('lists an added count set, and an added common-cause group with its effect', () => {
    const events = `classes:
  hoist:
    model: fixed
    probability: { value: 1e-2, source: fen-notes }
events:
  motor-1: { title: Hoist 1, class: hoist }
  motor-2: { title: Hoist 2, class: hoist }
`;
    const logic = `tops:\n  both:\n    title: Both hoists fail\n    gate: g\ngates:\n  g:\n    all: [motor-1, motor-2]\n`;
    const extra = `common_cause:
  hoists:
    members: [motor-1, motor-2]
    method: beta
    beta: { value: 0.1, source: fen-notes }
counts:
  hoists-failing:
    title: Hoists that fail
    of: [motor-1, motor-2]
`;
    const { comparison: c } = compareStudies(readStudy(writeStudy({ events, logic })), readStudy(writeStudy({ revision: 'B', events, logic: logic + extra })));
    expect(c.changes.logic.counts.added.map((x) => x.id)).toEqual(['hoists-failing']);
    expect(c.changes.logic.common_cause.added.map((x) => x.id)).toEqual(['hoists']);
    const e = c.attribution.effects.find((x) => x.id === 'common-cause:hoists')!;
    // Beta-factor model (NUREG/CR-5485): independent part (1 − β)Q each, common part βQ:
    // P(both) = βQ + (1 − βQ)·((1 − β)Q)².
    const [q, b] = [1e-2, 0.1];
    expectClose(e.tops[0]!.base, q * q);
    expectClose(e.tops[0]!.value, b * q + (1 - b * q) * ((1 - b) * q) ** 2, 1e-9);
    expect(c.attribution.reproduces_new).toBe(true);
  });
});

describe('compare: data details', () => {
  it('tells a change of source from a change of value, and a change of unit', () => {
    const events = BASE_EVENTS.replace(`value: ${P.motor}, source: fen-notes, note: "page 1"`, `value: ${P.motor}, source: fen-survey, note: "page 1"`);
    const { comparison: c } = compareStudies(readStudy(writeStudy()), readStudy(writeStudy({ revision: 'B', events })));
    expect(c.changes.data.parameters.changed.map((p) => [p.key, p.aspects])).toEqual([['motor.probability', ['source']]]);
    const p = c.changes.data.parameters.changed[0]!;
    expect([p.old.source_title, p.new.source_title]).toEqual(['Little Fen sluice maintenance notes (invented)', 'Little Fen hoist survey (invented)']);
    // A source change cannot move a number: no effect is computed for it.
    expect(c.attribution.effects).toEqual([]);
    expect(writtenUnit('3 months')).toBe(writtenUnit('1 month'));
    expect(writtenUnit('4 weeks')).not.toBe(writtenUnit('1 month'));
  });

  it('moves ages with a new snapshot date and attributes that to the date', () => {
    const events = `events:
  motor:
    title: Hoist motor
    model: weibull
    shape: { value: 2, source: fen-notes }
    scale: { value: 40 years, source: fen-notes }
    installed: 2000
`;
    const logic = `tops:\n  t:\n    title: Motor fails\n    gate: g\ngates:\n  g:\n    any: [motor, m2]\n`;
    const ev = events + '  m2:\n    title: Second\n    model: fixed\n    probability: { value: 1e-3, source: fen-notes }\n';
    const oldStudy = readStudy(writeStudy({ events: ev, logic, asOf: '2020-01-01', issued: '2020-02-01' }));
    const newStudy = readStudy(writeStudy({ revision: 'B', events: ev, logic, asOf: '2030-01-01', issued: '2030-02-01' }));
    const { comparison: c } = compareStudies(oldStudy, newStudy);
    expect(c.change_count).toBe(1);
    const e = c.attribution.effects[0]!;
    expect(e.id).toBe('as_of');
    // Weibull unreliability without exercise: F(t) = 1 − exp(−(t/η)^β) (DESIGN.md model table),
    // ages 20 and 30 years counted in days/365.25 from 2000-01-01.
    const age = (to: string) => (Date.parse(to) - Date.parse('2000-01-01')) / 86400000 / 365.25;
    const F = (t: number) => 1 - Math.exp(-((t / 40) ** 2));
    expectClose(e.tops[0]!.base, 1 - (1 - F(age('2020-01-01'))) * (1 - 1e-3), 1e-9);
    expectClose(e.tops[0]!.value, 1 - (1 - F(age('2030-01-01'))) * (1 - 1e-3), 1e-9);
  });
});

describe('compare: applying changes', () => {
  it('recomputes the point estimate exactly as the analysis does, and all units together give NEW', () => {
    const events = BASE_EVENTS.replace(`value: ${P.utility}`, 'value: 0.05').replace(`value: ${P.generator}`, 'value: 1e-2');
    const logic = BASE_LOGIC.replace('all: [utility, generator]', 'any: [utility, generator]');
    const oldStudy = readStudy(writeStudy());
    const newStudy = readStudy(writeStudy({ revision: 'B', events, logic }));
    for (const s of [oldStudy, newStudy]) {
      const analysed = analyze(s).tops;
      const mine = pointTops(s);
      for (const t of analysed) expect(mine.get(t.id)).toBe(t.probability.exact);
    }
    const diff = diffStudies(oldStudy, newStudy);
    const units = unitsOf(diff);
    expect(units.map((u) => u.kind).sort()).toEqual(['gate', 'parameter', 'parameter']);
    const all = pointTops(applyUnits(oldStudy, newStudy, units));
    const target = pointTops(newStudy);
    for (const [id, p] of target) expectClose(all.get(id)!, p);
    // OLD itself is never modified by applying units.
    expect(pointTops(oldStudy).get('gate-fails')).toBe(analyze(readStudy(oldStudy.root)).tops[0]!.probability.exact);
  });
});

describe('faultbook compare (command)', () => {
  it('writes comparison.json, .html and .pdf, byte-identical on a rerun, with changed nodes marked by a label', async () => {
    const oldDir = writeStudy();
    const newDir = writeStudy({ revision: 'B', events: BASE_EVENTS.replace(`value: ${P.generator}`, 'value: 5e-2') });
    const out1 = tempDir();
    const out2 = tempDir();
    const r1 = await faultbook('compare', oldDir, newDir, '--out', out1);
    expect(r1.stderr.replace(/^warning:.*\n/gm, '')).toBe('');
    expect(r1.code).toBe(0);
    expect(r1.stdout).toContain('generator.probability');
    expect((await faultbook('compare', oldDir, newDir, '--out', out2, '--quiet')).code).toBe(0);
    for (const f of ['comparison.json', 'comparison.html', 'comparison.pdf']) {
      expect(readFileSync(join(out2, f)).equals(readFileSync(join(out1, f)))).toBe(true);
    }
    const json = JSON.parse(readFileSync(join(out1, 'comparison.json'), 'utf8'));
    expect(json.format).toBe('faultbook-comparison/1');
    expect(json.changes.data.parameters.changed.map((p: { key: string }) => p.key)).toEqual(['generator.probability']);
    const html = readFileSync(join(out1, 'comparison.html'), 'utf8');
    expect(html).toContain('What moved the answer');
    expect(html).toContain('The parts need not add up');
    // The subtree of the changed event is drawn, the event marked by a word, not only by colour.
    expect(html).toMatch(/data-node="generator"[^>]*>(?:(?!<\/g>).)*\[CHANGED\]/s);
    expect(readFileSync(join(out1, 'comparison.pdf')).subarray(0, 5).toString()).toBe('%PDF-');
  });

  it('refuses a missing study with exit 2', async () => {
    const r = await faultbook('compare', writeStudy(), join(tempDir(), 'nothing-here'));
    expect(r.code).toBe(2);
  });
});

describe('the example study and its earlier revision', () => {
  it('keeps revision A out of the example study’s own inputs, and revision A reads on its own', () => {
    const b = readStudy('example-study');
    expect(b.files.some((f) => f.path.startsWith('earlier-revision'))).toBe(false);
    const a = readStudy('example-study/earlier-revision');
    expect(a.meta.revision).not.toBe(b.meta.revision);
    expect(a.files.map((f) => f.path)).toEqual(expect.arrayContaining(['study.yaml', 'events.yaml', 'logic.yaml']));
    // Invented, and says so.
    expect(a.files.find((f) => f.path === 'study.yaml')!.text).toMatch(/INVENTED/);
    expect(comparisonJson(compareStudies(a, b).comparison).length).toBeGreaterThan(0);
  });
});
