/**
 * `Results`: everything the analysis computed, as plain JSON-ready data. It is the stable contract
 * of `results.json` (format `faultbook-results/1`, see DESIGN.md) and the only thing the report
 * reads. Field names are snake_case because they are written out as they are.
 *
 * Optional sections are filled by the analyses that exist; a report shows a section only when its
 * data is present.
 */

export interface ResultsPos {
  file: string;
  line: number;
}

export interface EventResult {
  id: string;
  title: string;
  model: string;
  class?: string;
  probability: number;
  /** Model field → the number used, canonical units (years, per year, fraction). */
  parameters: Record<string, number>;
  /** Model field → parameter key (`owner.field`) it came from. */
  parameter_keys: Record<string, string>;
  age_years?: number;
  installed?: string;
  renewed?: string;
  on?: boolean;
  assumptions: string[];
  /** Set for events the common-cause expansion made. */
  common_cause_group?: string;
}

export interface ParameterResult {
  key: string;
  owner: string;
  owner_kind: 'class' | 'event' | 'group';
  field: string;
  quantity: string;
  value: number;
  written: string;
  source?: string;
  note?: string;
  range?: [number, number];
  uncertainty?: Record<string, number | string>;
  fit?: string;
  used_by: string[];
  at: ResultsPos;
}

export interface CutSet {
  events: string[];
  probability: number;
  /** probability / exact top probability. */
  share: number;
}

export interface Importance {
  event: string;
  fussell_vesely: number;
  birnbaum: number;
  criticality: number;
  raw: number;
  rrw: number;
}

export interface TopResult {
  id: string;
  title: string;
  gate: string;
  probability: {
    exact: number;
    rare_event: number;
    mcub: number;
    /** 'exact' normally; 'bound' when the decision diagram exceeded max_nodes and the user allowed cut-set bounds. */
    basis: 'exact' | 'bound';
  };
  cut_sets: CutSet[];
  cut_set_summary: {
    listed: number;
    /** Cut sets dropped by the cutoff or the maximum order (a count, or a lower bound on it). */
    truncated: number;
    /** Sum of the probabilities of the dropped cut sets, where known. */
    truncated_probability?: number;
    cutoff: number;
    max_order: number;
    coherent: boolean;
  };
  importance?: Importance[];
  class_importance?: (Omit<Importance, 'event'> & { class: string })[];
  /** Gate id → probability of that gate's output, for the logic diagrams (optional; the report shows "—" without it). */
  gate_probabilities?: Record<string, number>;
  bdd_nodes: number;
}

export interface SensitivityResult {
  top: string;
  /** One parameter at a time, low and high: tornado data, sorted by swing. */
  tornado: { key: string; low_value: number; high_value: number; low: number; high: number; base: number }[];
  /** Top probability against the exercise interval applied to every exercised component. */
  exercise_curve: { label: string; years: number; probability: number }[];
}

export interface ScenarioResult {
  id: string;
  title: string;
  tops: { id: string; probability: number; ratio: number }[];
}

export interface UncertaintyResult {
  top: string;
  samples: number;
  seed: number;
  method: 'monte-carlo' | 'latin-hypercube';
  mean: number;
  median: number;
  p05: number;
  p95: number;
  sd: number;
  /** Relative change of the 95th percentile over the second half of the samples. */
  convergence: { p95_half: number; p95_full: number; relative_change: number };
  histogram: { edges: number[]; counts: number[] };
  /** Empirical cumulative curve at fixed probabilities. */
  cdf: { p: number; value: number }[];
}

export interface ForecastResult {
  scenario?: string;
  years: { year: number; date: string; tops: Record<string, number> }[];
}

export interface FitBound {
  lower: number;
  upper: number;
}

export interface FitResult {
  id: string;
  data: string;
  group?: string;
  method: 'mle' | 'rank';
  /** "fitted from data/x.csv: 14 failures, 61 suspensions, maximum likelihood". */
  provenance: string;
  source?: string;
  note?: string;
  rows: number;
  n: number;
  failures: number;
  suspensions: number;
  shape: number;
  /** Years. */
  scale: number;
  location?: number;
  b10: number;
  /** One-sided level of each bound (e.g. 0.9). */
  level: number;
  bounds: { shape: FitBound; scale: FitBound; b10: FitBound };
  /** Covariance of (ln shape, ln scale). */
  covariance_log: [[number, number], [number, number]];
  log_likelihood: number;
  goodness_of_fit: Record<string, number | string | boolean>;
  /** Median-rank plotting positions of the failures: life (years) and F. */
  points: { t: number; F: number }[];
  /** The fitted line and its bounds on F(t), at log-spaced lives across the data. */
  curve: { t: number; F: number; lower: number; upper: number }[];
  warnings: string[];
  /** Parameter keys that take their value from this fit. */
  used_by: string[];
}

export interface Results {
  format: 'faultbook-results/1';
  tool: { name: 'faultbook'; version: string };
  study: {
    title: string;
    facility: string;
    revision: string;
    status: string;
    issued?: string;
    as_of: string;
    prepared_by: string[];
    reviewed_by: string[];
    /** Markdown from study.yaml, rendered by the report. */
    scope?: string;
    description?: string;
  };
  inputs: { sha256: string; files: { path: string; sha256: string }[] };
  settings: Record<string, number | string>;
  /** The logic model as read, so the report can draw it without the study. */
  logic: {
    tops: { id: string; title: string; gate: string }[];
    gates: { id: string; title?: string; op: 'any' | 'all' | 'atleast' | 'not'; k?: number; inputs: string[] }[];
  };
  sources: { id: string; title: string; reference?: string; invented?: boolean; note?: string; used_by: string[] }[];
  assumptions: { id: string; title: string; body: string; events: string[]; parameters: string[] }[];
  events: EventResult[];
  parameters: ParameterResult[];
  tops: TopResult[];
  warnings: { code: string; message: string; at?: ResultsPos }[];
  sensitivity?: SensitivityResult[];
  scenarios?: ScenarioResult[];
  uncertainty?: UncertaintyResult[];
  forecast?: ForecastResult[];
  /** Filled by the common-cause, gate-count and event-tree work (issue: shared causes). */
  common_cause?: unknown[];
  gate_counts?: unknown[];
  event_trees?: unknown[];
  /** Life-data fits (events.yaml `fits:`), with what the probability plot needs. */
  fits?: FitResult[];
}
