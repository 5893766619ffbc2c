import type { SectionRule } from '../context.js';
import { annex } from './annex.js';
import { assumptions } from './assumptions.js';
import { cautions } from './cautions.js';
import { commonCause } from './common-cause.js';
import { classImportance } from './class-importance.js';
import { cutSets } from './cut-sets.js';
import { description } from './description.js';
import { diagrams } from './diagrams.js';
import { events } from './events.js';
import { eventTrees } from './event-trees.js';
import { forecast } from './forecast.js';
import { fits } from './fits.js';
import { gateCounts } from './gate-counts.js';
import { importance } from './importance.js';
import { keyFindings } from './key-findings.js';
import { methods } from './methods.js';
import { manifest } from './manifest.js';
import { provenance } from './provenance.js';
import { resultsSection } from './results.js';
import { scenarios } from './scenarios.js';
import { scope } from './scope.js';
import { sensitivity } from './sensitivity.js';
import { titleBlock } from './title-block.js';
import { uncertainty } from './uncertainty.js';

/**
 * The appendix, in order: one entry per section. Each rule is a small file in this folder that
 * returns its Section, or null when its data is absent. Entries without a rule are reserved slots
 * for analyses still to come: add `sections/<name>.ts` and put its rule here; nothing else changes.
 *
 * `numbered: false` keeps a section out of the numbering (the title block).
 */
export interface SectionSlot {
  name: string;
  rule?: SectionRule;
  numbered?: boolean;
  /** Built after every other section (it points at them); placed where it stands in the list. */
  late?: boolean;
}

export const SECTIONS: readonly SectionSlot[] = [
  { name: 'title-block', rule: titleBlock, numbered: false },
  { name: 'key-findings', rule: keyFindings, numbered: false, late: true },
  { name: 'scope', rule: scope },
  { name: 'cautions', rule: cautions },
  { name: 'description', rule: description },
  { name: 'assumptions', rule: assumptions },
  { name: 'diagrams', rule: diagrams },
  { name: 'events', rule: events },
  { name: 'provenance', rule: provenance },
  { name: 'results', rule: resultsSection },
  { name: 'cut-sets', rule: cutSets },
  { name: 'importance', rule: importance },
  { name: 'class-importance', rule: classImportance },
  { name: 'sensitivity', rule: sensitivity },
  { name: 'scenarios', rule: scenarios },
  { name: 'uncertainty', rule: uncertainty },
  { name: 'forecast', rule: forecast },
  { name: 'common-cause', rule: commonCause },
  { name: 'gate-counts', rule: gateCounts },
  { name: 'event-trees', rule: eventTrees },
  { name: 'fits', rule: fits },
  { name: 'manifest', rule: manifest },
  { name: 'methods', rule: methods },
  { name: 'inputs', rule: annex },
];
