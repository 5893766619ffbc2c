import type { Results } from '../../analysis/results.js';
import { listWords } from '../blocks.js';
import { anchor } from '../context.js';
import { contentBox } from '../paper.js';
import type { FigureBlock, FigurePart, Paper } from '../view.js';
import { windowed } from './canvas.js';
import { drawFigure } from './draw.js';
import { G, capacityFor, layoutTree } from './layout.js';
import { drawLegend } from './legend.js';
import { diagramModel, gateWords, type DiagramModel } from './model.js';
import { partition, type FigureTree } from './partition.js';

/**
 * The logic diagrams of the appendix as figure blocks: a key to the symbols, then one figure per
 * top event and per continued subtree (shared, or cut off to fit a page), each naming where it is
 * referenced from.
 */
export function logicFigures(results: Results, paper: Paper, nextFigure: () => string): FigureBlock[] {
  const model = diagramModel(results);
  const capacity = capacityFor(paper);
  const trees = partition(model, capacity);
  if (trees.length === 0) return [];

  const legendNumber = nextFigure();
  const numbers = new Map(trees.map((t) => [t.root, { number: nextFigure(), anchor: anchor('fig', t.root) }]));
  const continuation = (id: string) => numbers.get(id) ?? { number: 'Figure ?', anchor: anchor('fig', id) };
  const pageWidth = contentBox(paper).width;

  const legendCaption = 'Key to the symbols of the logic diagrams';
  const figures: FigureBlock[] = [
    {
      kind: 'figure',
      id: 'fig-legend',
      number: legendNumber,
      caption: legendCaption,
      parts: [drawLegend(`${legendNumber}. ${legendCaption}`, Math.min(pageWidth, 470))],
    },
  ];

  for (const t of trees) {
    const { number, anchor: id } = numbers.get(t.root)!;
    const tops = model.tops.filter((top) => t.tops.includes(top.id));
    const caption = captionFor(t, model);
    const layout = layoutTree(t.tree, tops.length > 0);
    const svg = drawFigure({ model, layout, caption: `${number}. ${caption}`, tops, continuation });
    const note = noteFor(t, model, numbers);
    figures.push({
      kind: 'figure',
      id,
      number,
      caption,
      parts: slice(svg, layout.width, layout.height, layout.columns, capacity.columns),
      ...(note ? { note } : {}),
    });
  }
  return figures;
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

function noteFor(t: FigureTree, model: DiagramModel, numbers: Map<string, { number: string }>): string | undefined {
  const parts: string[] = [];
  if (t.tops.length > 1) parts.push(`Also the gate of top events ${t.tops.slice(1).join(', ')}.`);
  if (t.tops.length > 0 && model.node(t.root).kind === 'gate') parts.push(`Top gate: ${t.root}.`);
  if (t.referencedFrom.length > 0) {
    const from = t.referencedFrom.map((r) => numbers.get(r)!.number.toLowerCase());
    parts.push(`Continued from ${listWords(from)}${t.reason === 'shared' ? ' (drawn once, referenced by transfer)' : ''}.`);
  }
  return parts.length > 0 ? parts.join(' ') : undefined;
}

/**
 * A figure wider than a page (a gate with more inputs than fit side by side, and more leaf inputs
 * than a page's stacked columns hold; see `stackFor`) is cut at column boundaries into page-wide
 * parts, each showing the drawing at full size.
 */
export function slice(svg: string, width: number, height: number, columns: number, perPage: number): FigurePart[] {
  if (columns <= perPage) return [{ svg, width, height }];
  const parts: FigurePart[] = [];
  for (let first = 0; first < columns; first += perPage) {
    const count = Math.min(perPage, columns - first);
    const x = first * G.column;
    const w = count * G.column + 2 * G.margin;
    parts.push({ svg: windowed(svg, x, w, height), width: w, height });
  }
  return parts;
}
