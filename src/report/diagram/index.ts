import type { Results } from '../../analysis/results.js';
import { listWords } from '../blocks.js';
import { anchor } from '../context.js';
import { formatProbability } from '../format.js';
import { contentBox } from '../paper.js';
import type { FigureBlock, FigurePart, Paper, TableBlock } from '../view.js';
import { drawFigure } from './draw.js';
import { capacityFor, layoutTree, pageStack, stackFor } from './layout.js';
import { drawLegend } from './legend.js';
import { diagramModel, gateWords, type DiagramModel } from './model.js';
import { gatesIn, partition, transfers, type Capacity, type FigureTree, type TreeNode } from './partition.js';

/**
 * Limits that keep the diagrams of a large study readable and bounded (the rule is stated in the
 * appendix under the figures it affects):
 * - at most `MAX_DRAWN_PARTS` figure parts (about a page each) are drawn, the upper levels first:
 *   figures in order of how many transfers lie between them and a top event, then in reading
 *   order; the first that does not fit the budget and every one after it are listed instead;
 * - a gate with more leaf inputs than `MAX_PARTS_PER_GATE` pages of stacked inputs hold is listed
 *   instead of drawn (a top's gate is still drawn, as its box alone).
 * A listed gate is a row of the table of logic not drawn (its kind and its inputs), and every
 * transfer to it names that table. Beyond `INDEX_ABOVE` figures, or when anything is listed, an
 * index of transfers says where each continued gate is drawn or listed.
 */
export const MAX_DRAWN_PARTS = 100;
export const MAX_PARTS_PER_GATE = 4;
export const INDEX_ABOVE = 20;
/** Input ids per row of the table of logic not drawn (rows are then short enough to break between pages). */
const INPUTS_PER_ROW = 60;

export interface DiagramNumbers {
  nextFigure: () => string;
  nextTable: () => string;
}

/**
 * The logic diagrams of the appendix as blocks: a key to the symbols, the index of transfers (large
 * studies), then one figure per top event and per continued subtree (shared, or cut off to fit a
 * page), each naming where it is referenced from, then the table of logic not drawn (if any).
 */
export function logicFigures(results: Results, paper: Paper, numbers: DiagramNumbers): (FigureBlock | TableBlock)[] {
  const model = diagramModel(results);
  const capacity = capacityFor(paper);
  const trees = partition(model, capacity);
  if (trees.length === 0) return [];

  const plan = planFigures(model, trees, capacity);
  const legendNumber = numbers.nextFigure();
  const indexNumber = plan.index ? numbers.nextTable() : undefined;
  const listNumber = plan.listed.length > 0 ? numbers.nextTable() : undefined;
  const listAnchor = 'tab-logic-not-drawn';
  const where = new Map<string, { number: string; anchor: string }>();
  for (const t of plan.drawn) where.set(t.root, { number: numbers.nextFigure(), anchor: anchor('fig', t.root) });
  for (const t of plan.listed) if (!where.has(t.root)) where.set(t.root, { number: listNumber!, anchor: listAnchor });
  const continuation = (id: string) => where.get(id) ?? { number: 'Figure ?', anchor: anchor('fig', id) };
  const pageWidth = contentBox(paper).width;

  const legendCaption = 'Key to the symbols of the logic diagrams';
  const blocks: (FigureBlock | TableBlock)[] = [
    {
      kind: 'figure',
      id: 'fig-legend',
      number: legendNumber,
      caption: legendCaption,
      parts: [drawLegend(`${legendNumber}. ${legendCaption}`, Math.min(pageWidth, 470))],
    },
  ];
  if (indexNumber) blocks.push(transferIndex(indexNumber, trees, model, where));

  for (const t of plan.drawn) {
    const { number, anchor: id } = where.get(t.root)!;
    const tops = model.tops.filter((top) => t.tops.includes(top.id));
    const caption = captionFor(t, model);
    const draw = (tree: TreeNode) => {
      const layout = layoutTree(tree, tops.length > 0);
      return { svg: drawFigure({ model, layout, caption: `${number}. ${caption}`, tops, continuation }), width: layout.width, height: layout.height };
    };
    let parts: FigurePart[];
    let listedHere = false;
    if (plan.stubs.has(t.root)) {
      parts = [draw({ kind: 'gate', id: t.root, children: [] })];
      listedHere = true;
    } else parts = figureParts(t, capacity, model, draw);
    const note = noteFor(t, model, where, listedHere ? listNumber : undefined);
    blocks.push({
      kind: 'figure',
      id,
      number,
      caption,
      parts,
      ...(t.orientation === 'landscape' ? { landscape: true } : {}),
      ...(note ? { note } : {}),
    });
  }
  if (listNumber) blocks.push(notDrawnTable(listNumber, listAnchor, plan, model, where));
  return blocks;
}

