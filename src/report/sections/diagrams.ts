import { para } from '../blocks.js';
import type { SectionRule } from '../context.js';
import { logicFigures } from '../diagram/index.js';

/** The logic diagrams: the symbol key, then one figure per top event and per continued subtree. */
export const diagrams: SectionRule = (results, ctx) => {
  const figures = logicFigures(results, ctx.paper, { nextFigure: ctx.nextFigure, nextTable: ctx.nextTable });
  if (figures.length === 0) return null;
  return {
    id: 'sec-diagrams',
    number: ctx.number,
    title: 'Logic diagrams',
    blocks: [
      para(
        'The fault trees are drawn top-down with the usual symbols (first figure). Each box gives the identifier, the title ',
        'and the probability used for that node at the snapshot date. A subtree used in more than one place is drawn once, ',
        'on its own figure, and every use of it shows a transfer triangle naming that figure; so does a subtree moved to a ',
        'figure of its own because the tree would not fit on one page.',
      ),
      ...figures,
    ],
  };
};
