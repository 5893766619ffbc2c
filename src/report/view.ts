/**
 * The appendix as plain data: what `buildViewModel` returns and the only thing the HTML and PDF
 * renderers read. Every number in it is already a formatted string, so both outputs show the same
 * characters; the renderers only lay it out.
 *
 * It is JSON-serialisable on purpose (no functions, no class instances): a test can snapshot it and
 * a later tool can render it some other way.
 */

export type Paper = 'a4' | 'letter';

/** A piece of generated prose: plain text, optionally emphasised. Study text is never parsed here. */
export interface Run {
  text: string;
  strong?: boolean;
  em?: boolean;
  /** Shown in the identifier style (ids of events, gates, sources, parameters). */
  code?: boolean;
}

/** Markdown written by the study author (scope, description, assumption bodies). Raw HTML is not allowed. */
export interface MarkdownBlock {
  kind: 'markdown';
  source: string;
}

/** Prose the report writes itself, from runs of plain text. */
export interface TextBlock {
  kind: 'text';
  runs: Run[];
}

/** A heading inside a section (one level below the section heading). */
export interface SubheadingBlock {
  kind: 'subheading';
  id: string;
  text: string;
}

export type Align = 'left' | 'right' | 'center';

export interface TableColumn {
  label: string;
  align: Align;
  /** Identifier style (ids). */
  code?: boolean;
  /** Relative width for the PDF ('auto' sizes to content, a number is a star weight). */
  width?: 'auto' | number;
}

export interface TableRow {
  cells: string[];
  /** One key per cell for client-side sorting (numbers sort numerically). Absent: sort on the text. */
  sortKeys?: (number | string)[];
  /** Draw attention to the row (e.g. an unsourced parameter). */
  flag?: boolean;
}

export interface TableBlock {
  kind: 'table';
  id: string;
  /** "Table 7.1" etc.; empty for small unnumbered tables. */
  number: string;
  caption: string;
  columns: TableColumn[];
  rows: TableRow[];
  /** The HTML table sorts on header click (with scripts); without scripts the order given here stands. */
  sortable?: boolean;
  /** The order the rows are given in, if it follows one column (shown on that column's header). */
  sortedBy?: { column: number; descending: boolean };
  note?: string;
  /** Shown instead of the table body when there are no rows. */
  empty?: string;
}

/** One page-sized piece of a figure; most figures have exactly one. */
export interface FigurePart {
  svg: string;
  /** Natural size of the SVG in points (1 SVG unit = 1 pt). */
  width: number;
  height: number;
}

export interface FigureBlock {
  kind: 'figure';
  id: string;
  /** "Figure 6.2". */
  number: string;
  caption: string;
  parts: FigurePart[];
  /** Printed on a landscape page (a logic diagram wider than a portrait page). */
  landscape?: boolean;
  /** Short line under the caption (e.g. where a continued subtree is referenced from). */
  note?: string;
}

export type CalloutTone = 'caution' | 'warning' | 'bound';

export interface CalloutBlock {
  kind: 'callout';
  tone: CalloutTone;
  title: string;
  /** Each entry is one paragraph. */
  paragraphs: Run[][];
}

export interface KeyValueBlock {
  kind: 'keyvalue';
  items: { key: string; value: string; code?: boolean }[];
}

/** Verbatim text (the inputs annex). */
export interface PreBlock {
  kind: 'pre';
  /** Heading line: the file path. */
  label: string;
  /** A second line, e.g. the file's SHA-256. */
  detail?: string;
  lines: string[];
}

export type Block =
  | MarkdownBlock
  | TextBlock
  | SubheadingBlock
  | TableBlock
  | FigureBlock
  | CalloutBlock
  | KeyValueBlock
  | PreBlock;

export interface Section {
  /** Anchor id, stable across runs: `sec-<name>`. */
  id: string;
  /** "1", "2", …; absent for the unnumbered title block. */
  number?: string;
  title: string;
  blocks: Block[];
  /** Start the section on a new page in print. */
  newPage?: boolean;
}

export interface Cover {
  facility: string;
  title: string;
  /** What this document is, e.g. "Failure-probability study — appendix". */
  kind: string;
  revision: string;
  status: string;
  /** The date shown on the cover: issued, else as_of. */
  date: string;
  draft: boolean;
}

export interface Appendix {
  format: 'faultbook-appendix/1';
  paper: Paper;
  /** Document language for HTML `lang` and PDF metadata. */
  language: 'en';
  cover: Cover;
  /** Running header text: study title, revision, status. */
  header: { title: string; revision: string; status: string };
  /** PDF metadata; the date is the study's (issued, else as_of), never the clock. */
  meta: { title: string; author: string; subject: string; keywords: string; creator: string; date: string };
  toc: { id: string; number?: string; title: string }[];
  sections: Section[];
}
