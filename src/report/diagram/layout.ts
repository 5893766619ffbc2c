import type { Paper } from '../view.js';
import { contentBox } from '../paper.js';
import type { Capacity, TreeNode } from './partition.js';

/**
 * Geometry of the logic diagrams and a top-down tidy layout: every leaf gets its own column, in
 * input order, and each gate sits centred over its first and last input. Simple, deterministic and
 * never overlapping; the partition keeps each figure narrow enough for a page.
 *
 * The one exception is a stacked gate (see `stackFor`): its leaf inputs hang from a vertical bus
 * in a few compact columns, each label box beside its symbol, instead of one row per input.
 *
 * All lengths are points, and the SVG uses 1 unit = 1 pt, so the drawing prints at its natural
 * size on both papers (labels stay at 7 pt, the smallest size we consider legible on paper).
 */
export const G = {
  margin: 6,
  column: 94,
  boxWidth: 84,
  boxHeight: 52,
  stem: 6,
  symbolWidth: 26,
  symbolHeight: 24,
  busGap: 8,
  drop: 8,
  /** The top-event box above the root gate of a top's figure. */
  topWidth: 170,
  topHeight: 48,
  topGap: 14,
  /** Room under a leaf for its symbol and, for transfers, the "see figure" label. */
  leafExtra: 44,
  /** Room the caption takes on the page, so figure + caption fit. */
  captionAllowance: 46,
} as const;

export const LEVEL_HEIGHT = G.boxHeight + G.stem + G.symbolHeight + G.busGap + G.drop;

/** How many columns and levels fit the printable area of the paper. */
export function capacityFor(paper: Paper): Capacity {
  const fit = (orientation: 'portrait' | 'landscape', topBox: boolean) => {
    const box = contentBox(paper, orientation);
    const columns = Math.floor((box.width - 2 * G.margin) / G.column);
    const free = box.height - G.captionAllowance - 2 * G.margin - (topBox ? G.topHeight + G.topGap : 0) - (G.boxHeight + G.leafExtra);
    const levels = 1 + Math.floor(free / LEVEL_HEIGHT);
    return { columns: Math.max(2, columns), levels: Math.max(2, levels) };
  };
  const portrait = fit('portrait', true);
  const landscape = fit('landscape', true);
  return {
    ...portrait,
    landscape,
    // A figure with no top-event box over its root (a shared or continued subtree) has that room.
    withoutTopBox: { levels: fit('portrait', false).levels - portrait.levels, landscapeLevels: fit('landscape', false).levels - landscape.levels },
  };
}

/**
 * The stacking rule. A gate whose inputs are ALL leaves (basic or house events, transfers,
 * undefined ids) and more than fit side by side across the page is drawn the way bushy trees are
 * drawn by hand on engineering drawings: the inputs are stacked in a column (or a few columns)
 * under the gate, each input's symbol on a short tick from a vertical bus, its label box (the
 * same box, same text) just right of the symbol, and a "see figure"/CCF-group note under the box.
 * That keeps a 7- or 12-input gate on one page part instead of several page-wide windows.
 *
 * The rows per column are the most that keep the gate's figure within the page height when the
 * gate is the root under a top-event box; the columns are as few as hold every input, rows then
 * balanced between them. A gate with more inputs than one page's stack holds keeps the plain row
 * (sliced into page-wide parts when drawn), as does any gate with a non-leaf input.
 */
export const STACK = {
  /** From the column's left edge: bus line, tick, symbol, link to the box. */
  gutter: 40,
  busInset: 3,
  /** Centre of the symbol from the column's left edge. */
  symbolOffset: 20,
  /** Between two stack columns. */
  columnGap: 8,
  /** Between two rows. */
  rowGap: 6,
  /** The line under a box for a transfer's "see figure" or a CCF member's group. */
  note: 18,
} as const;

export interface Stack {
  columns: number;
  rows: number;
  /** Some input carries a note under its box (rows are then taller by `STACK.note`). */
  noted: boolean;
}

const stackPitchX = STACK.gutter + G.boxWidth + STACK.columnGap;
const stackPitchY = (s: Pick<Stack, 'noted'>) => G.boxHeight + STACK.rowGap + (s.noted ? STACK.note : 0);

/** Width and height of the stacked block (top of the first row to the bottom of the last). */
export function stackSize(s: Stack): { width: number; height: number } {
  return { width: s.columns * stackPitchX - STACK.columnGap, height: s.rows * stackPitchY(s) - STACK.rowGap };
}

/** Layout columns (of `G.column`) the stacked block takes: a leaf column keeps its side margins. */
export function stackSpan(s: Stack): number {
  return Math.ceil((stackSize(s).width + G.column - G.boxWidth) / G.column);
}

