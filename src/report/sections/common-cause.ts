import type { CommonCauseResult } from '../../analysis/results.js';
import { anchor, type BuildContext, type SectionRule } from '../context.js';
import { callout, code, col, keyValues, para, row, subheading, table, xref, type Part } from '../blocks.js';
import { formatCount, formatNumber, formatProbability } from '../format.js';
import type { Block } from '../view.js';

const METHOD_WORDS: Record<CommonCauseResult['method'], string> = {
  beta: 'beta factor',
  mgl: 'multiple Greek letter',
  alpha: 'alpha factor',
};

/**
 * The common-cause groups: method, parameters with their sources, the members before and after the
 * expansion, and every shared event it made, with a notice where the members were unlike.
 */
export const commonCause: SectionRule = (results, ctx) => {
  const groups = results.common_cause ?? [];
  if (groups.length === 0) return null;
  const blocks: Block[] = [
    para(
      'Each group is expanded by the parametric models of NUREG/CR-5485 (US NRC 1998, ',
      { text: 'Guidelines on Modeling Common-Cause Failures in Probabilistic Risk Assessment', em: true },
      '). A member’s id stands for its independent part; its total is its own model probability; the shared part is the ',
      'sum of the shared events that include it. Every result of this appendix includes the groups. ',
      xref('methods', 'Method and formulas: {}.', 'method-ccf'),
    ),
  ];
  for (const g of groups) blocks.push(...groupBlocks(g, ctx));
  return { id: 'sec-common-cause', number: ctx.number, title: 'Common-cause failures', blocks };
};

function groupBlocks(g: CommonCauseResult, ctx: BuildContext): Block[] {
  const m = g.members.length;
  const sources = g.parameters.map((p) => ctx.parametersByKey.get(p.key)?.source).filter((s): s is string => Boolean(s));
  const blocks: Block[] = [
    subheading(anchor('ccf', g.id), `${g.id}${g.title ? ` — ${g.title}` : ''}`),
    keyValues([
      { key: 'Members', value: g.members.map((x) => x.id).join(', '), code: true },
      { key: 'Method', value: `${METHOD_WORDS[g.method]}${g.testing ? `, ${g.testing} testing` : ''} (NUREG/CR-5485)` },
      {
        key: 'Parameters',
        value: g.parameters.map((p) => `${p.field} = ${formatNumber(p.value)}`).join(', ') + (sources.length ? ` (source: ${[...new Set(sources)].join(', ')})` : ' (no source cited)'),
      },
      { key: 'Shared events made', value: `${formatCount(g.shared.length)} (subsets of two or more of the ${formatCount(m)} members${g.method === 'beta' ? '; the beta factor gives only the all-member event' : ''})` },
    ]),
  ];
  // First-order total of each member after the expansion: its independent part plus every shared event that contains it.
  const shared = g.members.map((mem) => g.shared.filter((s) => s.members.includes(mem.id)).reduce((a, s) => a + s.probability, 0));
  const after = g.members.map((mem, i) => mem.independent + shared[i]!);
  blocks.push(
    table({
      id: anchor('tab-ccf-members', g.id),
      number: ctx.nextTable(),
      caption: `Members of ${g.id} before and after the expansion`,
      columns: [
        col('Member', 'left', { code: true, width: 'auto' }),
        col('Total Q_t (own model)', 'right', { width: 'auto' }),
        col('Independent part (the member’s id)', 'right', { width: 'auto' }),
        col('Shared part (shared events with it)', 'right', { width: 'auto' }),
        col('Independent + shared (first order)', 'right', { width: 'auto' }),
      ],
      rows: g.members.map((mem, i) => row([mem.id, formatProbability(mem.total), formatProbability(mem.independent), formatProbability(shared[i]), formatProbability(after[i])])),
      note: `Shared events use Q_t = ${formatProbability(g.reference_total)}, the mean of the members’ own probabilities.`,
    }),
    table({
      id: anchor('tab-ccf-events', g.id),
      number: ctx.nextTable(),
      caption: `Shared (common-cause) events of ${g.id}`,
      columns: [col('Event', 'left', { code: true, width: 'auto' }), col('Fails together', 'left', { code: true, width: 4 }), col('Probability', 'right', { width: 'auto' })],
      rows: g.shared.map((s) => row([s.id, s.members.join(', '), formatProbability(s.probability)])),
    }),
  );
  if (g.unequal_totals) {
    const lo = Math.min(...g.members.map((x) => x.total));
    const hi = Math.max(...g.members.map((x) => x.total));
    const words: Part[] = [
      `The members’ own probabilities range from ${formatProbability(lo)} to ${formatProbability(hi)} (their ages or data differ). `,
      g.rule,
      ' An engineer may prefer to model unlike members in separate groups, or to justify a parameter for the group as it is.',
    ];
    blocks.push(callout('warning', `Unlike members in ${g.id}`, words));
  }
  blocks.push(
    para(
      'In the cut sets, a shared event such as ',
      code(g.shared[0]?.id ?? `${g.id}/ccf-…`),
      ' appears as a single event: one cause failing every member listed, which is why a redundant arrangement of like members is rarely as good as independence would suggest.',
    ),
  );
  return blocks;
}
