import { describe, expect, it } from 'vitest';
import { logicFigures } from '../../src/report/diagram/index.js';
import { G, capacityFor, layoutTree, stackFor } from '../../src/report/diagram/layout.js';
import { diagramModel } from '../../src/report/diagram/model.js';
import { depthOf, gatesIn, leafCount, partition, transfers, type TreeNode } from '../../src/report/diagram/partition.js';
import { textWidth, wrap } from '../../src/report/diagram/text.js';
import { contentBox } from '../../src/report/paper.js';
import type { Results } from '../../src/analysis/results.js';
import type { FigureBlock, Paper } from '../../src/report/view.js';
import { fixtureResults } from './fixture.js';
import { svgNodes } from './helpers.js';
import { bigTreeResults, wideGateResults } from './synthetic.js';

function figuresOf(results: Results, paper: Paper = 'a4'): FigureBlock[] {
  let n = 0;
  let t = 0;
  return logicFigures(results, paper, { nextFigure: () => `Figure 5.${++n}`, nextTable: () => `Table 5.${++t}` }).filter(
    (b): b is FigureBlock => b.kind === 'figure',
  );
}

/** data-node entries of every logic figure (the legend has none). */
function nodesByFigure(figs: FigureBlock[]) {
  return figs.map((f) => ({ id: f.id, number: f.number, nodes: f.parts.flatMap((p) => svgNodes(p.svg)) }));
}

/** Each figure's nodes once, even when the figure is sliced into parts (the parts show one drawing). */
function uniqueNodes(f: FigureBlock) {
  return svgNodes(f.parts[0]!.svg);
}

