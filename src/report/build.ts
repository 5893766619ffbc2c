import type { Results } from '../analysis/results.js';
import type { InputFile } from '../study/types.js';
import { makeContext } from './context.js';
import { SECTIONS, type SectionSlot } from './sections/index.js';
import type { Appendix, Paper, Section } from './view.js';

/**
 * Results → the appendix as plain data. Runs the section rules in their fixed order; a rule that
 * returns null uses no section number. Nothing here reads the clock or the file system.
 */
export function buildAppendix(results: Results, inputs: InputFile[], paper: Paper, slots: readonly SectionSlot[] = SECTIONS): Appendix {
  const sections: Section[] = [];
  let number = 0;
  for (const slot of slots) {
    if (!slot.rule) continue;
    const numbered = slot.numbered !== false;
    const ctx = makeContext(results, inputs, paper, numbered ? String(number + 1) : '');
    const section = slot.rule(results, ctx);
    if (!section) continue;
    if (numbered) {
      number += 1;
      section.number = String(number);
    } else {
      delete section.number;
    }
    sections.push(section);
  }
  const s = results.study;
  const date = s.issued ?? s.as_of;
  const draft = s.status !== 'issued';
  return {
    format: 'faultbook-appendix/1',
    paper,
    language: 'en',
    cover: {
      facility: s.facility,
      title: s.title,
      kind: 'Failure-probability study — appendix',
      revision: s.revision,
      status: s.status,
      date,
      draft,
    },
    header: { title: s.title, revision: s.revision, status: s.status },
    meta: {
      title: `${s.title} — ${s.facility}`,
      author: s.prepared_by.join('; '),
      subject: `Failure-probability study, revision ${s.revision} (${s.status}), snapshot ${s.as_of}`,
      keywords: ['fault tree', 'failure probability', 'minimal cut sets', s.facility].join(', '),
      creator: `${results.tool.name} ${results.tool.version}`,
      date,
    },
    toc: sections.map((sec) => ({ id: sec.id, ...(sec.number ? { number: sec.number } : {}), title: sec.title })),
    sections,
  };
}