interface Plan {
  drawn: FigureTree[];
  /** Figures whose gates are listed in the table instead of drawn. */
  listed: FigureTree[];
  /** Listed top figures still drawn as the top box over the gate's box. */
  stubs: Set<string>;
  index: boolean;
}

function planFigures(model: DiagramModel, trees: FigureTree[], capacity: Capacity): Plan {
  const partsOf = (t: FigureTree) => figurePartCount(t, capacity, model);
  const tooWide = (t: FigureTree) => partsOf(t) > MAX_PARTS_PER_GATE;
  const byLevel = trees.map((t, i) => ({ t, i })).sort((a, b) => a.t.depth - b.t.depth || a.i - b.i);
  const keep = new Set<string>();
  const stubs = new Set<string>();
  let budget = MAX_DRAWN_PARTS;
  let full = false;
  for (const { t } of byLevel) {
    const isTop = t.tops.length > 0;
    if (tooWide(t)) {
      if (isTop) stubs.add(t.root);
      continue;
    }
    const parts = partsOf(t);
    if (!full && parts <= budget) {
      keep.add(t.root);
      budget -= parts;
    } else {
      full = true;
      // A top's figure is always drawn, as its box alone when it is listed.
      if (isTop) stubs.add(t.root);
    }
  }
  const drawn = trees.filter((t) => keep.has(t.root) || stubs.has(t.root));
  const listed = trees.filter((t) => !keep.has(t.root));
  const referenced = trees.some((t) => t.referencedFrom.length > 0);
  return { drawn, listed, stubs, index: referenced && (listed.length > 0 || drawn.length > INDEX_ABOVE) };
}

/**
 * The parts a figure is printed in: one drawing, or for a gate of more leaf inputs than a page's
 * stack holds, one drawing per page of inputs (each part draws only its own inputs, so the output
 * grows linearly with the number of inputs).
 */
export function figureParts(t: FigureTree, capacity: Capacity, model: DiagramModel, draw: (tree: TreeNode) => FigurePart): FigurePart[] {
  return t.orientation === 'parts' ? inParts(t.tree, capacity, model).map(draw) : [draw(t.tree)];
}

/** How many parts figureParts will print the figure in, without drawing them. */
export function figurePartCount(t: FigureTree, capacity: Capacity, model: DiagramModel): number {
  return t.orientation === 'parts' ? Math.max(1, Math.ceil(t.tree.children.length / inputsPerPart(t.tree, capacity, model))) : 1;
}

/** Leaf inputs one part of a stacked gate holds (see inParts). */
function inputsPerPart(tree: TreeNode & { kind: 'gate' }, capacity: Capacity, model: DiagramModel): number {
  const noted = tree.children.some((c) => c.kind === 'transfer' || isCommonCause(model, c));
  const page = pageStack(capacity, noted);
  return Math.max(1, page.rows * page.columns);
}

/** A gate of more leaf inputs than a page's stack holds, as one tree per page-sized part. */
function inParts(tree: FigureTree['tree'], capacity: Capacity, model: DiagramModel): TreeNode[] {
  const noted = tree.children.some((c) => c.kind === 'transfer' || isCommonCause(model, c));
  const per = inputsPerPart(tree, capacity, model);
  const parts: TreeNode[] = [];
  for (let first = 0; first < tree.children.length; first += per) {
    const children = tree.children.slice(first, first + per);
    const stack = stackFor(children.length, capacity, noted);
    parts.push({ kind: 'gate', id: tree.id, children, ...(stack ? { stack } : {}) });
  }
  return parts;
}

function isCommonCause(model: DiagramModel, leaf: TreeNode): boolean {
  const n = model.node(leaf.id);
  return leaf.kind === 'event' && n.kind === 'event' && !n.house && n.commonCause !== undefined;
}

function captionFor(t: FigureTree, model: DiagramModel): string {
  const gate = model.node(t.root);
  const gateLabel = gate.kind === 'gate' ? `${t.root} — ${gate.title ?? gateWords(gate)}` : t.root;
  if (t.tops.length > 0) {
    const top = model.tops.find((x) => x.id === t.tops[0])!;
    return `Top event ${top.id}: ${top.title}`;
  }
  switch (t.reason) {
    case 'shared':
      return `Shared subtree ${gateLabel}`;
    case 'unused':
      return `Gate ${gateLabel} (not reached from any top event)`;
    default:
      return `Continuation: ${gateLabel}`;
  }
}

