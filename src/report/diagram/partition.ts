import { stackFor, stackLevels, stackSpan, type Stack } from './layout.js';
import type { DiagramModel } from './model.js';

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
  /** The same on a landscape page, when a figure may take one (wider, less deep). */
  landscape?: { columns: number; levels: number };
  /** Levels more a figure has without a top-event box over its root (portrait, landscape). */
  withoutTopBox?: { levels: number; landscapeLevels: number };
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
  /** The page the figure needs: portrait, landscape (wider than a portrait page), or several
   * portrait parts (a gate of more leaf inputs than one page's stack holds; see `pagedStack`). */
  orientation: 'portrait' | 'landscape' | 'parts';
  /** How many figures lie between the tops' and this one (0 for a top's own figure). */
  depth: number;
}

/** The size of a subtree as drawn: layout columns and levels (its own level included). */
interface Size {
  width: number;
  depth: number;
}

/**
 * Cuts are made bottom-up in one pass: each gate first takes its inputs' subtrees as they came out
 * (each already cut to fit), and if the result would not fit a page, the inputs that overflow are
 * moved to figures of their own, the deepest first when it is too deep, then the widest first. So
 * every gate is visited once, each figure keeps as much as fits under its root, and the upper
 * levels stay with the figure of the top. No recursion: a chain of gates thousands deep is walked
 * with an explicit stack.
 */
