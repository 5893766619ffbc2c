import { describe, expect, it } from 'vitest';
import { baseCase } from '../../src/analysis/case.js';
import { evaluateEvents } from '../../src/analysis/event-probability.js';
import { readStudy } from '../../src/study/read.js';

// The shortcut must be invisible: re-evaluating only the events a parameter override touches gives
// the same numbers, bit for bit, as evaluating every event again.
describe('evaluateEvents with a base evaluation', () => {
  const study = readStudy('example-study');
  const base = evaluateEvents(study, baseCase());

  it('equals a full evaluation for every one-parameter override, class, event or group', () => {
    for (const p of study.parameters) {
      const c = baseCase();
      c.overrides.set(p.key, p.quantity === 'probability' ? Math.min(1, p.value * 1.7) : p.value * 1.7);
      const quick = evaluateEvents(study, c, undefined, base);
      const full = evaluateEvents(study, c);
      expect(Array.from(quick.probability), p.key).toEqual(Array.from(full.probability));
      expect(Array.from(quick.total), p.key).toEqual(Array.from(full.total));
    }
  });

  it("equals a full evaluation for an event's own override of a class field, and falls back when time moves", () => {
    const e = study.events.find((x) => x.class && x.fields.exercise)!;
    const c = baseCase();
    c.overrides.set(`${e.id}.exercise`, 0.5);
    expect(Array.from(evaluateEvents(study, c, undefined, base).probability)).toEqual(Array.from(evaluateEvents(study, c).probability));
    const later = baseCase();
    later.years = 5;
    expect(Array.from(evaluateEvents(study, later, undefined, base).probability)).toEqual(Array.from(evaluateEvents(study, later).probability));
    expect(Array.from(evaluateEvents(study, later).probability)).not.toEqual(Array.from(base.probability));
  });
});
