import { stackFor, stackLevels, stackSpan, type Stack } from './layout.js';
import type { DiagramModel, DiagramNode } from './model.js';

/**
 * Splitting the logic into page-sized figures.
 *
 * A gate is the root of its own figure when it is the gate of a top event, when several parents
 * (or tops) use it (a shared subtree: drawn once, referenced by transfer), or when the figure that
 * would hold it is too wide or too deep for a page. Everywhere else a reference to such a gate is a
 * transfer symbol naming the figure that continues it.
 *
 * A gate of only leaf inputs, more than fit across, is stacked (the rule is at `stackFor` in
 * layout.ts); the decision is made here, where the page capacity is known, and carried on the tree
 * node so every layout of the tree draws it the same way. A stacked gate counts as the columns and
 * levels its block takes.
 *
 * Pure: ids in, trees out; the drawing and the figure numbers come later.
 */

export interface Capacity {
  /** Leaves (columns) a figure may be wide. */
  columns: number;
  /** Node levels a figure may be deep, the root's level included. */
  levels: number;
}

export type TreeNode =
  | { kind: 'gate'; id: string; children: TreeNode[]; stack?: Stack }
  | { kind: 'event'; id: string }
  | { kind: 'missing'; id: string }
  /** A gate drawn elsewhere: its own figure is rooted at `id`. */
  | { kind: 'transfer'; id: string };

export interface FigureTree {
  /** The gate this figure is rooted at. */
  root: string;
  tree: TreeNode & { kind: 'gate' };
  /** Top events whose gate is this root. */
  tops: string[];
  /** Roots of the figures that reference this one by transfer, in figure order. */
  referencedFrom: string[];
  /** Why it has its own figure. */
  reason: 'top' | 'shared' | 'size' | 'unused';
}

export function partition(model: DiagramModel, capacity: Capacity): FigureTree[] {
  const uses = countUses(model);
  const reasons = new Map<string, FigureTree['reason']>();
  for (const top of model.tops) if (model.node(top.gate).kind === 'gate') reasons.set(top.gate, 'top');
  for (const id of model.gateIds) if ((uses.get(id) ?? 0) > 1 && !reasons.has(id)) reasons.set(id, 'shared');

  // Figures in order of first reference: the tops' figures first, then continuations breadth-first.
  const order: string[] = [];
  const queued = new Set<string>();
  const enqueue = (id: string) => {
    if (!queued.has(id)) {
      queued.add(id);
      order.push(id);
    }
  };
  for (const top of model.tops) if (reasons.has(top.gate)) enqueue(top.gate);

  const trees = new Map<string, FigureTree['tree']>();
  const drawn = new Set<string>();
  for (let i = 0; i < order.length || adoptOrphan(); i++) {
    const root = order[i]!;
    let tree = build(model, root, reasons, capacity);
    // Cut the figure down until it fits; each cut makes a new figure root (possibly cut again later).
    for (;;) {
      const cut = chooseCut(tree, capacity);
      if (!cut) break;
      reasons.set(cut, 'size');
      tree = build(model, root, reasons, capacity);
    }
    trees.set(root, tree);
    for (const id of gatesIn(tree)) drawn.add(id);
    for (const t of transfers(tree)) enqueue(t);
  }

  /** A gate no top reaches still gets drawn (its own figure), so the diagrams show the whole model. */
  function adoptOrphan(): boolean {
    const orphan = model.gateIds.find((id) => !drawn.has(id) && !queued.has(id));
    if (orphan === undefined) return false;
    reasons.set(orphan, 'unused');
    enqueue(orphan);
    return true;
  }

  const referencedFrom = new Map<string, string[]>();
  for (const root of order) {
    for (const t of transfers(trees.get(root)!)) {
      const list = referencedFrom.get(t) ?? [];
      if (!list.includes(root)) list.push(root);
      referencedFrom.set(t, list);
    }
  }
  return order.map((root) => ({
    root,
    tree: trees.get(root)!,
    tops: model.tops.filter((t) => t.gate === root).map((t) => t.id),
    referencedFrom: referencedFrom.get(root) ?? [],
    reason: reasons.get(root)!,
  }));
}

/** How many parents (gates or tops) refer to each id. */
function countUses(model: DiagramModel): Map<string, number> {
  const uses = new Map<string, number>();
  const bump = (id: string) => uses.set(id, (uses.get(id) ?? 0) + 1);
  for (const top of model.tops) bump(top.gate);
  for (const id of model.gateIds) {
    const g = model.node(id);
    if (g.kind === 'gate') for (const input of new Set(g.inputs)) bump(input);
  }
  return uses;
}

