import type { TopResult } from '../../analysis/results.js';
import { anchor, type SectionRule } from '../context.js';
import { callout, code, col, para, row, strong, subheading, table, xref, type Part } from '../blocks.js';
import { formatCount, formatProbability } from '../format.js';
import type { Block } from '../view.js';

/**
 * The top-event probabilities: the exact value and the two cut-set approximations side by side,
 * with a sentence on what their difference means, and a visible notice when the "exact" figure is
 * only a bound. Also the warnings the analysis raised.
 */
export const resultsSection: SectionRule = (results, ctx) => {
  if (results.tops.length === 0) return null;
  const blocks: Block[] = [];
  blocks.push(
    table({
      id: 'tab-results-summary',
      number: ctx.nextTable(),
      caption: 'Top-event probabilities at the snapshot date',
      columns: [
        col('Top event', 'left', { code: true, width: 'auto' }),
        col('What it means', 'left', { width: 3 }),
        col('Probability', 'right', { width: 'auto' }),
        col('Basis', 'left', { width: 'auto' }),
      ],
      rows: results.tops.map((t) =>
        row([t.id, t.title, formatProbability(t.probability.exact), t.probability.basis === 'exact' ? 'exact' : 'BOUND (see below)']),
      ),
    }),
  );
  if (results.uncertainty?.length) {
    blocks.push(
      para(
        strong('Which figure to carry forward. '),
        'The probabilities above are point values: the model evaluated with every parameter at its stated value. ',
        'A risk assessment that annualises risk usually carries forward the Monte Carlo mean, which is usually higher than the ',
        'point value because the inputs’ uncertainty is skewed and like components share one draw; the uncertainty section',
        xref('uncertainty', ' ({})'),
        ' gives both with the 5th and 95th percentiles, and the key findings repeat them.',
        xref('methods', ' Method: {}.', 'method-uncertainty'),
      ),
    );
  }
  for (const top of results.tops) blocks.push(...topBlocks(top, ctx.nextTable));
  blocks.push(
    para(
      '“Exact” above means free of the cut-set approximation: quote it rather than either approximation; where they differ, ',
      'the gap shows how much a cut-set-only method would have been off. ',
      results.tops.every((t) => t.cut_set_summary.coherent)
        ? 'Every tree is coherent (no negation), so for independent events the exact value cannot exceed the MCUB, nor the MCUB the rare-event sum.'
        : '',
    ),
  );
  if (results.warnings.length > 0) {
    blocks.push(
      subheading('sub-warnings', 'Warnings raised by the analysis'),
      table({
        id: 'tab-warnings',
        number: ctx.nextTable(),
        caption: 'Warnings',
        columns: [col('Code', 'left', { code: true, width: 'auto' }), col('Message', 'left', { width: 4 }), col('Where', 'left', { code: true, width: 'auto' })],
        rows: results.warnings.map((w) => row([w.code, w.message, w.at ? `${w.at.file}:${w.at.line}` : '—'])),
      }),
    );
  }
  return { id: 'sec-results', number: ctx.number, title: 'Results', blocks };
};

function topBlocks(top: TopResult, nextTable: () => string): Block[] {
  const p = top.probability;
  const bound = p.basis === 'bound';
  const exact = formatProbability(p.exact);
  const rare = formatProbability(p.rare_event);
  const mcub = formatProbability(p.mcub);
  const blocks: Block[] = [subheading(anchor('result', top.id), `${top.id} — ${top.title}`)];
  if (bound) {
    blocks.push(
      callout(
        'bound',
        'This result is a bound, not an exact value',
        [
          'The decision diagram for this top event grew past its node budget (setting ',
          code('max_nodes'),
          '), and the run was allowed to fall back on cut-set bounds. The figure shown as the result is therefore an upper bound, ',
          'the min-cut upper bound over the minimal cut sets kept and every partial product the cutoff dropped, not the exact probability. ',
          'Raise the node budget, or simplify the model, to obtain the exact value.',
        ],
      ),
    );
  }
  blocks.push(
    table({
      id: anchor('tab-result', top.id),
      number: nextTable(),
      caption: `Probability of ${top.id} by three methods`,
      columns: [col('Method', 'left', { width: 2 }), col('Probability', 'right', { width: 'auto' }), col('How it is obtained', 'left', { width: 4 })],
      rows: [
        row([
          bound ? 'Result (bound; see notice)' : 'Exact',
          exact,
          bound
            ? 'Not exact: the decision diagram exceeded its node budget; value from the cut-set bounds.'
            : 'From the binary decision diagram of the whole tree: no approximation, overlaps between cut sets counted once.',
        ]),
        row([
          'Rare-event approximation',
          rare,
          'Sum of the probabilities of the listed minimal cut sets; counts every overlap between cut sets again.',
        ]),
        row(['Min-cut upper bound (MCUB)', mcub, 'One minus the product of (1 − P) over the listed minimal cut sets.']),
      ],
    }),
    para(...comparison(top, exact, rare, mcub)),
    para(
      `Minimal cut sets listed: ${formatCount(top.cut_set_summary.listed)}; decision-diagram nodes: ${formatCount(top.bdd_nodes)}.`,
      top.cut_set_summary.coherent
        ? ''
        : ' The tree contains negation (it is not coherent), so neither approximation is guaranteed to lie above the exact value; only the exact figure should be used.',
    ),
  );
  return blocks;
}

/** What the spread between the three figures tells the reader, from the printed strings only. */
function comparison(top: TopResult, exact: string, rare: string, mcub: string): Part[] {
  const lead: Part[] = [strong(`Reading the three figures for ${top.id}. `)];
  if (exact === rare && exact === mcub) {
    return [
      ...lead,
      `They agree to the three significant figures shown (${exact}): the cut sets are improbable enough, and overlap little enough, `,
      'that the simple approximations would have served.',
    ];
  }
  const truncated = top.cut_set_summary.truncated > 0;
  return [
    ...lead,
    `The approximations differ from the exact value (rare-event ${rare}, MCUB ${mcub}, exact ${exact}): built from cut sets alone, `,
    'they overstate the probability when cut-set probabilities are not small or cut sets share events, and understate it ',
    'when cut sets were dropped by the cutoff or order limit',
    truncated ? ' (as some were here; see the cut-set section)' : '',
    '.',
  ];
}
