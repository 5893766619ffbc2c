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
  /**
   * The common-cause group of an event the expansion made or changed (diagrams mark these). A
   * group member keeps its id but now stands for its independent failure only: `probability` is
   * that part, `total_probability` its model's own value Q_t. Shared events have role `shared`.
   */
  common_cause_group?: string;
  common_cause_role?: 'independent' | 'shared';
  /** Group members only: the member's own model probability (Q_t) before the expansion. */
  total_probability?: number;
  /** Shared events only: the members whose common failure this event is. */
  common_cause_members?: string[];
  /** Set when the event's age lies beyond the oldest life (failed or suspended) in the data behind its fitted parameters. */
  extrapolated?: { fit: string; age_years: number; data_max_years: number };
}

export interface ParameterResult {
  key: string;
  owner: string;
  owner_kind: 'class' | 'event' | 'group' | 'tree' | 'modes';
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
    /** The cap on cut sets kept per top (settings.max_cut_sets). */
    max_cut_sets?: number;
    /**
     * Cut sets that met the cutoff and the order limit but were left out by the cap, and their
     * summed probability: exact when `capped_exact`, otherwise upper bounds. 0 when none was.
     */
    capped?: number;
    capped_probability?: number;
    capped_exact?: boolean;
  };
  importance?: Importance[];
  /**
   * Basic events left out of `importance` because every measure is zero: the top does not depend
   * on them (Birnbaum 0), so no change to their data can change it; `note` says so in words.
   */
  no_effect?: { events: string[]; note: string };
  /** Importance of each component class (all its events together), ranked by FV; see importance-classes.ts. */
  class_importance?: ClassImportance[];
  /** Gate id → probability of that gate's output, for the logic diagrams (optional; the report shows "—" without it). */
  gate_probabilities?: Record<string, number>;
  bdd_nodes: number;
}

/**
 * A component class's events taken together (NUREG/CR-3385 group importance): P1 with all of them
 * failed, P0 with all of them working; FV = (P − P0)/P, Birnbaum = P1 − P0, RAW = P1/P, RRW = P/P0.
 */
export interface ClassImportance {
  class: string;
  /** The class's basic events. */
  events: string[];
  /** P(top | every event of the class failed). */
  p_failed: number;
  /** P(top | every event of the class working). */
  p_working: number;
  fussell_vesely: number;
  birnbaum: number;
  raw: number;
  rrw: number;
}

export interface SensitivityResult {
  top: string;
  /**
   * One parameter at a time, low and high (its stated range, else a fitted shape's or scale's fit
   * bounds, else value ÷/× settings.sensitivity_factor, probabilities capped at 1): tornado data, sorted by |swing|, swing = high − low (top probabilities).
   */
  tornado: {
    key: string;
    low_value: number;
    high_value: number;
    low: number;
    high: number;
    base: number;
    swing: number;
    /** Where the range came from: the study's `range:`, the life-data fit's bounds, or the default factor. */
    range_source: 'stated' | 'fit' | 'default-factor';
    /** In words, for the appendix: "stated range", "fit bounds (each one-sided 90 %)", "default factor ×/÷ 3". */
    range_basis: string;
  }[];
  /** Parameters left out because an end of their range fell outside the parameter's domain, and why. */
  skipped: { key: string; reason: string }[];
  /**
   * Top probability against the exercise interval applied to every `exercise` field at once. The
   * base case comes first (`base: true`, `years` only when every exercise field has one value).
   */
  exercise_curve: { label: string; years?: number; base?: true; probability: number; /** probability ÷ the base case's. */ ratio: number }[];
}

export interface ScenarioResult {
  id: string;
  title: string;
  /** What the scenario changes, as written in logic.yaml. */
  set: { key: string; value: number; written: string }[];
  switches: { event: string; on: boolean }[];
  /** Planned renewals: they take effect on their dates (see the forecast), not at as_of. */
  renew: { event: string; date: string }[];
  /** At as_of: the scenario's probability, the base case's, and their ratio (scenario ÷ base). */
  tops: { id: string; probability: number; base: number; ratio: number }[];
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
  /** sd/√samples: the standard error of the mean. */
  standard_error: number;
  /** Relative change of the 95th percentile over the second half of the samples: |p95_full − p95_half|/p95_full. */
  convergence: { p95_half: number; p95_full: number; relative_change: number };
  /** Log-spaced bins between the smallest and largest positive value; trials of exactly 0 counted in `zeros`. */
  histogram: { edges: number[]; counts: number[]; zeros: number };
  /** Empirical cumulative curve at fixed probabilities: `value` is the p-quantile of the trials. */
  cdf: { p: number; value: number }[];
  /** Parameter keys sampled in each trial. */
  sampled_parameters: string[];
  /** Parameters with a stated uncertainty that were held at their values, and why. */
  held_parameters: { key: string; reason: string }[];
  /** Trials in which a sampled probability exceeded 1 and was set to 1. */
  clipped_trials: number;
}

/** Monte Carlo summary of one derived quantity, from the same trials as the tops' uncertainty. */
export interface QuantityUncertainty {
  kind: 'event-tree-outcome' | 'event-tree-sequence' | 'failure-mode' | 'failure-modes-combined' | 'gate-count';
  /** The tree id (outcomes, sequences), failure-mode set id, or count id. */
  owner: string;
  /** Outcome / sequence / mode id; 'sum' | 'lower' | 'upper' for combined modes; 'at-least-<j>' for gate counts. */
  id: string;
  /** The base-case value, equal to the one printed in its own section. */
  point: number;
  mean: number;
  median: number;
  p05: number;
  p95: number;
  sd: number;
}