function noteFor(t: FigureTree, model: DiagramModel, where: Map<string, { number: string }>, listedIn?: string): string | undefined {
  const parts: string[] = [];
  if (t.tops.length > 1) parts.push(`Also the gate of top events ${t.tops.slice(1).join(', ')}.`);
  if (t.tops.length > 0 && model.node(t.root).kind === 'gate') parts.push(`Top gate: ${t.root}.`);
  if (listedIn) {
    const g = model.node(t.root);
    const n = g.kind === 'gate' ? g.inputs.length : 0;
    parts.push(`Its ${n.toLocaleString('en-US')} inputs are too many to draw legibly; they are listed in ${listedIn.toLowerCase()}.`);
  }
  if (t.referencedFrom.length > 0) {
    const from = t.referencedFrom.map((r) => where.get(r)!.number.toLowerCase());
    const unique = [...new Set(from)];
    parts.push(`Continued from ${listWords(unique)}${t.reason === 'shared' ? ' (drawn once, referenced by transfer)' : ''}.`);
  }
  if (t.orientation === 'parts' && !listedIn) parts.push('Drawn in parts, a page of inputs each.');
  return parts.length > 0 ? parts.join(' ') : undefined;
}

/** Where each gate that some figure continues by transfer is drawn (or listed), and who refers to it. */
function transferIndex(number: string, trees: FigureTree[], model: DiagramModel, where: Map<string, { number: string }>): TableBlock {
  const rows = trees
    .filter((t) => t.referencedFrom.length > 0)
    .map((t) => {
      const g = model.node(t.root);
      const title = g.kind === 'gate' ? g.title ?? gateWords(g) : '';
      const from = [...new Set(t.referencedFrom.map((r) => where.get(r)!.number))];
      return { cells: [t.root, title, where.get(t.root)!.number, from.join(', ')] };
    });
  return {
    kind: 'table',
    id: 'tab-transfer-index',
    number,
    caption: 'Index of transfers: where each continued subtree is drawn',
    columns: [
      { label: 'Gate', align: 'left', code: true },
      { label: 'Title', align: 'left', width: 2 },
      { label: 'Drawn in', align: 'left' },
      { label: 'Referenced from', align: 'left', width: 2 },
    ],
    rows,
  };
}

/** Every gate of the figures not drawn: its logic and inputs, so the model stays complete on paper. */
function notDrawnTable(number: string, id: string, plan: Plan, model: DiagramModel, where: Map<string, { number: string }>): TableBlock {
  const rows: TableBlock['rows'] = [];
  for (const t of plan.listed) {
    const continued = new Set(transfers(t.tree));
    for (const gateId of gatesIn(t.tree)) {
      const g = model.node(gateId);
      if (g.kind !== 'gate') continue;
      const title = g.title ?? '';
      const p = `P = ${formatProbability(g.probability)}`;
      const inputs = g.inputs.map((i) => (continued.has(i) && where.get(i)?.number !== number ? `${i} (${where.get(i)?.number ?? '?'})` : i));
      for (let first = 0; first < inputs.length || first === 0; first += INPUTS_PER_ROW) {
        const chunk = inputs.slice(first, first + INPUTS_PER_ROW).join(', ');
        const label = inputs.length > INPUTS_PER_ROW ? ` (${first + 1}–${Math.min(inputs.length, first + INPUTS_PER_ROW)} of ${inputs.length})` : '';
        rows.push({ cells: first === 0 ? [gateId, title, gateWords(g), p, chunk + label] : ['', '', '', '', chunk + label] });
        if (inputs.length === 0) break;
      }
    }
  }
  return {
    kind: 'table',
    id,
    number,
    caption: 'Logic not drawn: gates listed instead of drawn',
    columns: [
      { label: 'Gate', align: 'left', code: true },
      { label: 'Title', align: 'left', width: 2 },
      { label: 'Logic', align: 'left', width: 'auto' },
      { label: 'P', align: 'right', width: 'auto' },
      { label: 'Inputs (figure or table that continues an input)', align: 'left', width: 5 },
    ],
    rows,
    note:
      `The rule: at most ${MAX_DRAWN_PARTS} figure parts (about a page each) are drawn, the upper levels first (figures with fewer transfers ` +
      `between them and a top event, then in reading order); a gate with more inputs than ${MAX_PARTS_PER_GATE} pages of stacked inputs hold, ` +
      'and every figure past the budget, is listed here instead, with its logic and inputs.',
  };
}