describe('logic diagrams', () => {
  it('draws every gate and every basic event of the fixture in some figure', () => {
    const r = fixtureResults();
    const drawn = new Set(figuresOf(r).flatMap((f) => uniqueNodes(f).map((n) => n.node)));
    for (const g of r.logic.gates) expect(drawn, g.id).toContain(g.id);
    for (const e of r.events) expect(drawn, e.id).toContain(e.id);
  });

  it('uses the trade symbols: voting label, house event for the switch, NOT bubble, transfers', () => {
    const figs = figuresOf(fixtureResults());
    const svg = figs.map((f) => f.parts[0]!.svg).join('\n');
    expect(svg).toMatch(/>2\/3</);
    const nodes = figs.flatMap(uniqueNodes);
    expect(nodes.find((n) => n.node === 'crew-on-site')!.kind).toBe('house');
    expect(nodes.find((n) => n.node === 'plc-fails')!.kind).toBe('event');
    expect(nodes.some((n) => n.kind === 'transfer')).toBe(true);
    expect(nodes.filter((n) => n.kind === 'top').map((n) => n.node)).toEqual(['spillway-short', 'station-blackout']);
  });

  it('draws a shared subtree once and refers to it by transfer everywhere else', () => {
    const figs = figuresOf(fixtureResults());
    const all = nodesByFigure(figs);
    for (const shared of ['station-power-lost', 'control-fails']) {
      const full = all.filter((f) => f.nodes.some((n) => n.node === shared && n.kind === 'gate'));
      expect(full, shared).toHaveLength(1);
      const refs = all.filter((f) => f.nodes.some((n) => n.node === shared && n.kind === 'transfer'));
      // Used by gate-1-stuck, gate-2-stuck and gate-3-stuck.
      expect(refs, shared).toHaveLength(3);
    }
  });

  it('prints the probability of each node from Results (events and per-gate values)', () => {
    const figs = figuresOf(fixtureResults());
    const svg = figs.map((f) => f.parts[0]!.svg).join('\n');
    expect(svg).toContain('P = 5.83E-04'); // hoist-1-motor
    expect(svg).toContain('P = 1.04E-02'); // two-or-more-gates-stuck, from gate_probabilities
    expect(svg).toContain('house: off (0)');
  });

  it('splits a tree too big for a page into figures whose transfers all resolve', () => {
    const r = bigTreeResults(5, 3);
    for (const paper of ['a4', 'letter'] as const) {
      const figs = figuresOf(r, paper);
      const logic = figs.filter((f) => f.id !== 'fig-legend');
      expect(logic.length).toBeGreaterThan(5);
      const byAnchor = new Map(logic.map((f) => [f.id, f]));
      const references = new Map<string, number>();
      for (const f of logic) {
        for (const n of uniqueNodes(f).filter((x) => x.kind === 'transfer')) {
          references.set(n.target!, (references.get(n.target!) ?? 0) + 1);
          const target = byAnchor.get(n.target!);
          expect(target, `${n.node} → ${n.target}`).toBeDefined();
          // The figure named by the transfer draws that gate in full, as its root.
          expect(uniqueNodes(target!).find((x) => x.kind === 'gate')!.node).toBe(n.node);
          // And the label under the triangle names it.
          expect(f.parts[0]!.svg).toContain(`see ${target!.number.toLowerCase()}`);
        }
      }
      // Every figure but the top's is a continuation some transfer points at; the shared subtree from two places.
      expect([...references.keys()].sort()).toEqual(logic.slice(1).map((f) => f.id).sort());
      const sharedGate = r.logic.gates.find((g) => g.id === r.logic.tops[0]!.gate)!.inputs[1]!;
      expect(references.get(`fig-${sharedGate}`)).toBe(2);
      // Every gate and event is drawn in full somewhere, every gate exactly once.
      const full = logic.flatMap((f) => uniqueNodes(f).filter((n) => n.kind === 'gate').map((n) => n.node));
      expect([...full].sort()).toEqual(r.logic.gates.map((g) => g.id).sort());
      const events = new Set(logic.flatMap((f) => uniqueNodes(f).filter((n) => n.kind === 'event').map((n) => n.node)));
      for (const e of r.events) expect(events).toContain(e.id);
    }
  });

  it('keeps every figure within the printable area of the paper (landscape ones of a landscape page)', () => {
    for (const paper of ['a4', 'letter'] as const) {
      for (const f of [...figuresOf(bigTreeResults(6, 3), paper), ...figuresOf(fixtureResults(), paper)]) {
        const box = contentBox(paper, f.landscape ? 'landscape' : 'portrait');
        for (const p of f.parts) {
          expect(p.width, f.id).toBeLessThanOrEqual(box.width);
          expect(p.height, f.id).toBeLessThanOrEqual(box.height - G.captionAllowance);
        }
      }
    }
  });

  it('draws a gate with more inputs than one page of stacked inputs holds in page parts, each input once', () => {
    // 40 leaf inputs: more than the stacked block one A4 page holds (checked here, not assumed).
    const capacity = capacityFor('a4');
    expect(stackFor(40, capacity, false)).toBeNull();
    const figs = figuresOf(wideGateResults(40));
    const wide = figs.find((f) => f.id !== 'fig-legend')!;
    expect(wide.parts.length).toBeGreaterThan(1);
    for (const p of wide.parts) {
      expect(p.width).toBeLessThanOrEqual(contentBox('a4').width);
      expect(p.height).toBeLessThanOrEqual(contentBox('a4').height - G.captionAllowance);
    }
    // Each part draws only its own inputs (no window on one whole drawing): every input once in all.
    const drawn = wide.parts.flatMap((p) => svgNodes(p.svg).filter((n) => n.kind === 'event').map((n) => n.node));
    expect(drawn.sort()).toEqual(Array.from({ length: 40 }, (_, i) => `wide-${i + 1}`).sort());
    // And each part shows the gate its inputs belong to.
    for (const p of wide.parts) expect(svgNodes(p.svg).some((n) => n.node === 'wide-or' && n.kind === 'gate')).toBe(true);
  });
});