export interface ForecastResult {
  /** Absent for the base case. */
  scenario?: string;
  title?: string;
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
    /** study.yaml `report:` as read: appendix label, client, consultant, logo path, sections left out. */
    report?: { appendix?: string; client?: string; consultant?: string; logo?: string; omit?: string[] };
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
  /**
   * The event-tree outcomes and sequences (annual probabilities), each failure mode's adjusted
   * annual probability and the combined annual sum / lower / upper, and each gate count's
   * P(at least j fail), j = 1..n, from the same Monte Carlo trials as `uncertainty`.
   */
  outcome_uncertainty?: QuantityUncertainty[];
  forecast?: ForecastResult[];
  /** Filled by the common-cause, gate-count and event-tree work (issue: shared causes). */
  common_cause?: CommonCauseResult[];
  gate_counts?: GateCountResult[];
  event_trees?: EventTreeResult[];
  failure_modes?: FailureModeResult[];
  /** Life-data fits (events.yaml `fits:`), with what the probability plot needs. */
  fits?: FitResult[];
}

/** One common-cause group as expanded (NUREG/CR-5485), at the base case. */
export interface CommonCauseResult {
  id: string;
  title?: string;
  method: 'beta' | 'mgl' | 'alpha';
  /** Alpha factor only. */
  testing?: 'staggered' | 'non-staggered';
  /** Alpha factor only: the Dirichlet parameters a_1…a_M of the factors' joint uncertainty, when stated. */
  dirichlet?: number[];
  parameters: { field: string; key: string; value: number }[];
  /** Each member's own total Q_t, and its independent part f_1·Q_t (the member's id in the logic). */
  members: { id: string; total: number; independent: number }[];
  /** Q̄ = mean of the members' Q_t, used for every shared event. */
  reference_total: number;
  /** True when the members' Q_t differ (more than 1e-9 relative); a warning is raised. */
  unequal_totals: boolean;
  /** f_k (k = 1..m): Q_k = f_k · Q_t for one specific event of k members; index 0 is k = 1. */
  factors: number[];
  /** The shared events made: subsets of two or more members. */
  shared: { id: string; members: string[]; probability: number }[];
  /** The rule for unequal members, in words, for the appendix. */
  rule: string;
}

/** How many of a set of n gates (tops, events) fail: exact on one diagram, and as if independent. */
export interface GateCountResult {
  id: string;
  title: string;
  of: { id: string; kind: 'gate' | 'top' | 'event'; title?: string; probability: number }[];
  /** exact[j] = P(exactly j fail), j = 0..n, on one decision diagram (shared events counted once). */
  exact: number[];
  /** The same if the n failed independently with their own marginals. */
  independent: number[];
  /** 'binomial' when the n marginals are equal, else 'poisson-binomial'. */
  independent_method: 'binomial' | 'poisson-binomial';
  /** P(at least j fail), j = 0..n, both ways (tail sums). */
  at_least: { exact: number[]; independent: number[] };
  mean: { exact: number; independent: number };
  bdd_nodes: number;
}

/** One event tree quantified: every sequence as one Boolean expression on the diagram, per load range. */
export interface EventTreeResult {
  id: string;
  title: string;
  load: {
    title: string;
    source?: string;
    note?: string;
    /** 'aep': ranges of annual exceedance probability (results are annual probabilities); 'frequency': per year; 'mixed'. */
    basis: 'aep' | 'frequency' | 'mixed';
    /** probability: the range's annual probability (AEP upper − lower) or its frequency per year. */
    ranges: { id: string; title: string; aep?: [number, number]; frequency?: number; probability: number }[];
    total: number;
  };
  headings: {
    id: string;
    title: string;
    /** How the failure branch is decided, in words (for the appendix). */
    condition: string;
    kind: 'probability' | 'by-range' | 'gate' | 'atleast';
    gate?: string;
    top?: string;
    of?: string[];
    count?: string;
    k?: number[];
    /** P(fails | range) on its own, per range (the branch number a spreadsheet would use). */
    fails: number[];
  }[];
  sequences: {
    id: string;
    path: ('works' | 'fails' | null)[];
    outcome: string;
    /** P(sequence | range), exact (one Boolean expression per range). */
    conditional: number[];
    /** Annual: range probability × conditional. */
    by_range: number[];
    probability: number;
    /** For comparison: range probability × product of the branch numbers, summed over ranges. */
    product_of_branches: number;
  }[];
  outcomes: { id: string; title: string; probability: number; by_range: number[]; product_of_branches: number }[];
  /** Σ outcomes and Σ range probabilities: equal up to rounding, the sequences partitioning each range. */
  check: { sum_of_outcomes: number; initiating: number };
}

/** Failure modes of one dam sharing a load, combined (after Hill, Bowles, Jordan & Nathan, ANCOLD 2003). */
export interface FailureModeResult {
  id: string;
  title: string;
  tree: string;
  ranges: { id: string; title: string; probability: number }[];
  modes: {
    id: string;
    title: string;
    basis: 'outcome' | 'by-range' | 'probability';
    outcome?: string;
    /** P(mode | range). */
    conditional: number[];
    /** Σ_r P(r)·P(mode | r). */
    annual: number;
    /** After the common-cause adjustment, per range and annual. */
    adjusted: number[];
    adjusted_annual: number;
  }[];
  /** Per range, given the range: plain sum, uni-modal lower bound max P_i, upper bound 1 − Π(1 − P_i). */
  by_range: { sum: number; lower: number; upper: number }[];
  /** Σ_r P(r)·(each per-range figure). The adjusted modes add up to `upper`. */
  annual: { sum: number; lower: number; upper: number };
}
