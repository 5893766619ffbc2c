import type { D3Selection } from 'd3-node';
import { formatProbability } from '../format.js';
import { ACCENT, FILL_GATE, FILL_TOP, INK, MUTED, RULE, createCanvas, round, serialize, text } from './canvas.js';
import { G, type Layout, type Placed } from './layout.js';
import { gateWords, type DiagramModel, type DiagramTop } from './model.js';
import type { TreeNode } from './partition.js';
import { andPath, diamondPath, housePath, notBubble, notPath, orPath, trianglePath } from './symbols.js';
import { wrap } from './text.js';

/**
 * Drawing one figure of a logic diagram from its layout: label boxes (id, wrapped title,
 * probability), the gate and event symbols, the connecting bus lines, and transfer triangles that
 * name the figure continuing the subtree.
 *
 * Nodes carry `data-node`/`data-kind` (and `data-target` on transfers) so tests and readers of
 * the SVG can find them without parsing geometry.
 */
export interface DrawInput {
  model: DiagramModel;
  layout: Layout;
  caption: string;
  /** The top events drawn as a box above the root (usually zero or one). */
  tops: DiagramTop[];
  /** Gate id → { figure number ("Figure 6.3"), anchor id } of the figure it continues on. */
  continuation: (gateId: string) => { number: string; anchor: string };
}

const ID_SIZE = 7.5;
const TITLE_SIZE = 7;
const PROB_SIZE = 7;
const LINE = 8.5;
const STROKE = 0.8;

export function drawFigure(input: DrawInput): string {
  const { layout } = input;
  const canvas = createCanvas(layout.width, layout.height, input.caption);
  const edges = canvas.svg.append('g').attr('fill', 'none').attr('stroke', INK).attr('stroke-width', STROKE);
  const nodes = canvas.svg.append('g');
  if (input.tops.length > 0) drawTop(nodes, edges, input.tops[0]!, layout);
  drawPlaced(input, edges, nodes, layout.root);
  return serialize(canvas);
}

function drawTop(nodes: D3Selection, edges: D3Selection, top: DiagramTop, layout: Layout): void {
  const x = layout.root.x;
  const left = x - G.topWidth / 2;
  const y = G.margin;
  const g = nodes.append('g').attr('data-node', top.id).attr('data-kind', 'top');
  g.append('rect')
    .attr('x', round(left))
    .attr('y', y)
    .attr('width', G.topWidth)
    .attr('height', G.topHeight)
    .attr('fill', FILL_TOP)
    .attr('stroke', INK)
    .attr('stroke-width', 1.2);
  text(g, x, y + 11, `TOP EVENT  ${top.id}`, ID_SIZE, { weight: 'medium' });
  const lines = wrap(top.title, G.topWidth - 10, TITLE_SIZE, 2);
  lines.forEach((line, i) => text(g, x, y + 21 + i * LINE, line, TITLE_SIZE, { fill: MUTED }));
  text(g, x, y + G.topHeight - 5, `P = ${formatProbability(top.probability)}`, PROB_SIZE, { weight: 'medium', fill: ACCENT });
  line(edges, x, y + G.topHeight, x, layout.rootY);
}

