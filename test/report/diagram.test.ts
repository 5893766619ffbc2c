import { describe, expect, it } from 'vitest';
import { logicFigures } from '../../src/report/diagram/index.js';
import { G, capacityFor, layoutTree } from '../../src/report/diagram/layout.js';
import { diagramModel } from '../../src/report/diagram/model.js';
import { depthOf, gatesIn, leafCount, partition, transfers } from '../../src/report/diagram/partition.js';
import { textWidth, wrap } from '../../src/report/diagram/text.js';
import { contentBox } from '../../src/report/paper.js';
import type { Results } from '../../src/analysis/results.js';
import type { FigureBlock, Paper } from '../../src/report/view.js';
import { fixtureResults } from './fixture.js';
import { svgNodes } from './helpers.js';
import { bigTreeResults, wideGateResults } from './synthetic.js';

function figuresOf(results: Results, paper: Paper = 'a4'): FigureBlock[] {
  let n = 0;
  return logicFigures(results, paper, () => `Figure 5.${++n}`);
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

  it('keeps every figure within the printable area of the paper', () => {
    for (const paper of ['a4', 'letter'] as const) {
      const box = contentBox(paper);
      for (const f of [...figuresOf(bigTreeResults(6, 3), paper), ...figuresOf(fixtureResults(), paper)]) {
        for (const p of f.parts) {
          expect(p.width, f.id).toBeLessThanOrEqual(box.width);
          expect(p.height, f.id).toBeLessThanOrEqual(box.height - G.captionAllowance);
        }
      }
    }
  });

  it('cuts a gate with more inputs than a page is wide into page-wide parts', () => {
    const figs = figuresOf(wideGateResults(24));
    const wide = figs.find((f) => f.id !== 'fig-legend')!;
    const perPage = capacityFor('a4').columns;
    expect(wide.parts).toHaveLength(Math.ceil(24 / perPage));
    for (const p of wide.parts) expect(p.width).toBeLessThanOrEqual(contentBox('a4').width);
    // The parts are windows on one drawing: their viewBoxes tile it left to right.
    const xs = wide.parts.map((p) => Number(/viewBox="([\d.]+) /.exec(p.svg)![1]));
    expect(xs).toEqual([...xs].sort((a, b) => a - b));
    expect(new Set(xs).size).toBe(xs.length);
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