describe('partition (pure)', () => {
  it('respects the capacity it is given', () => {
    const model = diagramModel(bigTreeResults(6, 3));
    const capacity = { columns: 4, levels: 3 };
    for (const f of partition(model, capacity)) {
      expect(depthOf(f.tree)).toBeLessThanOrEqual(capacity.levels);
      // Only a single gate with more inputs than columns may exceed the width (then it is sliced).
      if (leafCount(f.tree) > capacity.columns) expect(f.tree.children.length).toBeGreaterThan(capacity.columns);
    }
  });

  it('puts each gate in full in exactly one figure and names every continuation', () => {
    const model = diagramModel(fixtureResults());
    const figs = partition(model, capacityFor('a4'));
    const full = figs.flatMap((f) => gatesIn(f.tree));
    expect(new Set(full).size).toBe(full.length);
    const roots = new Set(figs.map((f) => f.root));
    for (const f of figs) for (const t of transfers(f.tree)) expect(roots).toContain(t);
    expect(figs.find((f) => f.root === 'station-power-lost')!.tops).toEqual(['station-blackout']);
    expect(figs.find((f) => f.root === 'control-fails')!.reason).toBe('shared');
  });

  it('draws a gate no top reaches on a figure of its own', () => {
    const r = fixtureResults();
    r.logic.gates.push({ id: 'orphan-gate', op: 'all', inputs: ['plc-fails', 'debris-blocks-spillway'] });
    const figs = partition(diagramModel(r), capacityFor('a4'));
    expect(figs.find((f) => f.root === 'orphan-gate')!.reason).toBe('unused');
  });

  it('lays leaves out left to right one column each, parents centred over their inputs', () => {
    const model = diagramModel(fixtureResults());
    const fig = partition(model, capacityFor('a4')).find((f) => f.root === 'control-fails')!;
    const layout = layoutTree(fig.tree, false);
    expect(layout.columns).toBe(leafCount(fig.tree));
    const root = layout.root;
    expect(root.x).toBeCloseTo((root.children[0]!.x + root.children[root.children.length - 1]!.x) / 2, 9);
  });
});

/**
 * A gate with 12 leaf inputs, all kinds the stack can hold: basic events with distinct
 * probabilities, a house event, a common-cause member and a transfer (to a second top's gate).
 * INVENTED ids and numbers, built for this test only.
 */
function twelveInputResults(): Results {
  const r = wideGateResults(10);
  r.events.forEach((e, i) => {
    e.probability = (i + 1) * 1.1e-4;
    e.parameters = { probability: e.probability };
  });
  r.events[3]!.common_cause_role = 'independent';
  r.events[3]!.common_cause_group = 'wide-ccf';
  r.events[3]!.total_probability = 7.5e-4;
  r.events.push({ id: 'wide-switch', title: 'Maintenance mode set', model: 'switch', probability: 0, parameters: {}, parameter_keys: {}, on: false, assumptions: [] });
  r.logic.gates[0]!.inputs.push('wide-switch', 'wide-sub');
  r.logic.gates.push({ id: 'wide-sub', title: 'Second branch', op: 'all', inputs: ['wide-1', 'wide-2'] });
  r.logic.tops.push({ id: 'wide-sub-top', title: 'Second branch fails (invented)', gate: 'wide-sub' });
  r.tops.push({ ...r.tops[0]!, id: 'wide-sub-top', title: 'Second branch fails (invented)', gate: 'wide-sub', probability: { exact: 2.42e-8, rare_event: 2.42e-8, mcub: 2.42e-8, basis: 'exact' } });
  return r;
}

interface Rect {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** Each node group of a drawing: its label box and its symbol's bounding box (circle or path), and its text. */
function drawnNodes(svg: string): { node: string; kind: string; box: Rect; symbol?: Rect; text: string }[] {
  const num = (attrs: string, name: string) => Number(new RegExp(`\\b${name}="([-\\d.]+)"`).exec(attrs)![1]);
  const out: { node: string; kind: string; box: Rect; symbol?: Rect; text: string }[] = [];
  for (const m of svg.matchAll(/<g\b([^>]*data-node="[^"]*"[^>]*)>(.*?)<\/g>/gs)) {
    const [attrs, body] = [m[1]!, m[2]!];
    const rect = /<rect\b([^>]*)>/.exec(body)![1]!;
    const box = { x: num(rect, 'x'), y: num(rect, 'y'), w: num(rect, 'width'), h: num(rect, 'height') };
    let symbol: Rect | undefined;
    const circle = /<circle\b([^>]*)>/.exec(body)?.[1];
    const path = /<path\b[^>]*\bd="([^"]*)"/.exec(body)?.[1];
    if (circle) {
      const [cx, cy, r] = [num(circle, 'cx'), num(circle, 'cy'), num(circle, 'r')];
      symbol = { x: cx - r, y: cy - r, w: 2 * r, h: 2 * r };
    } else if (path) {
      const xy = [...path.matchAll(/(-?[\d.]+),(-?[\d.]+)/g)].map((p) => [Number(p[1]), Number(p[2])] as const);
      const xs = xy.map((p) => p[0]);
      const ys = xy.map((p) => p[1]);
      symbol = { x: Math.min(...xs), y: Math.min(...ys), w: Math.max(...xs) - Math.min(...xs), h: Math.max(...ys) - Math.min(...ys) };
    }
    const text = [...body.matchAll(/<text\b[^>]*>([^<]*)<\/text>/g)].map((t) => t[1]).join(' | ');
    out.push({ node: /data-node="([^"]*)"/.exec(attrs)![1]!, kind: /data-kind="([^"]*)"/.exec(attrs)![1]!, box, ...(symbol ? { symbol } : {}), text });
  }
  return out;
}

