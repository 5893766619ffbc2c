/**
 * Diagrams of the changed subtrees, drawn with the appendix's own diagram pieces (same symbols,
 * layout, page partition), so a reviewer sees the comparison in the form the appendix uses.
 *
 * Which subtrees: every gate that was re-wired or redefined, and every gate with a changed basic
 * event among its inputs, less those already inside another such subtree. Each is drawn as it is
 * in NEW; a subtree that lost nodes is drawn as it was in OLD too. A changed node is marked by a
 * bracketed word in front of its title ([NEW], [RE-WIRED], [CHANGED], [REMOVED]), never by colour
 * alone, so the marks survive black-and-white printing and a screen reader.
 */
import type { Results } from '../../analysis/results.js';
import { contentBox } from '../../report/paper.js';
import { figurePartCount, figureParts } from '../../report/diagram/index.js';
import { drawFigure } from '../../report/diagram/draw.js';
import { capacityFor, layoutTree } from '../../report/diagram/layout.js';
import { drawLegend } from '../../report/diagram/legend.js';
import { diagramModel, type DiagramModel, type DiagramNode } from '../../report/diagram/model.js';
import { partition, type Capacity, type FigureTree, type TreeNode } from '../../report/diagram/partition.js';
import type { FigureBlock, Paper } from '../../report/view.js';
import { reachable } from '../../study/reach.js';
import type { Comparison } from '../compare.js';
import { revisionName } from '../describe.js';

export type Mark = 'NEW' | 'RE-WIRED' | 'CHANGED' | 'REMOVED';

export const MARK_MEANING: Record<Mark, string> = {
  NEW: 'added in the new revision',
  'RE-WIRED': 'gate whose inputs, logic or k changed',
  CHANGED: 'basic event whose definition or data changed',
  REMOVED: 'in the old revision only',
};

/** Node id → mark, in NEW and in OLD. */
export function changeMarks(c: Comparison): { inNew: Map<string, Mark>; inOld: Map<string, Mark> } {
  const inNew = new Map<string, Mark>();
  const inOld = new Map<string, Mark>();
  const l = c.changes.logic;
  for (const g of l.gates.added) inNew.set(g.id, 'NEW');
  for (const e of l.events.added) inNew.set(e.id, 'NEW');
  for (const g of l.gates.removed) inOld.set(g.id, 'REMOVED');
  for (const e of l.events.removed) inOld.set(e.id, 'REMOVED');
  for (const g of l.gates.changed) {
    if (g.reordered_only || g.aspects.every((a) => a === 'title')) continue;
    inNew.set(g.id, 'RE-WIRED');
    inOld.set(g.id, 'RE-WIRED');
  }
  const changedEvents = new Set<string>();
  for (const e of l.events.changed) if (e.aspects.some((a) => a !== 'title' && a !== 'assumptions')) changedEvents.add(e.id);
  for (const p of c.changes.data.parameters.changed) if (p.aspects.includes('value')) for (const id of p.used_by) changedEvents.add(id);
  for (const id of changedEvents) {
    if (!inNew.has(id)) inNew.set(id, 'CHANGED');
    if (!inOld.has(id)) inOld.set(id, 'CHANGED');
  }
  return { inNew, inOld };
}

/**
 * Figure parts (about a page each) the changed subtrees may take. A change to one shared parameter
 * marks every event that reads it, and each of their parents roots a subtree: on a study of
 * hundreds of like trains that was hundreds of pages of near-identical drawings, which hide the
 * change they are meant to show. Past the budget, subtrees are listed in a table instead.
 */
export const MAX_COMPARE_PARTS = 40;

export interface ChangedSubtrees {
  figures: FigureBlock[];
  /** Roots of the subtrees drawn, in figure order. */
  drawnRoots: string[];
  /** Subtrees past the drawing budget: their root, what is marked in them, and the root's title. */
  listed: { root: string; title: string; marked: [string, Mark][] }[];
}

