import { anchor, type SectionRule } from '../context.js';
import { para, subheading } from '../blocks.js';
import type { Block } from '../view.js';

/** The assumptions register: each assumption, and the events and parameters that rest on it. */
export const assumptions: SectionRule = (results, ctx) => {
  if (results.assumptions.length === 0) return null;
  const blocks: Block[] = [
    para(
      'Each assumption below is numbered as in the study. The events and parameters listed under it are those whose ',
      'values would have to be revisited if the assumption were found not to hold; an assumption without such a list ',
      'bears on the model as a whole.',
    ),
  ];
  for (const a of results.assumptions) {
    blocks.push(subheading(anchor('assumption', a.id), `${a.id} ${a.title}`));
    if (a.body.trim()) blocks.push({ kind: 'markdown', source: a.body });
    const items = [
      ...(a.events.length > 0 ? [{ key: 'Events resting on it', value: a.events.join(', '), code: true }] : []),
      ...(a.parameters.length > 0 ? [{ key: 'Parameters resting on it', value: a.parameters.join(', '), code: true }] : []),
    ];
    if (items.length > 0) blocks.push({ kind: 'keyvalue', items });
  }
  return { id: 'sec-assumptions', number: ctx.number, title: 'Assumptions register', blocks };
};