/** Levels the stacked block takes below its gate, counted as `depthOf` counts them (a leaf is 1). */
export function stackLevels(s: Stack): number {
  const beyondLeaf = stackSize(s).height - (G.boxHeight + G.leafExtra);
  return 1 + Math.max(0, Math.ceil(beyondLeaf / LEVEL_HEIGHT));
}

/** The largest stack one page holds: rows that keep the figure within the page, columns across it. */
export function pageStack(capacity: Capacity, noted: boolean): { rows: number; columns: number } {
  let rows = 0;
  while (1 + stackLevels({ columns: 1, rows: rows + 1, noted }) <= capacity.levels) rows++;
  let columns = 0;
  while (stackSpan({ columns: columns + 1, rows: 1, noted }) <= capacity.columns) columns++;
  return { rows, columns };
}

/** The stack for a gate with `inputs` leaf inputs, or null when they stay in one row (or need more than a page). */
export function stackFor(inputs: number, capacity: Capacity, noted: boolean): Stack | null {
  if (inputs <= capacity.columns) return null;
  const page = pageStack(capacity, noted);
  if (page.rows < 2 || page.columns < 1 || inputs > page.rows * page.columns) return null;
  // As many columns as the page holds, at least two rows each: a wide block is shorter, so the
  // figure leaves room on its page for the next one.
  const columns = Math.min(page.columns, Math.ceil(inputs / 2));
  return { columns, rows: Math.ceil(inputs / columns), noted };
}

export interface Placed {
  node: TreeNode;
  /** Centre of the node's column span (of its label box, for a stacked input). */
  x: number;
  /** Top of the node's label box. */
  y: number;
  level: number;
  children: Placed[];
  /** A stacked input: its symbol is left of its box, on a tick from the bus at `busX`. */
  stacked?: { busX: number; symbolX: number };
}

export interface Layout {
  root: Placed;
  columns: number;
  levels: number;
  width: number;
  height: number;
  /** y of the root's label box (below the top-event box when there is one). */
  rootY: number;
}

export function layoutTree(tree: TreeNode, withTopBox: boolean): Layout {
  let column = 0;
  let levels = 0;
  let bottom = 0;
  const rootY = G.margin + (withTopBox ? G.topHeight + G.topGap : 0);
  const place = (node: TreeNode, level: number): Placed => {
    levels = Math.max(levels, level + 1);
    const y = rootY + level * LEVEL_HEIGHT;
    if (node.kind !== 'gate' || node.children.length === 0) {
      const x = G.margin + (column + 0.5) * G.column;
      column += 1;
      bottom = Math.max(bottom, y + G.boxHeight + G.leafExtra);
      return { node, x, y, level, children: [] };
    }
    if (node.stack) return placeStack(node, node.stack, level, y);
    const children = node.children.map((c) => place(c, level + 1));
    const x = (children[0]!.x + children[children.length - 1]!.x) / 2;
    return { node, x, y, level, children };
  };
  /** The stacked block, centred in the columns it spans; inputs fill each column top to bottom. */
  const placeStack = (node: TreeNode & { kind: 'gate' }, stack: Stack, level: number, y: number): Placed => {
    const span = stackSpan(stack);
    const spanLeft = G.margin + column * G.column;
    column += span;
    levels = Math.max(levels, level + stackLevels(stack) + 1);
    const size = stackSize(stack);
    const blockLeft = spanLeft + (span * G.column - size.width) / 2;
    const top = y + LEVEL_HEIGHT;
    const pitchY = stackPitchY(stack);
    const children = node.children.map((c, i): Placed => {
      const colLeft = blockLeft + Math.floor(i / stack.rows) * stackPitchX;
      const rowTop = top + (i % stack.rows) * pitchY;
      bottom = Math.max(bottom, rowTop + pitchY - STACK.rowGap);
      return {
        node: c,
        x: colLeft + STACK.gutter + G.boxWidth / 2,
        y: rowTop,
        level: level + 1,
        children: [],
        stacked: { busX: colLeft + STACK.busInset, symbolX: colLeft + STACK.symbolOffset },
      };
    });
    return { node, x: spanLeft + (span * G.column) / 2, y, level, children };
  };
  const root = place(tree, 0);
  const width = Math.max(column * G.column, withTopBox ? G.topWidth + 8 : 0) + 2 * G.margin;
  // Centre a narrow tree under a wide top box.
  const shift = width / 2 - G.margin - (column * G.column) / 2;
  if (shift > 0) translate(root, shift);
  const height = bottom + G.margin;
  return { root, columns: column, levels, width, height, rootY };
}

function translate(p: Placed, dx: number): void {
  p.x += dx;
  if (p.stacked) p.stacked = { busX: p.stacked.busX + dx, symbolX: p.stacked.symbolX + dx };
  for (const c of p.children) translate(c, dx);
}
