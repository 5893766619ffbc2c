/**
 * Generated `Results` for the report tests and the benchmark: INVENTED models with no meaning,
 * built only to stress the layout (a tree far too big for one page, a gate with very many inputs,
 * hostile strings). Probabilities here are placeholders chosen to be in range, not computed: the
 * report must print whatever it is given, and these tests check the printing, not the numbers.
 */
import type { CutSet, EventResult, Results } from '../../src/analysis/results.js';
import { fixtureResults } from './fixture.js';

/** A deterministic sequence in (0, 1) so the generated numbers repeat from run to run (no Math.random). */
function sequence(seed: number): () => number {
  let x = seed >>> 0;
  return () => {
    // xorshift32 (Marsaglia 2003): fine for placeholder values, never for statistics.
    x ^= x << 13;
    x >>>= 0;
    x ^= x >>> 17;
    x ^= x << 5;
    x >>>= 0;
    return (x + 0.5) / 4294967296;
  };
}

/**
 * A balanced tree: `depth` levels of gates with `fanout` inputs each (alternating OR/AND, one
 * voting gate per level), basic events at the bottom, and one gate shared by two parents.
 */
export function bigTreeResults(depth = 5, fanout = 3): Results {
  const r = fixtureResults();
  const next = sequence(20260630);
  const gates: Results['logic']['gates'] = [];
  const events: EventResult[] = [];
  let gateCount = 0;
  let eventCount = 0;
  const makeEvent = (): string => {
    const id = `be-${String(++eventCount).padStart(3, '0')}`;
    const p = 1e-4 * (1 + 9 * next());
    events.push({ id, title: `Synthetic component ${eventCount} fails`, model: 'fixed', probability: p, parameters: { probability: p }, parameter_keys: {}, assumptions: [] });
    return id;
  };
  const makeGate = (level: number): string => {
    const id = `g-${String(++gateCount).padStart(3, '0')}`;
    const inputs = Array.from({ length: fanout }, () => (level + 1 >= depth ? makeEvent() : makeGate(level + 1)));
    const op = gateCount % 7 === 0 ? 'atleast' : level % 2 === 0 ? 'any' : 'all';
    gates.push({ id, title: `Synthetic gate ${gateCount} at level ${level}`, op, ...(op === 'atleast' ? { k: 2 } : {}), inputs });
    return id;
  };
  const root = makeGate(0);
  // One subtree used twice: the second child of the root also feeds the third child's first gate.
  const rootGate = gates.find((g) => g.id === root)!;
  const shared = rootGate.inputs[1]!;
  const other = gates.find((g) => g.id === rootGate.inputs[2]!)!;
  other.inputs.push(shared);
  const cut_sets: CutSet[] = events.slice(0, 60).map((e, i) => ({ events: [e.id], probability: e.probability, share: 1 / (i + 2) }));
  r.logic = { tops: [{ id: 'synthetic-top', title: 'Synthetic top event (invented)', gate: root }], gates };
  r.events = events;
  r.parameters = [];
  r.assumptions = [];
  r.tops = [
    {
      id: 'synthetic-top',
      title: 'Synthetic top event (invented)',
      gate: root,
      probability: { exact: 1.5e-3, rare_event: 1.6e-3, mcub: 1.55e-3, basis: 'exact' },
      cut_sets,
      cut_set_summary: { listed: cut_sets.length, truncated: 12, truncated_probability: 3.2e-9, cutoff: 1e-12, max_order: 8, coherent: false },
      bdd_nodes: 999,
    },
  ];
  return r;
}

/** One OR gate with `n` basic-event inputs: too wide for any page, so its figure is cut into parts. */
export function wideGateResults(n = 24): Results {
  const r = fixtureResults();
  const events: EventResult[] = Array.from({ length: n }, (_, i) => ({
    id: `wide-${i + 1}`,
    title: `Wide input ${i + 1}`,
    model: 'fixed',
    probability: 1e-3,
    parameters: { probability: 1e-3 },
    parameter_keys: {},
    assumptions: [],
  }));
  r.logic = { tops: [{ id: 'wide-top', title: 'Any of many inputs (invented)', gate: 'wide-or' }], gates: [{ id: 'wide-or', op: 'any', inputs: events.map((e) => e.id) }] };
  r.events = events;
  r.parameters = [];
  r.assumptions = [];
  r.tops = [
    {
      id: 'wide-top',
      title: 'Any of many inputs (invented)',
      gate: 'wide-or',
      probability: { exact: 0.0237, rare_event: 0.024, mcub: 0.0237, basis: 'exact' },
      cut_sets: events.map((e) => ({ events: [e.id], probability: e.probability, share: 0.0422 })),
      cut_set_summary: { listed: n, truncated: 0, cutoff: 1e-12, max_order: 8, coherent: true },
      bdd_nodes: n + 2,
    },
  ];
  return r;
}

/** Strings that try to break out of HTML, Handlebars, Markdown, CSS and SVG. */
export const HOSTILE = {
  title: 'Gate <script>window.__pwned=1</script> "quoted" & \'single\' {{handlebars}} {{{triple}}} </style>',
  facility: 'Dam <img src=x onerror="window.__pwned=1"> {{#each x}}loop{{/each}}',
  markdown:
    '**bold** <script>window.__pwned=1</script> [click](javascript:window.__pwned=1) ' +
    '![remote](https://example.invalid/x.png) <b onclick="x">raw</b> {{handlebars}}',
  eventTitle: '<svg onload="window.__pwned=1"></svg> & </text> "event"',
  sourceTitle: '</td></tr></table><script>window.__pwned=1</script>',
};

/** The fixture with hostile strings in every kind of place a study string reaches. */
export function hostileResults(): Results {
  const r = fixtureResults();
  r.study.title = HOSTILE.title;
  r.study.facility = HOSTILE.facility;
  r.study.scope = HOSTILE.markdown;
  r.study.description = HOSTILE.markdown;
  r.study.prepared_by = [HOSTILE.title];
  r.logic.tops[0]!.title = HOSTILE.title;
  r.tops[0]!.title = HOSTILE.title;
  r.events[0]!.title = HOSTILE.eventTitle;
  r.logic.gates[0]!.title = HOSTILE.eventTitle;
  r.sources[0]!.title = HOSTILE.sourceTitle;
  r.assumptions[0]!.title = HOSTILE.title;
  r.assumptions[0]!.body = HOSTILE.markdown;
  r.warnings.push({ code: 'hostile', message: HOSTILE.sourceTitle });
  return r;
}