export function changedSubtreeFigures(c: Comparison, oldResults: Results, newResults: Results, paper: Paper, nextFigure: () => string): ChangedSubtrees {
  const { inNew, inOld } = changeMarks(c);
  const newRoots = structuralFirst(newResults, inNew, subtreeRoots(newResults, inNew));
  // Plans first, figure numbers after: a subtree past the budget takes no number. Each side's
  // diagram model is made once; a subtree past the budget is not laid out at all.
  const oldGates = new Set(oldResults.logic.gates.map((g) => g.id));
  const newGates = new Map(newResults.logic.gates.map((g) => [g.id, g]));
  const newBase = diagramModel(newResults);
  let oldBase: DiagramModel | undefined;
  const drawn: { root: string; newPlan: SubtreePlan; oldPlan?: SubtreePlan }[] = [];
  const listed: ChangedSubtrees['listed'] = [];
  let budget = MAX_COMPARE_PARTS;
  for (const root of newRoots) {
    const newModel = markedModel(newResults, newBase, inNew, root);
    const list = () => listed.push({ root, title: newGates.get(root)?.title ?? '', marked: markedIn(newModel, inNew) });
    if (budget === 0) {
      list();
      continue;
    }
    const newPlan = subtreePlan(newModel, inNew, root, paper);
    const oldPlan =
      oldGates.has(root) && hasRemovedBelow(oldResults, inOld, root)
        ? subtreePlan(markedModel(oldResults, (oldBase ??= diagramModel(oldResults)), inOld, root), inOld, root, paper)
        : undefined;
    const parts = newPlan.parts + (oldPlan?.parts ?? 0);
    if (parts > budget) {
      // The first subtree that does not fit ends the drawing, so the figures keep the reading order.
      budget = 0;
      list();
      continue;
    }
    budget -= parts;
    drawn.push({ root, newPlan, ...(oldPlan ? { oldPlan } : {}) });
  }
  if (drawn.length === 0) return { figures: [], drawnRoots: [], listed };

  const legendNumber = nextFigure();
  const legendCaption = 'Key to the symbols of the logic diagrams';
  const figures: FigureBlock[] = [
    {
      kind: 'figure',
      id: 'fig-compare-legend',
      number: legendNumber,
      caption: legendCaption,
      parts: [drawLegend(`${legendNumber}. ${legendCaption}`, Math.min(contentBox(paper).width, 470))],
    },
  ];
  for (const { root, newPlan, oldPlan } of drawn) {
    figures.push(...subtreeFigures(newPlan, `Changed subtree ${root}, as in ${revisionName(c, 'new')}`, nextFigure, `cmp-new-${root}`));
    if (oldPlan) figures.push(...subtreeFigures(oldPlan, `The same subtree ${root}, as it was in ${revisionName(c, 'old')}`, nextFigure, `cmp-old-${root}`));
  }
  return { figures, drawnRoots: drawn.map((d) => d.root), listed };
}

/** Subtrees with a structural change (a node added, removed or re-wired) first, then the rest; each group in study order. */
function structuralFirst(results: Results, marks: Map<string, Mark>, roots: string[]): string[] {
  const gates = new Map(results.logic.gates.map((g) => [g.id, g]));
  const structural = (root: string) =>
    [...reachable(results.logic.gates, [root])].some((id) => marks.get(id) === 'NEW' || marks.get(id) === 'RE-WIRED') ||
    gates.get(root)?.inputs.some((i) => marks.get(i) === 'NEW') === true;
  const first = roots.filter(structural);
  const firstSet = new Set(first);
  return [...first, ...roots.filter((r) => !firstSet.has(r))];
}

/** The changed gates and the parents of changed events, minus those inside another one's subtree. */
function subtreeRoots(results: Results, marks: Map<string, Mark>): string[] {
  const gates = new Map(results.logic.gates.map((g) => [g.id, g]));
  const candidates = new Set<string>();
  for (const g of results.logic.gates) {
    if (marks.has(g.id)) candidates.add(g.id);
    else if (g.inputs.some((i) => !gates.has(i) && marks.has(i))) candidates.add(g.id);
  }
  const inside = new Set<string>();
  for (const r of candidates) for (const d of reachable(results.logic.gates, [r])) if (d !== r && candidates.has(d)) inside.add(d);
  // A gate added in NEW sits under its re-wired parent; its own subtree is drawn there.
  return results.logic.gates.map((g) => g.id).filter((id) => candidates.has(id) && !inside.has(id));
}

