import type { Results } from '../analysis/results.js';
import type { InputFile } from '../study/types.js';
import { makeContext } from './context.js';
import { SECTIONS, type SectionSlot } from './sections/index.js';
import type { Appendix, Block, Paper, Run, Section } from './view.js';

/**
 * Results → the appendix as plain data. Runs the section rules in their fixed order; a rule that
 * returns null, or a section the study leaves out (`report: omit`), uses no section number. Rules
 * of `late` slots (the key findings) run after all the others, so they can point at their sections.
 * Nothing here reads the clock or the file system.
 */
export function buildAppendix(results: Results, inputs: InputFile[], paper: Paper, slots: readonly SectionSlot[] = SECTIONS): Appendix {
  const report = results.study.report ?? {};
  const omit = new Set(report.omit ?? []);
  const prefix = report.appendix ? `${report.appendix}.` : '';
  const built = new Map<string, { number: string; id: string; section: Section }>();
  let number = 0;
  for (const slot of slots) {
    if (!slot.rule || slot.late || omit.has(slot.name)) continue;
    const numbered = slot.numbered !== false;
    const ctx = makeContext(results, inputs, paper, numbered ? `${prefix}${number + 1}` : '');
    const section = slot.rule(results, ctx);
    if (!section) continue;
    if (numbered) {
      number += 1;
      section.number = `${prefix}${number}`;
    } else {
      delete section.number;
    }
    built.set(slot.name, { number: section.number ?? '', id: section.id, section });
  }
  for (const slot of slots) {
    if (!slot.rule || !slot.late || omit.has(slot.name)) continue;
    const section = slot.rule(results, makeContext(results, inputs, paper, '', built));
    if (!section) continue;
    delete section.number;
    built.set(slot.name, { number: '', id: section.id, section });
  }
  const sections = slots.map((s) => built.get(s.name)?.section).filter((s): s is Section => s !== undefined);
  for (const section of sections) section.blocks = section.blocks.map((b) => resolveRefs(b, built));
  const s = results.study;
  const date = s.issued ?? s.as_of;
  const draft = s.status !== 'issued';
  const logoFile = report.logo ? inputs.find((f) => f.path === report.logo && f.image) : undefined;
  return {
    format: 'faultbook-appendix/1',
    paper,
    ...(report.appendix ? { label: report.appendix } : {}),
    language: 'en',
    cover: {
      facility: s.facility,
      title: s.title,
      kind: report.appendix ? `Appendix ${report.appendix} — failure-probability study` : 'Failure-probability study — appendix',
      revision: s.revision,
      status: s.status,
      date,
      draft,
      ...(report.client ? { client: report.client } : {}),
      ...(report.consultant ? { consultant: report.consultant } : {}),
      ...(logoFile?.image ? { logo: { ...logoFile.image, path: logoFile.path } } : {}),
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

type Built = ReadonlyMap<string, { number: string; id: string }>;

/** Cross-references: `{}` becomes the target section's number; a run pointing at an absent section is dropped. */
function resolveRefs(block: Block, built: Built): Block {
  const fix = (runs: Run[]): Run[] =>
    runs.flatMap((r) => {
      if (!r.ref) return [r];
      const target = built.get(r.ref.section);
      if (!target) return [];
      const { ref, ...rest } = r;
      const text = r.text.replace('{}', target.number);
      // Leading space stays outside the link, so only the words are underlined.
      const lead = /^\s*/.exec(text)![0];
      return [...(lead ? [{ ...rest, text: lead }] : []), { ...rest, text: text.slice(lead.length), link: ref.anchor ?? target.id }];
    });
  if (block.kind === 'text') return { ...block, runs: fix(block.runs) };
  if (block.kind === 'callout') return { ...block, paragraphs: block.paragraphs.map(fix) };
  return block;
}
