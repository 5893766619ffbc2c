import type { Paper } from '../view.js';
import { contentBox } from '../paper.js';
import type { Capacity, TreeNode } from './partition.js';

/**
 * Geometry of the logic diagrams and a top-down tidy layout: every leaf gets its own column, in
 * input order, and each gate sits centred over its first and last input. Simple, deterministic and
 * never overlapping; the partition keeps each figure narrow enough for a page.
 *
 * All lengths are points, and the SVG uses 1 unit = 1 pt, so the drawing prints at its natural
 * size on both papers (labels stay at 7 pt, the smallest size we consider legible on paper).
 */
export const G = {
  margin: 6,
  column: 94,
  boxWidth: 84,
  boxHeight: 56,
  stem: 6,
  symbolWidth: 26,
  symbolHeight: 24,
  busGap: 12,
  drop: 12,
  /** The top-event box above the root gate of a top's figure. */
  topWidth: 170,
  topHeight: 48,
  topGap: 14,
  /** Room under a leaf for its symbol and, for transfers, the "see figure" label. */
  leafExtra: 36,
  /** Room the caption takes on the page, so figure + caption fit. */
  captionAllowance: 46,
} as const;

export const LEVEL_HEIGHT = G.boxHeight + G.stem + G.symbolHeight + G.busGap + G.drop;

/** How many columns and levels fit the printable area of the paper. */
export function capacityFor(paper: Paper): Capacity {
  const box = contentBox(paper);
  const columns = Math.floor((box.width - 2 * G.margin) / G.column);
  const free = box.height - G.captionAllowance - 2 * G.margin - (G.topHeight + G.topGap) - (G.boxHeight + G.leafExtra);
  const levels = 1 + Math.floor(free / LEVEL_HEIGHT);
  return { columns: Math.max(2, columns), levels: Math.max(2, levels) };
}

export interface Placed {
  node: TreeNode;
  /** Centre of the node's column span. */
  x: number;
  /** Top of the node's label box. */
  y: number;
  level: number;
  children: Placed[];
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
  const rootY = G.margin + (withTopBox ? G.topHeight + G.topGap : 0);
  const place = (node: TreeNode, level: number): Placed => {
    levels = Math.max(levels, level + 1);
    const y = rootY + level * LEVEL_HEIGHT;
    if (node.kind !== 'gate' || node.children.length === 0) {
      const x = G.margin + (column + 0.5) * G.column;
      column += 1;
      return { node, x, y, level, children: [] };
    }
    const children = node.children.map((c) => place(c, level + 1));
    const x = (children[0]!.x + children[children.length - 1]!.x) / 2;
    return { node, x, y, level, children };
  };
  const root = place(tree, 0);
  const width = Math.max(column * G.column, withTopBox ? G.topWidth + 8 : 0) + 2 * G.margin;
  // Centre a narrow tree under a wide top box.
  const shift = width / 2 - G.margin - (column * G.column) / 2;
  if (shift > 0) translate(root, shift);
  const height = rootY + (levels - 1) * LEVEL_HEIGHT + G.boxHeight + G.leafExtra + G.margin;
  return { root, columns: column, levels, width, height, rootY };
}

function translate(p: Placed, dx: number): void {
  p.x += dx;
  for (const c of p.children) translate(c, dx);
}