export function partition(model: DiagramModel, capacity: Capacity): FigureTree[] {
  const uses = countUses(model);
  const reasons = new Map<string, FigureTree['reason']>();
  for (const top of model.tops) if (model.node(top.gate).kind === 'gate') reasons.set(top.gate, 'top');
  for (const id of model.gateIds) if ((uses.get(id) ?? 0) > 1 && !reasons.has(id)) reasons.set(id, 'shared');

  const trees = new Map<string, FigureTree['tree']>();
  const sizes = new Map<string, Size>();
  const built = new Set<string>();
  const fits = (s: Size) => fitsPortrait(s, capacity) || fitsLandscape(s, capacity);
  // The root of a figure with no top box over it may take the levels that box would have used.
  const roomy = roomier(capacity);
  const rootCapacity = (id: string) => (reasons.get(id) === 'top' ? capacity : roomy);

  /** Build the figure rooted at `root` and every unshared gate under it (post-order, iterative). */
  const buildFigure = (root: string) => {
    built.add(root);
    type Frame = { id: string; inputs: string[]; next: number; children: TreeNode[]; childSizes: Size[] };
    const frameOf = (id: string): Frame => {
      const g = model.node(id);
      return { id, inputs: g.kind === 'gate' ? g.inputs : [], next: 0, children: [], childSizes: [] };
    };
    const stack: Frame[] = [frameOf(root)];
    const onPath = new Set<string>([root]);
    let finished: { node: TreeNode; size: Size } | null = null;
    while (stack.length > 0) {
      const f = stack[stack.length - 1]!;
      if (finished) {
        f.children.push(finished.node);
        f.childSizes.push(finished.size);
        finished = null;
      }
      if (f.next < f.inputs.length) {
        const id = f.inputs[f.next++]!;
        const n = model.node(id);
        if (n.kind !== 'gate') {
          f.children.push({ kind: n.kind, id });
          f.childSizes.push({ width: 1, depth: 1 });
        } else if (reasons.has(id) || onPath.has(id) || built.has(id)) {
          // Its own figure (top, shared); a cycle, impossible in a valid study, is drawn as a
          // transfer too, which keeps the report total.
          f.children.push({ kind: 'transfer', id });
          f.childSizes.push({ width: 1, depth: 1 });
        } else {
          built.add(id);
          onPath.add(id);
          stack.push(frameOf(id));
        }
        continue;
      }
      stack.pop();
      onPath.delete(f.id);
      const isRoot = stack.length === 0;
      const own = isRoot ? rootCapacity(f.id) : capacity;
      const ownFits = isRoot ? (s: Size) => fitsPortrait(s, own) || fitsLandscape(s, own) : fits;
      const done = finishGate(model, f.id, f.children, f.childSizes, own, ownFits, (cut, tree, size) => {
        reasons.set(cut, 'size');
        trees.set(cut, tree);
        sizes.set(cut, size);
      });
      if (isRoot) {
        trees.set(f.id, done.node);
        sizes.set(f.id, done.size);
      } else finished = done;
    }
  };

  for (const top of model.tops) if (reasons.get(top.gate) === 'top' && !built.has(top.gate)) buildFigure(top.gate);
  for (const id of model.gateIds) if (reasons.get(id) === 'shared' && !built.has(id)) buildFigure(id);
  // A gate no top reaches still gets drawn (its own figure), so the diagrams show the whole model:
  // the unused gates nothing else uses first, then whatever is left (cycles).
  for (const pass of [0, 1]) {
    for (const id of model.gateIds) {
      if (built.has(id) || (pass === 0 && (uses.get(id) ?? 0) > 0)) continue;
      reasons.set(id, 'unused');
      buildFigure(id);
    }
  }

  // Figure order: the tops' figures, then every other figure at its first reference, each
  // continuation right after the figure that refers to it (depth first), so a cut-off subtree
  // follows its parent; figures nothing refers to last.
  const order: string[] = [];
  const depth = new Map<string, number>();
  const place = (id: string, level: number) => {
    order.push(id);
    depth.set(id, level);
  };
  const descend = (start: string) => {
    const todo: [string, number][] = [];
    const pushTransfers = (id: string) => {
      const next = transfers(trees.get(id)!).filter((t) => trees.has(t) && !depth.has(t));
      for (let i = next.length - 1; i >= 0; i--) todo.push([next[i]!, depth.get(id)! + 1]);
    };
    pushTransfers(start);
    while (todo.length > 0) {
      const [id, level] = todo.pop()!;
      if (depth.has(id)) continue;
      place(id, level);
      pushTransfers(id);
    }
  };
  const topRoots = [...new Set(model.tops.map((t) => t.gate).filter((g) => reasons.get(g) === 'top'))];
  for (const g of topRoots) place(g, 0);
  for (const g of topRoots) descend(g);
  for (const id of model.gateIds) {
    if (trees.has(id) && !depth.has(id)) {
      place(id, 0);
      descend(id);
    }
  }

  const referencedFrom = new Map<string, string[]>();
  for (const root of order) {
    for (const t of transfers(trees.get(root)!)) {
      if (!trees.has(t)) continue;
      const list = referencedFrom.get(t) ?? [];
      if (!list.includes(root)) list.push(root);
      referencedFrom.set(t, list);
    }
  }
  return order.map((root) => {
    const size = sizes.get(root)!;
    return {
      root,
      tree: trees.get(root)!,
      tops: model.tops.filter((t) => t.gate === root).map((t) => t.id),
      referencedFrom: referencedFrom.get(root) ?? [],
      reason: reasons.get(root)!,
      orientation: fitsPortrait(size, rootCapacity(root)) ? 'portrait' : fitsLandscape(size, rootCapacity(root)) ? 'landscape' : 'parts',
      depth: depth.get(root) ?? 0,
    };
  });
}

function roomier(c: Capacity): Capacity {
  if (!c.withoutTopBox) return c;
  return {
    columns: c.columns,
    levels: c.levels + c.withoutTopBox.levels,
    ...(c.landscape ? { landscape: { columns: c.landscape.columns, levels: c.landscape.levels + c.withoutTopBox.landscapeLevels } } : {}),
  };
}

function fitsPortrait(s: Size, c: Capacity): boolean {
  return s.width <= c.columns && s.depth <= c.levels;
}

function fitsLandscape(s: Size, c: Capacity): boolean {
  return c.landscape !== undefined && s.width <= c.landscape.columns && s.depth <= c.landscape.levels;
}

/**
 * One gate, its inputs already built: cut the inputs that keep it from fitting a page (each cut
 * input becomes a figure of its own via `cut`), decide whether its leaf inputs are stacked, and
 * return the gate's tree node and size.
 */
