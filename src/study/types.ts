/**
 * The typed, validated study: what `readStudy` returns and everything downstream consumes.
 *
 * Canonical units, chosen once so no later stage converts: durations in years (1 year = 365.25
 * days), rates per year, probabilities as fractions. `written` keeps the text as the study gave it,
 * for the report.
 */

/** Where something was written: 1-based line and column in a study file (path relative to the study). */
export interface Pos {
  file: string;
  line: number;
  col: number;
}

export type Quantity = 'probability' | 'rate' | 'duration' | 'number';

/** State-of-knowledge distribution of a parameter, in the parameter's canonical unit. */
export type Uncertainty =
  | { kind: 'lognormal'; median: number; ef: number }
  | { kind: 'normal'; mean: number; sd: number; min?: number; max?: number }
  | { kind: 'uniform'; min: number; max: number }
  | { kind: 'triangular'; min: number; mode: number; max: number }
  | { kind: 'beta'; a: number; b: number }
  | { kind: 'gamma'; shape: number; scale: number }
  /** Shape and scale of one Weibull fit, sampled jointly from the fit's covariance (log scale). */
  | { kind: 'fit'; fit: string; which: 'shape' | 'scale' | 'location' };

/**
 * One number of the study. Class parameters are shared by every event of the class (and so share
 * one sample per Monte Carlo trial); an event's own field overrides the class's.
 */
export interface Parameter {
  /** `<owner>.<field>`, e.g. `hoist-motor.shape` or `hoist-1-motor.exercise`. Unique in a study. */
  key: string;
  owner: string;
  /** `tree`: a number of an event tree (`event_trees:`); `modes`: of a failure-mode combination (`failure_modes:`). */
  ownerKind: 'class' | 'event' | 'group' | 'tree' | 'modes';
  field: string;
  quantity: Quantity;
  /** In canonical units. */
  value: number;
  /** As written in the study, e.g. `75 years`. */
  written: string;
  source?: string;
  /** Where in the source: table, page, clause. */
  note?: string;
  /** Low and high values for one-at-a-time sensitivity, canonical units. */
  range?: [number, number];
  uncertainty?: Uncertainty;
  /** Set when the value comes from a life-data fit (`fits:` id). */
  fit?: string;
  at: Pos;
}

export type ModelKind = 'fixed' | 'rate' | 'repairable' | 'tested' | 'demand' | 'weibull' | 'switch';

/** Model fields that hold numbers, by model. Optional ones may be absent. */
export const MODEL_FIELDS: Record<ModelKind, { required: string[]; optional: string[] }> = {
  fixed: { required: ['probability'], optional: [] },
  rate: { required: ['rate', 'exposure'], optional: [] },
  repairable: { required: ['rate', 'repair'], optional: [] },
  tested: { required: ['rate', 'interval'], optional: ['test_duration', 'repair'] },
  demand: { required: ['probability'], optional: ['rate', 'interval'] },
  weibull: { required: ['shape', 'scale'], optional: ['location', 'exercise', 'repair'] },
  switch: { required: [], optional: [] },
};

export interface BasicEvent {
  id: string;
  title: string;
  model: ModelKind;
  class?: string;
  /** Model field → parameter key (the event's own, or its class's). */
  fields: Record<string, string>;
  /** Switch (house) events only: the base-case state. */
  on?: boolean;
  /** Weibull only: ISO dates as written, and the age at `as_of` in years (from `renewed`, else `installed`). */
  installed?: string;
  renewed?: string;
  ageYears?: number;
  assumptions: string[];
  at: Pos;
}

export interface Gate {
  id: string;
  title?: string;
  op: 'any' | 'all' | 'atleast' | 'not';
  k?: number;
  inputs: string[];
  /** Where each input is written, in the order of `inputs` (for messages about one input). */
  inputsAt?: Pos[];
  at: Pos;
}

export interface Top {
  id: string;
  title: string;
  gate: string;
  at: Pos;
}

export interface Source {
  id: string;
  title: string;
  /** Free text: author, year, publisher, document number. */
  reference?: string;
  /** True for the invented sources of a demo study. */
  invented?: boolean;
  note?: string;
  at: Pos;
}

export interface Assumption {
  /** `A1`, `A2`, … from the `## A1 …` headings of assumptions.md. */
  id: string;
  title: string;
  /** Markdown body, rendered by the report. */
  body: string;
  at: Pos;
}

