import type { EventResult, ParameterResult, Results } from '../analysis/results.js';
import type { InputFile } from '../study/types.js';
import type { Paper, Section } from './view.js';

/**
 * What every section rule may look at besides `Results`: the verbatim inputs, the paper size, its
 * own section number, and lookups built once so the rules stay short. Rules must not change it
 * except through `nextTable`/`nextFigure`.
 */
export interface BuildContext {
  inputs: InputFile[];
  paper: Paper;
  /** The number this section gets if it returns a Section (sections that return null use none). */
  number: string;
  eventsById: Map<string, EventResult>;
  gatesById: Map<string, Results['logic']['gates'][number]>;
  parametersByKey: Map<string, ParameterResult>;
  /** "Table 7.1", "Table 7.2", … within the current section. */
  nextTable(): string;
  /** "Figure 6.1", … within the current section. */
  nextFigure(): string;
  /**
   * The sections built so far, by slot name: their number (with the appendix label) and anchor id.
   * Complete only for rules that run after the others (`late` slots: the key findings).
   */
  sections: ReadonlyMap<string, { number: string; id: string; section: Section }>;
}

/** One section of the appendix: returns null when its data is absent (the section is then left out). */
export type SectionRule = (results: Results, ctx: BuildContext) => Section | null;

export function makeContext(
  results: Results,
  inputs: InputFile[],
  paper: Paper,
  number: string,
  sections: ReadonlyMap<string, { number: string; id: string; section: Section }> = new Map(),
): BuildContext {
  let tables = 0;
  let figures = 0;
  return {
    sections,
    inputs,
    paper,
    number,
    eventsById: new Map(results.events.map((e) => [e.id, e])),
    gatesById: new Map(results.logic.gates.map((g) => [g.id, g])),
    parametersByKey: new Map(results.parameters.map((p) => [p.key, p])),
    nextTable: () => `Table ${number}.${++tables}`,
    nextFigure: () => `Figure ${number}.${++figures}`,
  };
}

/** Anchor ids: only characters that are safe in a URL fragment and an HTML id. */
export function anchor(prefix: string, id: string): string {
  return `${prefix}-${id.replace(/[^A-Za-z0-9_-]/g, (c) => `_${c.codePointAt(0)!.toString(16)}`)}`;
}