function finishGate(
  model: DiagramModel,
  id: string,
  children: TreeNode[],
  sizes: Size[],
  capacity: Capacity,
  fits: (s: Size) => boolean,
  cut: (id: string, tree: TreeNode & { kind: 'gate' }, size: Size) => void,
): { node: TreeNode & { kind: 'gate' }; size: Size } {
  const maxLevels = Math.max(capacity.levels, capacity.landscape?.levels ?? 0);
  const cutAt = (i: number) => {
    const child = children[i] as TreeNode & { kind: 'gate' };
    cut(child.id, child, sizes[i]!);
    children[i] = { kind: 'transfer', id: child.id };
    sizes[i] = { width: 1, depth: 1 };
  };
  const cuttable = (i: number) => children[i]!.kind === 'gate' && (children[i] as { children: TreeNode[] }).children.length > 0;
  // Too deep whatever the page: every input subtree that runs past the last level goes.
  for (let i = 0; i < children.length; i++) if (cuttable(i) && 1 + sizes[i]!.depth > maxLevels) cutAt(i);
  let width = 0;
  for (const s of sizes) width += s.width;
  // Still too big for either page: the widest inputs go first (ties: the leftmost), and with
  // them the depth they carried. Sorted once, so a gate of thousands of inputs stays cheap.
  const byDepth = children.map((_, i) => i).sort((a, b) => sizes[b]!.depth - sizes[a]!.depth || a - b);
  let deepest = 0;
  const depthNow = () => {
    while (deepest < byDepth.length && !cuttable(byDepth[deepest]!)) deepest++;
    const gates = deepest < byDepth.length ? sizes[byDepth[deepest]!]!.depth : 1;
    return 1 + Math.max(1, gates);
  };
  const byWidth = children.map((_, i) => i).filter((i) => cuttable(i)).sort((a, b) => sizes[b]!.width - sizes[a]!.width || a - b);
  for (const i of byWidth) {
    if (fits({ width, depth: children.length === 0 ? 1 : depthNow() })) break;
    width -= sizes[i]!.width - 1;
    cutAt(i);
  }
  const node: TreeNode & { kind: 'gate' } = { kind: 'gate', id, children };
  if (children.length === 0) return { node, size: { width: 1, depth: 1 } };
  if (children.every((c) => c.kind !== 'gate') && children.length > capacity.columns) {
    const noted = children.some((c) => hasNote(model, c));
    const stack = stackFor(children.length, capacity, noted);
    if (stack) {
      node.stack = stack;
      return { node, size: { width: stackSpan(stack), depth: 1 + stackLevels(stack) } };
    }
    // More leaf inputs than one page's stack holds: drawn in parts of a page each (never fits
    // inside another figure, so its parent moves it to its own).
    return { node, size: { width: Number.POSITIVE_INFINITY, depth: 1 } };
  }
  return { node, size: { width, depth: depthNow() } };
}

/** How many parents (gates or tops) refer to each id. */
function countUses(model: DiagramModel): Map<string, number> {
  const uses = new Map<string, number>();
  const bump = (id: string) => uses.set(id, (uses.get(id) ?? 0) + 1);
  for (const top of model.tops) bump(top.gate);
  for (const id of model.gateIds) {
    const g = model.node(id);
    // An input listed twice by one gate counts twice: it is drawn once, as a shared subtree.
    if (g.kind === 'gate') for (const input of g.inputs) bump(input);
  }
  return uses;
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

/** Gates drawn in full (not as transfers) in this tree. Iterative: a figure is shallow, but a caller's tree may not be. */
export function gatesIn(node: TreeNode): string[] {
  const out: string[] = [];
  const todo: TreeNode[] = [node];
  while (todo.length > 0) {
    const n = todo.pop()!;
    if (n.kind !== 'gate') continue;
    out.push(n.id);
    for (let i = n.children.length - 1; i >= 0; i--) todo.push(n.children[i]!);
  }
  return out;
}

/** The gates this tree continues elsewhere, in drawing order, each once. */
export function transfers(node: TreeNode): string[] {
  const out: string[] = [];
  const seen = new Set<string>();
  const todo: TreeNode[] = [node];
  while (todo.length > 0) {
    const n = todo.pop()!;
    if (n.kind === 'transfer' && !seen.has(n.id)) {
      seen.add(n.id);
      out.push(n.id);
    } else if (n.kind === 'gate') for (let i = n.children.length - 1; i >= 0; i--) todo.push(n.children[i]!);
  }
  return out;
}
