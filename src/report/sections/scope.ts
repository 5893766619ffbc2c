import { code, col, para, row, table } from '../blocks.js';
import type { SectionRule } from '../context.js';
import type { Block } from '../view.js';

/** Scope and job: the author's statement of purpose, and the top events the study answers. */
export const scope: SectionRule = (results, ctx) => {
  const blocks: Block[] = [];
  if (results.study.scope) blocks.push({ kind: 'markdown', source: results.study.scope });
  if (results.logic.tops.length > 0) {
    blocks.push(
      para(
        'The study answers one question per top event below: the probability that the event occurs on demand, ',
        'with the equipment as it stands at the snapshot date ',
        code(results.study.as_of),
        '.',
      ),
      table({
        id: 'tab-tops',
        number: ctx.nextTable(),
        caption: 'Top events studied',
        columns: [col('Top event', 'left', { code: true, width: 'auto' }), col('What it means', 'left', { width: 3 }), col('Top gate', 'left', { code: true, width: 'auto' })],
        rows: results.logic.tops.map((t) => row([t.id, t.title, t.gate])),
      }),
    );
  }
  if (blocks.length === 0) return null;
  return { id: 'sec-scope', number: ctx.number, title: 'Scope and purpose', blocks };
};