/** A change to the base case, from logic.yaml `scenarios:`. */
export interface Scenario {
  id: string;
  title: string;
  /** Parameter key → new value in canonical units (with the text as written). */
  set: { key: string; value: number; written: string; at: Pos }[];
  /** Switch event id → state. */
  switches: { event: string; on: boolean; at: Pos }[];
  /** Planned renewals (for the forecast): event id → ISO date; age restarts then. */
  renew: { event: string; date: string; at: Pos }[];
  at: Pos;
}

export interface Settings {
  /** Cut sets below this probability are not listed. */
  cutoff: number;
  /** Cut sets of more events than this are not listed. */
  max_order: number;
  /** At most this many cut sets are kept per top (the most probable); the rest are counted and summed. */
  max_cut_sets: number;
  samples: number;
  seed: number;
  /** Forecast horizon, years. */
  horizon: number;
  /** Decision-diagram node budget: live nodes (garbage is collected), default about 2 GB worth. */
  max_nodes: number;
  /** How a Weibull `exercise` interval turns into a probability: at its end (default) or averaged over it. */
  exercise_basis: 'end' | 'average';
  /** Default low/high factor for sensitivity of parameters that state no `range`. */
  sensitivity_factor: number;
  /** When the decision diagram outgrows `max_nodes`: stop with a message, or fall back to cut-set bounds. */
  on_node_budget: 'stop' | 'bounds';
  /** Plain random sampling or Latin hypercube for the uncertainty analysis. */
  sampling: 'monte-carlo' | 'latin-hypercube';
}

export interface StudyMeta {
  format: string;
  title: string;
  facility: string;
  revision: string;
  status: 'draft' | 'issued';
  issued?: string;
  prepared_by: string[];
  reviewed_by: string[];
  as_of: string;
  /** Markdown: purpose and scope, system description. */
  scope?: string;
  description?: string;
  /** study.yaml `report:`: how the appendix is presented inside a larger report. */
  report?: ReportOptions;
}

/**
 * Sections of the appendix a study may leave out with `report: omit:`. Document control, the key
 * findings, the cautions and the results are never optional: a reviewer always needs them.
 */
export const OPTIONAL_SECTIONS = [
  'description',
  'assumptions',
  'diagrams',
  'events',
  'provenance',
  'cut-sets',
  'importance',
  'class-importance',
  'sensitivity',
  'scenarios',
  'uncertainty',
  'forecast',
  'common-cause',
  'gate-counts',
  'event-trees',
  'fits',
  'manifest',
  'methods',
  'inputs',
] as const;

export type OptionalSection = (typeof OPTIONAL_SECTIONS)[number];

/** A logo larger than this is refused: a cover logo is kilobytes, and the PDF embeds it. */
export const MAX_LOGO_BYTES = 512 * 1024;

export interface ReportOptions {
  /** Appendix label prefixing section, table and figure numbers ("C" → "C.3", "Table C.3.1"). */
  appendix?: string;
  client?: string;
  consultant?: string;
  /** Path of a PNG or JPEG inside the study folder; read as an input file (hashed in the manifest). */
  logo?: string;
  omit?: OptionalSection[];
}

/** A file that went into the study, for the manifest and the inputs annex. */
export interface InputFile {
  path: string;
  sha256: string;
  /** The file as text; empty for an image. */
  text: string;
  /** An image input (the report logo): its type and bytes, so the report can embed it. */
  image?: { media_type: 'image/png' | 'image/jpeg'; base64: string };
}

export interface Warning {
  code: string;
  message: string;
  at?: Pos;
}

import type { WeibullFit } from '../reliability/fit/index.js';

export interface Study {
  /** Absolute path of the study folder (never written into outputs). */
  root: string;
  meta: StudyMeta;
  settings: Settings;
  tops: Top[];
  gates: Gate[];
  events: BasicEvent[];
  parameters: Parameter[];
  sources: Source[];
  assumptions: Assumption[];
  scenarios: Scenario[];
  fits: FitSpec[];
  commonCause: CommonCauseGroup[];
  /** logic.yaml `counts:` (how many of a set of gates fail), `event_trees:` and `failure_modes:`; absent when not given. */
  counts?: CountSet[];
  eventTrees?: EventTree[];
  failureModes?: FailureModeSet[];
  files: InputFile[];
  warnings: Warning[];
}