/** Strict overlap of two rectangles (touching edges do not count). */
function intersects(a: Rect, b: Rect): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

describe('stacked inputs (a gate of many leaf inputs)', () => {
  for (const paper of ['a4', 'letter'] as const) {
    it(`draws a gate with 12 leaf inputs as one figure part on ${paper}, every input once with its P, nothing overlapping`, () => {
      const r = twelveInputResults();
      const figs = figuresOf(r, paper);
      const wide = figs.find((f) => f.id === 'fig-wide-or')!;
      const box = contentBox(paper);
      // 12 inputs is more than fit across (so the old row would have been cut into parts) …
      expect(capacityFor(paper).columns).toBeLessThan(12);
      // … but stacked they fit one part within the printable area, caption included.
      expect(wide.parts).toHaveLength(1);
      expect(wide.parts[0]!.width).toBeLessThanOrEqual(box.width);
      expect(wide.parts[0]!.height).toBeLessThanOrEqual(box.height - G.captionAllowance);

      const nodes = drawnNodes(wide.parts[0]!.svg);
      const inputs = r.logic.gates[0]!.inputs;
      for (const id of inputs) expect(nodes.filter((n) => n.node === id), id).toHaveLength(1);
      // Each basic event's own P, written out by hand: (i + 1) × 1.1E-04, three significant figures.
      const expected = ['1.10E-04', '2.20E-04', '3.30E-04', '', '5.50E-04', '6.60E-04', '7.70E-04', '8.80E-04', '9.90E-04', '1.10E-03'];
      expected.forEach((p, i) => {
        if (p) expect(nodes.find((n) => n.node === `wide-${i + 1}`)!.text, `wide-${i + 1}`).toContain(`P = ${p}`);
      });
      // The CCF member prints its own total, labelled, its independent part under it, and keeps
      // its mark; the switch stays a house event.
      const ccf = nodes.find((n) => n.node === 'wide-4')!;
      expect(ccf.text).toContain('total P = 7.50E-04');
      expect(ccf.text).toContain('independent 4.40E-04');
      expect(ccf.text).toContain('CCF');
      expect(ccf.text).toContain('group wide-ccf');
      expect(wide.parts[0]!.svg).toMatch(/data-node="wide-4"[^>]*data-common-cause="wide-ccf"/);
      expect(nodes.find((n) => n.node === 'wide-switch')!.kind).toBe('house');
      expect(nodes.find((n) => n.node === 'wide-switch')!.text).toContain('house: off (0)');
      // The transfer still names the figure that draws its gate, and links to it.
      const transfer = svgNodes(wide.parts[0]!.svg).find((n) => n.node === 'wide-sub')!;
      expect(transfer.kind).toBe('transfer');
      const target = figs.find((f) => f.id === transfer.target)!;
      expect(target).toBeDefined();
      expect(nodes.find((n) => n.node === 'wide-sub')!.text).toContain(`see ${target.number.toLowerCase()}`);

      // No two label boxes intersect, and no symbol runs into any box (its own or another's).
      for (let i = 0; i < nodes.length; i++) {
        for (let j = i + 1; j < nodes.length; j++) expect(intersects(nodes[i]!.box, nodes[j]!.box), `${nodes[i]!.node} / ${nodes[j]!.node}`).toBe(false);
        for (const other of nodes) if (nodes[i]!.symbol) expect(intersects(nodes[i]!.symbol!, other.box), `${nodes[i]!.node} symbol / ${other.node}`).toBe(false);
      }
      // Stacked: the 12 boxes share at most a few x positions (columns), and more than one row.
      const xs = new Set(nodes.filter((n) => inputs.includes(n.node)).map((n) => n.box.x));
      const ys = new Set(nodes.filter((n) => inputs.includes(n.node)).map((n) => n.box.y));
      expect(xs.size).toBeLessThanOrEqual(capacityFor(paper).columns);
      expect(ys.size).toBeGreaterThan(1);
      // Every box lies inside the drawing.
      for (const n of nodes) expect(n.box.x >= 0 && n.box.x + n.box.w <= wide.parts[0]!.width && n.box.y + n.box.h <= wide.parts[0]!.height, n.node).toBe(true);
    });
  }

  it('keeps gates of no more inputs than fit across in one row', () => {
    const capacity = capacityFor('a4');
    expect(stackFor(capacity.columns, capacity, false)).toBeNull();
    const s = stackFor(12, capacity, true)!;
    expect(s.columns * s.rows).toBeGreaterThanOrEqual(12);
    // The fixture's gates have at most a few inputs: none is stacked.
    const stacked = (n: TreeNode): boolean => n.kind === 'gate' && (n.stack !== undefined || n.children.some(stacked));
    expect(partition(diagramModel(fixtureResults()), capacity).some((f) => stacked(f.tree))).toBe(false);
  });

  it('cuts a stacked gate that would run off the page into its own figure', () => {
    // An AND of (an OR of 16 events) and one event: the stack fits a page only as a figure root.
    const r = wideGateResults(17);
    r.logic.gates = [
      { id: 'deep-and', op: 'all', inputs: ['deep-or', 'wide-17'] },
      { id: 'deep-or', op: 'any', inputs: r.events.slice(0, 16).map((e) => e.id) },
    ];
    r.logic.tops[0]!.gate = 'deep-and';
    r.tops[0]!.gate = 'deep-and';
    for (const paper of ['a4', 'letter'] as const) {
      const capacity = capacityFor(paper);
      const figs = partition(diagramModel(r), capacity);
      for (const f of figs) {
        expect(depthOf(f.tree), f.root).toBeLessThanOrEqual(capacity.levels);
        expect(leafCount(f.tree), f.root).toBeLessThanOrEqual(capacity.columns);
      }
      // Only gates whose drawn inputs are all leaves are stacked.
      const stackedGates = (n: TreeNode): (TreeNode & { kind: 'gate' })[] => (n.kind === 'gate' ? [...(n.stack ? [n] : []), ...n.children.flatMap(stackedGates)] : []);
      for (const g of figs.flatMap((f) => stackedGates(f.tree))) expect(g.children.every((c) => c.kind !== 'gate'), g.id).toBe(true);
      const own = figs.find((f) => f.root === 'deep-or')!;
      expect(own.tree.stack).toBeDefined();
      expect(transfers(figs[0]!.tree)).toEqual(['deep-or']);
      for (const f of figuresOf(r, paper)) for (const p of f.parts) expect(p.height, f.id).toBeLessThanOrEqual(contentBox(paper).height - G.captionAllowance);
    }
  });
});

describe('label text', () => {
  it('wraps within the width and marks what was cut', () => {
    const lines = wrap('Automatic transfer switch fails to change over when the utility supply is lost', 78, 7, 3);
    expect(lines.length).toBeLessThanOrEqual(3);
    for (const l of lines) expect(textWidth(l, 7)).toBeLessThanOrEqual(78);
    expect(lines[2]!.endsWith('…')).toBe(true);
    expect(wrap('short title', 78, 7, 3)).toEqual(['short title']);
  });
  it('breaks an over-long identifier after a hyphen', () => {
    const lines = wrap('generator-fuel-contaminated-beyond-use', 78, 7.5, 2, 'medium');
    expect(lines[0]!.endsWith('-')).toBe(true);
    for (const l of lines) expect(textWidth(l, 7.5, 'medium')).toBeLessThanOrEqual(78);
  });
  it('measures Roboto advance widths (Roboto-Regular hmtx: "M" is 1788/2048 em → 873/1000)', () => {
    expect(textWidth('M', 10)).toBeCloseTo(8.73, 6);
    expect(textWidth('MM', 10)).toBeCloseTo(17.46, 6);
  });
});