function drawPlaced(input: DrawInput, edges: D3Selection, nodes: D3Selection, p: Placed): void {
  const node = input.model.node(p.node.id);
  const kind = p.node.kind;
  const g = nodes.append('g').attr('data-node', p.node.id).attr('data-kind', kindOf(p.node, input.model));
  const boxBottom = p.y + G.boxHeight;
  const symbolTop = boxBottom + G.stem;
  const title =
    node.kind === 'gate' ? node.title ?? gateWords(node) : node.kind === 'event' ? node.title : 'not defined in the study';
  const probability =
    node.kind === 'event' && node.house
      ? `house: ${node.on ? 'on (1)' : 'off (0)'}`
      : node.kind === 'missing'
        ? 'P = —'
        : node.kind === 'event' && node.commonCause !== undefined && !node.house
          ? `total P = ${formatProbability(node.probability)}`
          : `P = ${formatProbability(node.probability)}`;
  drawBox(g, p.x, p.y, p.node.id, title, probability);

  const sw = G.symbolWidth;
  const sh = G.symbolHeight;
  // A leaf's symbol hangs under its box; a stacked input's sits left of the box, centred on it,
  // and its note (page reference, CCF group) goes under the box instead of under the symbol.
  const sx = p.stacked ? p.stacked.symbolX : p.x;
  const leafTop = p.stacked ? p.y + G.boxHeight / 2 - 11 : symbolTop;
  const noteY = p.stacked ? boxBottom + 8 : undefined;
  if (p.stacked) {
    // Half the symbol's width at the height of its centre, where the tick and the link meet it.
    const half = kind === 'transfer' ? 5.5 : node.kind === 'event' && node.house ? sw * 0.4 : 11;
    const mid = p.y + G.boxHeight / 2;
    line(edges, p.stacked.busX, mid, sx - half, mid);
    line(edges, sx + half, mid, p.x - G.boxWidth / 2, mid);
  } else line(edges, p.x, boxBottom, p.x, symbolTop);
  if (kind === 'transfer') {
    const target = input.continuation(p.node.id);
    g.attr('data-target', target.anchor);
    shape(g, trianglePath(sx, leafTop + 1, sw * 0.85, sh * 0.8), '#ffffff');
    text(g, p.x, noteY ?? symbolTop + sh * 0.8 + 9, `see ${target.number.toLowerCase()}`, 6.8, { italic: true, fill: ACCENT });
    return;
  }
  if (node.kind === 'missing') {
    shape(g, diamondPath(sx, leafTop, p.stacked ? 22 : sw, p.stacked ? 22 : sh * 0.9), '#ffffff');
    return;
  }
  if (node.kind === 'event') {
    if (node.house) shape(g, housePath(sx, leafTop + 1, sw * 0.8, sh * 0.85), '#ffffff');
    else
      g.append('circle')
        .attr('cx', round(sx))
        .attr('cy', round(leafTop + 11))
        .attr('r', 11)
        .attr('fill', '#ffffff')
        .attr('stroke', INK)
        .attr('stroke-width', STROKE);
    if (!node.house && node.commonCause) {
      // Marked by letters, not colour: readable in black and white.
      g.attr('data-common-cause', node.commonCause);
      text(g, sx, leafTop + 13.5, 'CCF', 6.5, { weight: 'medium' });
      const first = noteY ?? symbolTop + 22 + 9;
      text(g, p.x, first, `group ${node.commonCause}`, 6.5, { italic: true });
      text(g, p.x, first + 8, `independent ${formatProbability(node.independent)}`, 6.5, { fill: ACCENT });
    }
    return;
  }
  line(edges, p.x, boxBottom, p.x, symbolTop);
  // A gate: its symbol, then the bus to its inputs.
  if (node.op === 'all') shape(g, andPath(p.x, symbolTop, sw, sh), FILL_GATE);
  else if (node.op === 'not') {
    const bubble = 3;
    shape(g, notPath(p.x, symbolTop, sw, sh, bubble), FILL_GATE);
    const b = notBubble(p.x, symbolTop, bubble);
    g.append('circle').attr('cx', b.cx).attr('cy', b.cy).attr('r', b.r).attr('fill', '#ffffff').attr('stroke', INK).attr('stroke-width', STROKE);
  } else shape(g, orPath(p.x, symbolTop, sw, sh), FILL_GATE);
  if (node.op === 'atleast') text(g, p.x, symbolTop + sh - 5, `${node.k ?? '?'}/${node.inputs.length}`, 7, { weight: 'medium' });

  if (p.children.length === 0) return;
  const symbolBottom = symbolTop + sh - (node.op === 'all' ? 0 : sh * 0.15);
  const busY = symbolTop + sh + G.busGap;
  line(edges, p.x, symbolBottom, p.x, busY);
  if (p.children.some((c) => c.stacked)) {
    // Stacked inputs: one vertical bus per column, down to its last input's tick (drawn with it).
    const ends = new Map<number, number>();
    for (const c of p.children) if (c.stacked) ends.set(c.stacked.busX, Math.max(ends.get(c.stacked.busX) ?? 0, c.y + G.boxHeight / 2));
    const xs = [...ends.keys(), p.x];
    line(edges, Math.min(...xs), busY, Math.max(...xs), busY);
    for (const [x, end] of ends) line(edges, x, busY, x, end);
    for (const c of p.children) drawPlaced(input, edges, nodes, c);
    return;
  }
  const first = p.children[0]!.x;
  const last = p.children[p.children.length - 1]!.x;
  if (last > first) line(edges, first, busY, last, busY);
  for (const c of p.children) {
    line(edges, c.x, busY, c.x, c.y);
    drawPlaced(input, edges, nodes, c);
  }
}

function kindOf(node: TreeNode, model: DiagramModel): string {
  if (node.kind === 'event') {
    const e = model.node(node.id);
    return e.kind === 'event' && e.house ? 'house' : 'event';
  }
  return node.kind;
}

/** The label box: id (medium), title wrapped to what is left of four lines, probability under a rule. */
function drawBox(g: D3Selection, x: number, y: number, id: string, title: string, probability: string): void {
  const w = G.boxWidth;
  const left = x - w / 2;
  g.append('rect')
    .attr('x', round(left))
    .attr('y', round(y))
    .attr('width', w)
    .attr('height', G.boxHeight)
    .attr('fill', '#ffffff')
    .attr('stroke', INK)
    .attr('stroke-width', STROKE);
  const idLines = wrap(id, w - 6, ID_SIZE, 2, 'medium');
  const titleLines = wrap(title, w - 6, TITLE_SIZE, 4 - idLines.length);
  let baseline = y + 9.5;
  for (const l of idLines) {
    text(g, x, baseline, l, ID_SIZE, { weight: 'medium' });
    baseline += LINE;
  }
  for (const l of titleLines) {
    text(g, x, baseline, l, TITLE_SIZE, { fill: MUTED });
    baseline += LINE;
  }
  const ruleY = y + G.boxHeight - 12;
  g.append('line')
    .attr('x1', round(left + 4))
    .attr('y1', round(ruleY))
    .attr('x2', round(left + w - 4))
    .attr('y2', round(ruleY))
    .attr('stroke', RULE)
    .attr('stroke-width', 0.5);
  text(g, x, y + G.boxHeight - 3.5, probability, PROB_SIZE, { weight: 'medium', fill: ACCENT });
}

function shape(g: D3Selection, d: string, fill: string): void {
  g.append('path').attr('d', d).attr('fill', fill).attr('stroke', INK).attr('stroke-width', STROKE);
}

function line(parent: D3Selection, x1: number, y1: number, x2: number, y2: number): void {
  parent.append('line').attr('x1', round(x1)).attr('y1', round(y1)).attr('x2', round(x2)).attr('y2', round(y2));
}
