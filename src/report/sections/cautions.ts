import { callout, code } from '../blocks.js';
import type { SectionRule } from '../context.js';
import type { Block } from '../view.js';

/**
 * Conditions of use, in the project's own words. They go on the first pages, before any number,
 * because an appendix is often read out of its report.
 */
export const cautions: SectionRule = (results, ctx) => {
  const asOf = results.study.as_of;
  const blocks: Block[] = [
    callout(
      'caution',
      'Read before using any number in this appendix',
      [
        'This study is an aid to engineering judgement, not a substitute for it. Any decision about the safety, operation, ',
        'maintenance or upgrading of the facility remains with a licensed professional engineer and with the owner.',
      ],
      [
        'Local regulations, codes and standards, and the owner’s dam-safety guidelines, govern. Where they require more than ',
        'this appendix provides, or something different, they take precedence over it.',
      ],
      [
        'Every result rests on the data listed in this appendix with their sources, on the stated assumptions, and on ',
        'basic events being independent except where a common cause is modelled. If any of these does not hold, the numbers do not either.',
      ],
      [
        'Each number is a snapshot at ',
        code(asOf),
        ': equipment ages, is repaired or replaced, and its records change. A later date needs a new run, not an adjustment by hand.',
      ],
      [
        'Failure data for gate machinery and its power and controls are scarce. The figures are uncertain, often by a ',
        'factor of several either way: use them to compare options and to rank what matters most, not as precise predictions.',
      ],
    ),
  ];
  const invented = results.sources.filter((s) => s.invented).map((s) => s.id);
  if (invented.length > 0) {
    blocks.push(
      callout('warning', 'Invented data', [
        `${invented.length === results.sources.length ? 'All' : 'Some'} of the sources of this study are marked as invented `,
        '(for demonstration or training). The numbers resting on them illustrate the method and describe no real equipment.',
      ]),
    );
  }
  return { id: 'sec-cautions', number: ctx.number, title: 'Cautions and conditions of use', blocks };
};
