import { callout, keyValues } from '../blocks.js';
import type { SectionRule } from '../context.js';
import type { Block } from '../view.js';

/** Document control: who, what, which revision, and the snapshot date every number is taken at. */
export const titleBlock: SectionRule = (results) => {
  const s = results.study;
  const names = (list: string[]) => (list.length > 0 ? list.join('; ') : 'not stated');
  const blocks: Block[] = [
    keyValues([
      ['Facility', s.facility],
      ...(s.report?.client ? [['Client', s.report.client] as [string, string]] : []),
      ...(s.report?.consultant ? [['Consultant', s.report.consultant] as [string, string]] : []),
      ['Study', s.title],
      ['Revision', s.revision],
      ['Status', s.status],
      ['Issued', s.issued ?? 'not yet issued'],
      ['Snapshot date (as_of)', s.as_of],
      ['Prepared by', names(s.prepared_by)],
      ['Reviewed by', names(s.reviewed_by)],
      ['Produced with', `${results.tool.name} ${results.tool.version}`],
    ]),
  ];
  if (s.status !== 'issued') {
    blocks.push(
      callout('warning', `Status: ${s.status}`, [
        'This revision has not been issued. It may change, and it must not be relied on for decisions until it is issued and signed off by the reviewer.',
      ]),
    );
  }
  return { id: 'sec-title-block', title: 'Document control', blocks };
};