function hasRemovedBelow(results: Results, marks: Map<string, Mark>, root: string): boolean {
  return [...reachable(results.logic.gates, [root])].some((id) => marks.get(id) === 'REMOVED');
}

/** The diagram model of one subtree: its gates only, titles carrying the marks, no top-event box. */
function markedModel(results: Results, base: DiagramModel, marks: Map<string, Mark>, root: string): DiagramModel {
  // Iterative (a chain of gates thousands deep is a valid study), in the study's gate order.
  const under = reachable(results.logic.gates, [root]);
  const gateIds = results.logic.gates.map((g) => g.id).filter((id) => under.has(id));
  const node = (id: string): DiagramNode => {
    const n = base.node(id);
    const mark = marks.get(id);
    if (!mark || n.kind === 'missing') return n;
    const title = n.kind === 'gate' ? n.title ?? '' : n.title;
    return { ...n, title: `[${mark}] ${title}`.trim() };
  };
  return { tops: [], node, gateIds, eventIds: base.eventIds };
}

interface SubtreePlan {
  model: DiagramModel;
  capacity: Capacity;
  trees: FigureTree[];
  /** Figure parts the subtree takes. */
  parts: number;
  /** The marked nodes inside it (gates and their inputs), in mark order. */
  marked: [string, Mark][];
}

/** The marked nodes of a subtree (its gates and their inputs), in mark order. */
function markedIn(model: DiagramModel, marks: Map<string, Mark>): [string, Mark][] {
  const inSubtree = new Set(model.gateIds);
  for (const g of model.gateIds) {
    const n = model.node(g);
    if (n.kind === 'gate') for (const i of n.inputs) inSubtree.add(i);
  }
  return [...marks.entries()].filter(([id]) => inSubtree.has(id));
}

function subtreePlan(model: DiagramModel, marks: Map<string, Mark>, root: string, paper: Paper): SubtreePlan {
  const capacity = capacityFor(paper);
  // The subtree's own root first: the first figure carries the subtree's caption and its marks.
  const trees = partition(model, capacity).sort((a, b) => Number(b.root === root) - Number(a.root === root));
  const parts = trees.reduce((sum, t) => sum + figurePartCount(t, capacity, model), 0);
  return { model, capacity, trees, parts, marked: markedIn(model, marks) };
}

function subtreeFigures(plan: SubtreePlan, caption: string, nextFigure: () => string, idPrefix: string): FigureBlock[] {
  const { model, capacity, trees, marked } = plan;
  const numbers = new Map(trees.map((t, i) => [t.root, { number: nextFigure(), anchor: `fig-${idPrefix}${i === 0 ? '' : `-${t.root}`}`.replace(/[^A-Za-z0-9_-]/g, '_') }]));
  const continuation = (id: string) => numbers.get(id) ?? { number: 'Figure ?', anchor: `fig-${idPrefix}` };
  return trees.map((t, i) => {
    const { number, anchor } = numbers.get(t.root)!;
    const text = i === 0 ? caption : `${caption}: continuation ${t.root}`;
    const draw = (tree: TreeNode) => {
      const layout = layoutTree(tree, false);
      return { svg: drawFigure({ model, layout, caption: `${number}. ${text}`, tops: [], continuation }), width: layout.width, height: layout.height };
    };
    const note =
      i === 0 && marked.length > 0
        ? `Marked: ${marked.map(([id, m]) => `[${m}] ${id}`).join(', ')}.`
        : t.referencedFrom.length > 0
          ? `Continued from ${t.referencedFrom.map((r) => numbers.get(r)!.number.toLowerCase()).join(', ')}.`
          : undefined;
    return {
      kind: 'figure' as const,
      id: anchor,
      number,
      caption: text,
      parts: figureParts(t, capacity, model, draw),
      ...(t.orientation === 'landscape' ? { landscape: true } : {}),
      ...(note ? { note } : {}),
    };
  });
}