/** A life-data fit from events.yaml `fits:`; run while the study is read, so its numbers are parameters. */
export interface FitSpec {
  id: string;
  /** Fit only the rows of this group (the CSV's `group` column). */
  group?: string;
  source?: string;
  note?: string;
  /** Set by the reader: the fit itself (estimates, bounds, covariance, plotting positions). */
  result?: WeibullFit;
  /** Set by the reader: rows in the file, excluded ones too. */
  rows?: number;
  /** Set by the reader: the longest life (failed or suspended) among the records the fit used, years. */
  dataMaxYears?: number;
  /** Path inside the study folder, as written. */
  data: string;
  method: 'mle' | 'rank';
  /** Also fit a location (failure-free time) parameter. */
  threeParameter: boolean;
  /** Unit of bare numbers in the `life` column (`life_unit:`); absent when the file states it or every life has its own. */
  lifeUnit?: string;
  /** Confidence level for the bounds shown, e.g. 0.9. */
  confidence: number;
  at: Pos;
}

/** A common-cause group from logic.yaml `common_cause:` (NUREG/CR-5485 parametric models). */
export interface CommonCauseGroup {
  id: string;
  title?: string;
  members: string[];
  method: 'beta' | 'mgl' | 'alpha';
  /** Alpha-factor only: how the members are tested. */
  testing: 'staggered' | 'non-staggered';
  /** Method parameter name (`beta`; `beta`,`gamma`,`delta`…; `alpha1`…`alphaM`) → parameter key. */
  fields: Record<string, string>;
  /**
   * Alpha-factor only: the joint uncertainty of alpha1…alphaM, a Dirichlet distribution with these
   * parameters a_1…a_M (NUREG/CR-5485's treatment of alpha-factor uncertainty). Its mean a_k/Σa is
   * the stated alphas.
   */
  dirichlet?: { a: number[]; at: Pos };
  at: Pos;
}

/**
 * A set whose number failing is wanted (logic.yaml `counts:`): n gates, tops or basic events; the
 * analysis gives P(exactly j of them fail), j = 0..n, on one decision diagram.
 */
export interface CountSet {
  id: string;
  title: string;
  /** Gate, top or basic-event ids, as written. */
  of: string[];
  at: Pos;
}

/** One range of an event tree's initiating load. */
export interface LoadRange {
  id: string;
  title: string;
  /**
   * `aep`: the annual exceedance probabilities bounding the range, more frequent first (parameter
   * keys), so the range's annual probability is upper − lower. `frequency`: an initiating
   * frequency per year (parameter key).
   */
  basis: 'aep' | 'frequency';
  aep?: [string, string];
  frequency?: string;
  at: Pos;
}

/**
 * When a heading's failure branch is taken: a fixed probability, one per load range, the output
 * of a gate (or top), or "at least k of these fail" with k per load range (0 = always, n + 1 = never).
 * Gate and count conditions are logic, quantified on the diagram with every other condition of the
 * sequence; probability conditions are independent of every basic event.
 */
export type BranchCondition =
  | { kind: 'probability'; key: string }
  | { kind: 'by-range'; keys: string[] }
  | { kind: 'gate'; gate: string; top?: string }
  | { kind: 'atleast'; k: number[]; of: string[]; count?: string };

export interface Heading {
  id: string;
  title: string;
  fails: BranchCondition;
  at: Pos;
}

export type BranchState = 'works' | 'fails';

export interface TreeSequence {
  /** `S1`, `S2`, … in tree order (works above fails, as drawn). */
  id: string;
  /** One entry per heading: the branch taken, or null where the heading is not asked. */
  path: (BranchState | null)[];
  outcome: string;
  at: Pos;
}

/** logic.yaml `event_trees:`: an initiating load in ranges, headings, sequences and outcomes. */
export interface EventTree {
  id: string;
  title: string;
  load: { title: string; source?: string; note?: string; ranges: LoadRange[] };
  headings: Heading[];
  outcomes: { id: string; title: string; at: Pos }[];
  sequences: TreeSequence[];
  at: Pos;
}

/** Where a failure mode's probability given each load range comes from. */
export type ModeBasis =
  | { kind: 'outcome'; outcome: string }
  | { kind: 'by-range'; keys: string[] }
  | { kind: 'probability'; key: string };

/** logic.yaml `failure_modes:`: failure modes of one dam that share the load of one event tree. */
export interface FailureModeSet {
  id: string;
  title: string;
  /** The event tree whose load ranges the modes share. */
  tree: string;
  modes: { id: string; title: string; basis: ModeBasis; at: Pos }[];
  at: Pos;
}
