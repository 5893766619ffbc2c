import MarkdownIt, { type MarkdownIt as Markdown } from 'markdown-it';

/**
 * Study Markdown → HTML. Raw HTML in the source is shown as text (`html: false`), images are not
 * rendered (they would be a request, and the appendix must be self-contained), and headings are
 * moved below the appendix's own section levels.
 */
export function markdownRenderer(): Markdown {
  const md = new MarkdownIt({ html: false, linkify: false, typographer: false });
  md.disable('image');
  md.core.ruler.push('demote_headings', (state) => {
    for (const token of state.tokens) {
      if (token.type === 'heading_open' || token.type === 'heading_close') {
        token.tag = `h${Math.min(6, Number(token.tag.slice(1)) + 3)}`;
      }
    }
  });
  return md;
}
