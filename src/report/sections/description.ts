import type { SectionRule } from '../context.js';

/** The system as the study author describes it (Markdown). Absent description, no section. */
export const description: SectionRule = (results, ctx) => {
  if (!results.study.description) return null;
  return {
    id: 'sec-description',
    number: ctx.number,
    title: 'System description',
    blocks: [{ kind: 'markdown', source: results.study.description }],
  };
};