function build(model: DiagramModel, root: string, roots: Map<string, unknown>, capacity: Capacity): FigureTree['tree'] {
  const visit = (id: string, isRoot: boolean, path: Set<string>): TreeNode => {
    const node: DiagramNode = model.node(id);
    if (node.kind !== 'gate') return { kind: node.kind, id };
    // A cycle cannot come from a valid study; drawing it as a transfer keeps the report total.
    if ((!isRoot && roots.has(id)) || path.has(id)) return { kind: 'transfer', id };
    const inner = new Set(path).add(id);
    const children = node.inputs.map((c) => visit(c, false, inner));
    const stack = children.every((c) => c.kind !== 'gate') ? stackFor(children.length, capacity, children.some((c) => hasNote(model, c))) : null;
    return { kind: 'gate', id, children, ...(stack ? { stack } : {}) };
  };
  return visit(root, true, new Set()) as FigureTree['tree'];
}

/** A leaf drawn with a line of text under it: a transfer's "see figure", a CCF member's group. */
function hasNote(model: DiagramModel, leaf: TreeNode): boolean {
  if (leaf.kind === 'transfer') return true;
  const n = model.node(leaf.id);
  return leaf.kind === 'event' && n.kind === 'event' && !n.house && n.commonCause !== undefined;
}

/** Layout columns the subtree takes: one per leaf, or the span of a stacked block. */
export function leafCount(node: TreeNode): number {
  if (node.kind !== 'gate' || node.children.length === 0) return 1;
  if (node.stack) return stackSpan(node.stack);
  return node.children.reduce((n, c) => n + leafCount(c), 0);
}

/** Levels the subtree takes, its own included; a stacked block counts the levels it covers. */
export function depthOf(node: TreeNode): number {
  if (node.kind !== 'gate' || node.children.length === 0) return 1;
  if (node.stack) return 1 + stackLevels(node.stack);
  return 1 + Math.max(...node.children.map(depthOf));
}

/** Gates drawn in full (not as transfers) in this tree. */
export function gatesIn(node: TreeNode): string[] {
  return node.kind === 'gate' ? [node.id, ...node.children.flatMap(gatesIn)] : [];
}

export function transfers(node: TreeNode): string[] {
  if (node.kind === 'transfer') return [node.id];
  if (node.kind !== 'gate') return [];
  const out: string[] = [];
  for (const c of node.children) for (const t of transfers(c)) if (!out.includes(t)) out.push(t);
  return out;
}

/**
 * The gate to move to its own figure, or null if the tree fits (or cannot be made to fit by cutting:
 * a single gate with more inputs than a page is wide, and not stacked, is sliced into parts when
 * drawn instead).
 *
 * Too deep: the first gate (left to right) on the deepest level from which its subtree runs past
 * the last allowed level (a gate with gate children on the last level but one, or a stacked gate
 * whose block runs too low), so the cut keeps as much as possible in this figure.
 * Too wide: the widest non-root subtree that fits a page on its own, so each cut removes as much as
 * possible; if none fits, the widest one (it is cut again in its own figure).
 */
function chooseCut(tree: FigureTree['tree'], capacity: Capacity): string | null {
  if (depthOf(tree) > capacity.levels) {
    const found = deepestOverrun(tree, capacity.levels);
    if (found) return found;
  }
  if (leafCount(tree) <= capacity.columns) return null;
  const candidates: { id: string; width: number }[] = [];
  const collect = (node: TreeNode, isRoot: boolean) => {
    if (node.kind !== 'gate') return;
    if (!isRoot && node.children.length > 0) candidates.push({ id: node.id, width: leafCount(node) });
    for (const c of node.children) collect(c, false);
  };
  collect(tree, true);
  // Cutting a one-leaf subtree never narrows the figure.
  const useful = candidates.filter((c) => c.width > 1);
  if (useful.length === 0) return null;
  const fitting = useful.filter((c) => c.width <= capacity.columns);
  const pool = fitting.length > 0 ? fitting : useful;
  let best = pool[0]!;
  for (const c of pool) if (c.width > best.width) best = c;
  return best.id;
}

function deepestOverrun(tree: TreeNode, levels: number): string | null {
  let best: { id: string; level: number } | null = null;
  const visit = (node: TreeNode, level: number) => {
    if (node.kind !== 'gate' || node.children.length === 0) return;
    // Only a non-root gate can be cut, and only where a transfer in its place still fits.
    if (level >= 1 && level <= levels - 1 && level + depthOf(node) > levels && (!best || level > best.level)) best = { id: node.id, level };
    for (const c of node.children) visit(c, level + 1);
  };
  visit(tree, 0);
  return best === null ? null : (best as { id: string }).id;
}
